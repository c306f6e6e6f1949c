import { describe, expect, it } from 'vitest';
import { Xoshiro128 } from '../../src/model/rng.js';
import { buildKComparison, matchThemes, meanCoherence, stabilityAcrossRuns, themeCosineMatrix, type RunThemes } from '../../src/eval/index.js';
import { dirichletInto } from '../stats/simulate.js';

const K = 5;
const V = [30, 20];

function randomRun(seed: number): RunThemes {
  const rng = Xoshiro128.fromSeed(seed);
  return V.map((v) => {
    const phi = new Float64Array(K * v);
    for (let k = 0; k < K; k++) dirichletInto(rng, new Array(v).fill(0.2), phi, k * v);
    return phi;
  });
}

/** The same themes in another order: theme k of the result is theme perm[k] of run. */
function permuted(run: RunThemes, perm: number[]): RunThemes {
  return run.map((phi, l) => {
    const v = V[l];
    const out = new Float64Array(phi.length);
    perm.forEach((src, k) => out.set(phi.subarray(src * v, (src + 1) * v), k * v));
    return out;
  });
}

describe('theme stability across seeds (Greene, O\'Callaghan & Cunningham 2014)', () => {
  it('recovers a permutation of identical themes with similarity 1', () => {
    const a = randomRun(1);
    const perm = [3, 0, 4, 1, 2];
    const m = matchThemes(a, K, permuted(a, perm), K);
    // theme j of a is theme k of b where perm[k] = j
    for (let j = 0; j < K; j++) expect(perm[m.matchOf[j]]).toBe(j);
    expect(m.agreement).toBeCloseTo(1, 12);
  });

  it('computes cosine over all languages concatenated', () => {
    // One theme, two languages: a = ([1,0],[1,0]), b = ([1,0],[0,1]) → dot 1, norms √2·√2 → 0.5
    const a = [Float64Array.from([1, 0]), Float64Array.from([1, 0])];
    const b = [Float64Array.from([1, 0]), Float64Array.from([0, 1])];
    expect(themeCosineMatrix(a, 1, b, 1)[0]).toBeCloseTo(0.5, 12);
    expect(() => themeCosineMatrix(a, 1, [a[0]], 1)).toThrow(/same vocabularies/);
  });

  it('scores identical runs as fully stable and unrelated runs as less stable, per theme', () => {
    const a = randomRun(1);
    const same = stabilityAcrossRuns([a, permuted(a, [1, 2, 3, 4, 0]), permuted(a, [4, 3, 2, 1, 0])], K);
    expect(same.overall).toBeCloseTo(1, 12);
    expect(Array.from(same.perTheme).every((s) => Math.abs(s - 1) < 1e-12)).toBe(true);
    expect(Array.from(same.matchesToReference[1])).toEqual([4, 0, 1, 2, 3]);
    const different = stabilityAcrossRuns([a, randomRun(2), randomRun(3)], K);
    expect(different.overall).toBeLessThan(0.6);
    expect(different.agreement[0][1]).toBeLessThan(0.6);
    expect(() => stabilityAcrossRuns([a], K)).toThrow(/at least two runs/);
  });

  it('tabulates perplexity, coherence and stability per K', () => {
    const a = randomRun(1);
    const rows = buildKComparison([
      { K: 10, perplexity: 120, npmi: 0.05, logConditional: -60, seed: 1 },
      { K: 5, perplexity: 150, npmi: 0.1, logConditional: -50, seed: 1, themes: a },
      { K: 5, perplexity: 130, npmi: 0.2, logConditional: -40, seed: 2, themes: permuted(a, [1, 0, 2, 3, 4]) },
    ]);
    expect(rows.map((r) => r.K)).toEqual([5, 10]);
    expect(rows[0]).toMatchObject({ runs: 2, perplexity: 140, perplexityMin: 130, perplexityMax: 150, logConditional: -45 });
    expect(rows[0].npmi).toBeCloseTo(0.15, 12);
    expect(rows[0].stability).toBeCloseTo(1, 12);
    expect(rows[1].stability).toBeNaN();
    expect(meanCoherence([{ npmi: 0.2, logConditional: -3, pairs: 3 }, { npmi: NaN, logConditional: 0, pairs: 0 }, { npmi: 0, logConditional: -1, pairs: 1 }])).toEqual({ npmi: 0.1, logConditional: -2 });
  });
});
