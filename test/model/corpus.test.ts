import { describe, expect, it } from 'vitest';
import { buildCorpus } from '../../src/model/corpus.js';
import { buildGroupFeatures, encodeCovariates, MISSING_LEVEL } from '../../src/model/features.js';

describe('buildCorpus', () => {
  const built = buildCorpus({
    languages: ['en', 'de'],
    vocabSizes: [3, 2],
    documents: [
      { language: 0, tokens: Int32Array.of(0, 1), linkKey: 'x' },
      { language: 1, tokens: Int32Array.of(1) },
      { language: 1, tokens: Int32Array.of(0, 0, 1), linkKey: 'x' },
      { language: 0, tokens: Int32Array.of(2), linkKey: '' },
    ],
  });
  const c = built.corpus;

  it('puts documents sharing a link key in one contiguous group, keyless documents alone', () => {
    expect(c.numGroups).toBe(3);
    expect([...built.docOrder]).toEqual([0, 2, 1, 3]);
    expect([...c.groupDocOffsets]).toEqual([0, 2, 3, 4]);
    expect([...c.docGroup]).toEqual([0, 0, 1, 2]);
    expect(built.groupKeys).toEqual(['x', null, null]);
    expect([...built.groupFirstInput]).toEqual([0, 1, 3]);
  });

  it('lays tokens out in corpus order with offsets, languages and word bases', () => {
    expect([...c.words]).toEqual([0, 1, 0, 0, 1, 1, 2]);
    expect([...c.docOffsets]).toEqual([0, 2, 5, 6, 7]);
    expect([...c.docLanguage]).toEqual([0, 1, 1, 0]);
    expect([...c.wordBase]).toEqual([0, 3, 5]);
  });

  it('refuses a word id outside its vocabulary with a message naming the document', () => {
    expect(() => buildCorpus({ languages: ['en'], vocabSizes: [2], documents: [{ language: 0, tokens: Int32Array.of(2) }] })).toThrow(/Document 1 has word id 2/);
  });
});

describe('buildGroupFeatures', () => {
  const rows = [
    { region: 'south', age: 30 },
    { region: 'north', age: 50 },
    { region: 'south', age: 30 },
    { region: null, age: null },
  ];
  const f = buildGroupFeatures(rows, [
    { column: 'region', type: 'categorical' },
    { column: 'age', type: 'numeric' },
  ]);

  it('encodes [1, indicators for levels but the first, standardized numerics]', () => {
    // Levels sorted: '(missing)', 'north', 'south' → baseline '(missing)'.
    expect(f.encoding.levels[0]).toEqual([MISSING_LEVEL, 'north', 'south']);
    expect(f.encoding.names).toEqual(['intercept', 'region=north', 'region=south', 'age']);
    const mean = (30 + 50 + 30) / 3;
    const sd = Math.sqrt(((30 - mean) ** 2 * 2 + (50 - mean) ** 2) / 3);
    const x0 = f.patterns.subarray(0, 4);
    expect([...x0.subarray(0, 3)]).toEqual([1, 0, 1]);
    expect(x0[3]).toBeCloseTo((30 - mean) / sd, 12);
    // Missing numeric → mean → 0.
    expect([...f.patterns.subarray(f.groupPattern[3] * 4, f.groupPattern[3] * 4 + 4)]).toEqual([1, 0, 0, 0]);
  });

  it('shares one pattern between groups with identical rows', () => {
    expect(f.numPatterns).toBe(3);
    expect(f.groupPattern[0]).toBe(f.groupPattern[2]);
    expect([...f.patternSizes]).toEqual([2, 1, 1]);
  });

  it('encodes an unseen level at fold-in as the baseline', () => {
    expect([...encodeCovariates({ region: 'west', age: 30 }, f.encoding)].slice(0, 3)).toEqual([1, 0, 0]);
  });
});
