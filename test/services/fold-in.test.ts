import { describe, expect, it } from 'vitest';
import { alphaForCovariates, foldInDocuments } from '../../src/services/fold-in.js';
import { decodeBundle, encodeBundle, type RunBundle } from '../../src/services/bundle.js';
import { InputError } from '../../src/text/types.js';

// Two themes over a 4-word vocabulary, K×V row-major: theme 0 uses words 0–1, theme 1 words 2–3.
const phi = [Float64Array.from([0.49, 0.49, 0.01, 0.01, 0.01, 0.01, 0.49, 0.49])];

describe('fold-in with fixed theme-word distributions', () => {
  it('gives a document made of one theme\'s words a mixture dominated by that theme, and skips unknown words', () => {
    const alpha = Float64Array.of(0.1, 0.1);
    const r = foldInDocuments(phi, 2, [
      { language: 0, tokens: Int32Array.of(0, 1, 0, 1, 0), alpha },
      { language: 0, tokens: Int32Array.of(2, 3, 3, 9, -1), alpha },
      { language: 0, tokens: Int32Array.of(), alpha },
    ]);
    expect(r.theta[0]).toBeGreaterThan(0.9);
    expect(r.theta[3]).toBeGreaterThan(0.85);
    expect([...r.unknownWords]).toEqual([0, 2, 0]);
    expect([r.theta[4], r.theta[5]]).toEqual([0.5, 0.5]); // no words: the normalised prior
    for (let d = 0; d < 3; d++) expect(r.theta[2 * d] + r.theta[2 * d + 1]).toBeCloseTo(1, 12);
  });

  it('computes α = exp(λ·x) from covariates, treating an unseen level as the baseline', () => {
    const encoding = { specs: [{ column: 'region', type: 'categorical' as const }], names: ['intercept', 'region=b'], levels: [['a', 'b']], means: [0], sds: [1] };
    const lambda = Float64Array.of(0, 1, Math.log(2), 0); // K=2, F=2
    expect([...alphaForCovariates(lambda, encoding, 2, { region: 'b' })]).toEqual([Math.E, 2]);
    expect([...alphaForCovariates(lambda, encoding, 2, { region: 'zzz' })]).toEqual([1, 2]);
  });
});

describe('saved-run bundle', () => {
  const bundle: RunBundle = {
    format: 'themata-run',
    version: 1,
    createdAt: '2026-01-01T00:00:00.000Z',
    study: 's',
    run: 'r',
    K: 2,
    labels: ['A', 'B'],
    languages: ['en'],
    vocabularies: [{ stems: ['a', 'b', 'c', 'd'], surfaces: ['a', 'b', 'c', 'd'] }],
    phi,
    lambda: Float64Array.of(-2.3, -2.3),
    encoding: null,
    beta: Float64Array.of(0.01),
    pipeline: { stemming: true, foldDiacritics: false, minCount: 2, maxDocShare: 0.5, collocationNpmi: null, collocationMinCount: 5, extraStopWords: {}, minTokens: 1 },
    mapping: { text: ['answer'], covariates: [] },
    settings: {},
  };

  it('round-trips every array bit for bit', () => {
    const key = new Uint8Array(32).fill(7);
    const back = decodeBundle(encodeBundle(bundle, key), { key });
    expect([...back.phi[0]]).toEqual([...phi[0]]);
    expect([...back.lambda]).toEqual([-2.3, -2.3]);
    expect(back.labels).toEqual(['A', 'B']);
  });

  it('refuses other files with an InputError', () => {
    expect(() => decodeBundle(new TextEncoder().encode('id,answer\n'), { key: new Uint8Array(32), fileName: 'x.csv' })).toThrow(InputError);
  });
});
