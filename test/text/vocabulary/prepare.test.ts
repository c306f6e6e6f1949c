import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { PipelineSettings } from '../../../src/text/types.js';
import { createEncoder, defaultPipelineSettings, findCollocations, GAP, prepareText } from '../../../src/text/vocabulary/index.js';

// Invented answers throughout (synthetic tests).
const settings = (overrides: Partial<PipelineSettings> = {}): PipelineSettings => ({
  ...defaultPipelineSettings(),
  minCount: 1,
  ...overrides,
});

const surfacesOf = (prepared: ReturnType<typeof prepareText>, language: string): string[] =>
  prepared.vocabularies.find((v) => v.language === language)?.surfaces ?? [];

describe('prepareText', () => {
  it('excludes non-answers and undetermined documents with their reason, before any vocabulary', () => {
    const prepared = prepareText(
      [
        { language: 'en', text: 'Nothing.' },
        { language: null, text: 'n/a' },
        { language: null, text: 'the clinic was far' },
        { language: 'en', text: 'The clinic was far away' },
      ],
      settings(),
    );
    expect(prepared.documents.map((d) => d.excluded)).toEqual(['non-answer', 'non-answer', 'undetermined', null]);
    expect(prepared.documents[0].vocabulary).toBe(-1);
    const vocabulary = prepared.vocabularies[0];
    expect(vocabulary.language).toBe('en');
    expect(vocabulary.stems).not.toContain('noth');
    expect(vocabulary.surfaces).toEqual(expect.arrayContaining(['clinic']));
  });

  it('excludes documents left with too few tokens as "too short"', () => {
    const prepared = prepareText(
      [
        { language: 'en', text: 'the and of' },
        { language: 'en', text: 'clinic parking' },
      ],
      settings({ minTokens: 2 }),
    );
    expect(prepared.documents.map((d) => d.excluded)).toEqual(['too short', null]);
  });

  it('stems, shows each stem by its most frequent surface form, and numbers words by frequency', () => {
    const prepared = prepareText(
      [
        { language: 'en', text: 'waiting waiting waited' },
        { language: 'en', text: 'waits parking' },
      ],
      settings(),
    );
    const v = prepared.vocabularies[0];
    expect(v.stems).toEqual(['wait', 'park']);
    expect(v.surfaces).toEqual(['waiting', 'parking']);
    expect([...v.counts]).toEqual([4, 1]);
    expect([...v.docCounts]).toEqual([2, 1]);
    expect([...prepared.documents[0].tokens]).toEqual([0, 0, 0]);
    expect(prepared.documents[1].tokens).toBeInstanceOf(Int32Array);
  });

  it('keeps one vocabulary per language', () => {
    const prepared = prepareText(
      [
        { language: 'en', text: 'parking clinic' },
        { language: 'es', text: 'aparcamiento clínica' },
        { language: 'eng', text: 'parking' },
      ],
      settings(),
    );
    expect(prepared.vocabularies.map((v) => v.language)).toEqual(['en', 'es']);
    expect(prepared.documents.map((d) => d.vocabulary)).toEqual([0, 1, 0]);
  });

  it('prunes stems below the minimum count and above the maximum document share', () => {
    const docs = Array.from({ length: 40 }, (_, i) => ({ language: 'en', text: `hospital ${i % 2 === 0 ? 'parking' : 'nurses'} ${i === 0 ? 'helicopter' : ''}` }));
    const prepared = prepareText(docs, settings({ minCount: 2, maxDocShare: 0.9 }));
    const surfaces = surfacesOf(prepared, 'en');
    expect(surfaces).not.toContain('hospital'); // in every document
    expect(surfaces).not.toContain('helicopter'); // seen once
    expect(surfaces).toEqual(expect.arrayContaining(['parking', 'nurses']));
  });

  it('applies the study stop words', () => {
    const prepared = prepareText([{ language: 'en', text: 'clinic parking' }], settings({ extraStopWords: { en: ['clinic'] } }));
    expect(surfacesOf(prepared, 'en')).toEqual(['parking']);
  });

  it("drops another study language's stop words written in another script (mixed-language answers)", () => {
    const docs = [
      { language: 'ja', text: '司書 and スタッフ the 感謝 wifi' },
      { language: 'en', text: 'friendly staff and the librarians' },
    ];
    const ja = surfacesOf(prepareText(docs, settings()), 'ja');
    expect(ja).not.toContain('and');
    expect(ja).not.toContain('the');
    // A Latin word that is no English stop word stays; so do the Japanese words.
    expect(ja).toEqual(expect.arrayContaining(['司書', 'スタッフ', '感謝', 'wifi']));
    // Without English among the study's languages, no English list applies.
    expect(surfacesOf(prepareText([docs[0]], settings()), 'ja')).toContain('and');
  });

  it("never judges a word in the document language's own script by a foreign list", () => {
    // 的 is a Chinese stop word; in a Japanese answer (Han is a Japanese script) it stays.
    const docs = [
      { language: 'ja', text: '的 図書館' },
      { language: 'zh', text: '我的 图书馆' },
    ];
    expect(surfacesOf(prepareText(docs, settings()), 'ja')).toContain('的');
  });

  it('joins frequent pairs with high NPMI into one token, only across adjacent words', () => {
    const docs = [
      ...Array.from({ length: 6 }, () => ({ language: 'en', text: 'waiting time too long at reception' })),
      ...Array.from({ length: 6 }, () => ({ language: 'en', text: 'reception staff friendly' })),
      { language: 'en', text: 'waiting outside' },
    ];
    const prepared = prepareText(docs, settings({ collocationNpmi: 0.5, collocationMinCount: 5 }));
    const v = prepared.vocabularies[0];
    expect(v.surfaces).toContain('waiting_time');
    expect(v.stems).toContain('wait_time');
    // "time too long" are stop words in the open list: "waiting time" must not swallow them.
    const encode = createEncoder(v, settings({ collocationNpmi: 0.5 }));
    const encoded = encode('Waiting time at reception, parking');
    expect(encoded.tokens.length).toBe(2);
    expect(encoded.unknown).toBe(1);
  });

  it('reports progress up to the total', () => {
    const calls: [number, number][] = [];
    prepareText(Array.from({ length: 2500 }, () => ({ language: 'en', text: 'clinic' })), settings(), (done, total) => calls.push([done, total]));
    expect(calls.at(-1)).toEqual([2500, 2500]);
    expect(calls.length).toBeGreaterThan(1);
  });

  it('never crashes and returns one document per input (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ language: fc.constantFrom('en', 'fr', 'tr', 'zh', 'ja', null), text: fc.oneof(fc.string({ unit: 'grapheme', maxLength: 40 }), fc.string({ unit: 'binary', maxLength: 40 })) }), { maxLength: 10 }),
        fc.boolean(),
        (docs, collocations) => {
          const prepared = prepareText(docs, settings({ collocationNpmi: collocations ? 0.1 : null, collocationMinCount: 1 }));
          expect(prepared.documents).toHaveLength(docs.length);
          for (const d of prepared.documents) {
            const size = d.vocabulary >= 0 ? prepared.vocabularies[d.vocabulary].stems.length : 0;
            for (const id of d.tokens) expect(id).toBeLessThan(size);
          }
        },
      ),
      { numRuns: 200 },
    );
  });
});

describe('NPMI (Bouma 2009, "Normalized (pointwise) mutual information in collocation extraction")', () => {
  // 16 tokens; (0,1) four times and 0, 1 nowhere else: npmi = ln((4/16)/((4/16)(4/16))) / −ln(4/16) = 1.
  // (2,3), (2,2), (3,3) once each with c(2) = c(3) = 4: npmi = ln((1/16)/((4/16)(4/16))) / … = 0.
  const seqs = [Int32Array.of(0, 1, GAP, 2, GAP, 3), Int32Array.of(0, 1, GAP, 2, 2), Int32Array.of(0, 1, GAP, 3, 3), Int32Array.of(0, 1, GAP, 2, 3)];
  it('is 1 for words that only occur together', () => {
    expect(findCollocations(seqs, 4, 1, 0.999)).toEqual(new Set([0 * 4 + 1]));
    expect(findCollocations(seqs, 4, 1, 1.001)).toEqual(new Set());
  });
  it('is 0 for independent pairs', () => {
    expect(findCollocations(seqs, 4, 1, 0.001)).toEqual(new Set([1]));
    expect(findCollocations(seqs, 4, 1, -0.001).size).toBe(4);
  });
  it('ignores pairs below the minimum count and pairs across a gap', () => {
    expect(findCollocations(seqs, 4, 5, -1)).toEqual(new Set());
    expect(findCollocations(seqs, 4, 1, -1).has(1 * 4 + 2)).toBe(false);
  });
});
