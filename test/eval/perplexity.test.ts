import { describe, expect, it } from 'vitest';
import { Xoshiro128 } from '../../src/model/rng.js';
import { documentCompletionPerplexity, splitDocument, type ObservedDocument } from '../../src/eval/index.js';
import { dirichletInto } from '../stats/simulate.js';

describe('document-completion perplexity', () => {
  it('splits a document into alternate tokens or halves', () => {
    const w = Int32Array.from([1, 2, 3, 4, 5]);
    expect(splitDocument(w)).toEqual({ observed: Int32Array.from([1, 3, 5]), evaluated: Int32Array.from([2, 4]) });
    expect(splitDocument(w, 'first-half')).toEqual({ observed: Int32Array.from([1, 2, 3]), evaluated: Int32Array.from([4, 5]) });
    expect(splitDocument(Int32Array.from([7])).evaluated.length).toBe(0);
  });

  // Invented data simulated from known parameters: K themes, V words, φ_k ~ Dir(0.1), θ_d ~ Dir(0.5).
  const K = 4;
  const V = 40;
  const D = 300;
  const len = 100;
  const rng = Xoshiro128.fromSeed(42);
  const phi = new Float64Array(K * V);
  for (let k = 0; k < K; k++) dirichletInto(rng, new Array(V).fill(0.1), phi, k * V);
  const theta = new Float64Array(D * K);
  for (let d = 0; d < D; d++) dirichletInto(rng, new Array(K).fill(0.5), theta, d * K);
  const words = new Int32Array(D * len);
  let entropySum = 0;
  const pw = new Float64Array(V);
  for (let d = 0; d < D; d++) {
    pw.fill(0);
    for (let k = 0; k < K; k++) for (let w = 0; w < V; w++) pw[w] += theta[d * K + k] * phi[k * V + w];
    for (let w = 0; w < V; w++) if (pw[w] > 0) entropySum -= pw[w] * Math.log(pw[w]);
    for (let i = 0; i < len; i++) {
      let u = rng.nextDouble();
      let w = 0;
      while (w < V - 1 && u >= pw[w]) u -= pw[w++];
      words[d * len + i] = w;
    }
  }
  const corpus = {
    docOffsets: Int32Array.from({ length: D + 1 }, (_, d) => d * len),
    words,
    docLanguage: new Uint8Array(D),
    groupDocOffsets: Int32Array.from({ length: D + 1 }, (_, g) => g),
  };
  const groups = Int32Array.from({ length: D }, (_, g) => g);
  // Every document evaluates len/2 tokens, so the per-token entropy is the mean over documents.
  const trueEntropy = entropySum / D;

  it('is close to exp of the true per-token entropy when θ and φ are the true parameters', () => {
    // Outside check: for tokens drawn from p_d, E[−log p_d(w)] = H(p_d) (Cover & Thomas,
    // "Elements of Information Theory", 2006, §2.1), so the estimate → exp(mean H).
    const oracle = (g: number) => theta.slice(g * K, (g + 1) * K);
    const result = documentCompletionPerplexity(corpus, groups, [phi], K, oracle);
    console.log(`perplexity at the true parameters ${result.perplexity.toFixed(3)}, exp(true entropy) ${Math.exp(trueEntropy).toFixed(3)}`);
    expect(result.evaluatedTokens).toBe(D * len / 2);
    expect(result.perplexity / Math.exp(trueEntropy)).toBeGreaterThan(0.98);
    expect(result.perplexity / Math.exp(trueEntropy)).toBeLessThan(1.02);
  });

  it('is worse with θ estimated from the observed half, and far better than a uniform guess', () => {
    // Fold-in stand-in for the test: EM for θ with φ fixed (Dempster, Laird & Rubin, JRSS B 1977).
    const foldIn = (_g: number, parts: readonly ObservedDocument[]) => {
      let th = new Float64Array(K).fill(1 / K);
      for (let it = 0; it < 50; it++) {
        const next = new Float64Array(K).fill(0.5);
        for (const part of parts) {
          for (const w of part.words) {
            let z = 0;
            for (let k = 0; k < K; k++) z += th[k] * phi[k * V + w];
            for (let k = 0; k < K; k++) next[k] += (th[k] * phi[k * V + w]) / z;
          }
        }
        const s = next.reduce((a, b) => a + b, 0);
        th = next.map((x) => x / s);
      }
      return th;
    };
    const oracle = documentCompletionPerplexity(corpus, groups, [phi], K, (g) => theta.slice(g * K, (g + 1) * K));
    const estimated = documentCompletionPerplexity(corpus, groups, [phi], K, foldIn);
    const halves = documentCompletionPerplexity(corpus, groups, [phi], K, foldIn, 'first-half');
    const uniform = documentCompletionPerplexity(corpus, groups, [phi], K, () => new Float64Array(K).fill(1 / K));
    expect(estimated.perplexity).toBeGreaterThan(oracle.perplexity);
    expect(estimated.perplexity).toBeLessThan(oracle.perplexity * 1.1);
    expect(halves.perplexity).toBeLessThan(oracle.perplexity * 1.1);
    expect(uniform.perplexity).toBeGreaterThan(estimated.perplexity * 1.2);
  });

  it('folds in a link group from all its documents, skips unknown words and empty groups', () => {
    // Group 0 = docs 0,1 (languages 0 and 1); group 1 = doc 2 with a single token (nothing to evaluate).
    const small = {
      docOffsets: Int32Array.from([0, 4, 8, 9]),
      words: Int32Array.from([0, 1, 0, 5, 1, 1, 0, 1, 0]),
      docLanguage: Uint8Array.from([0, 1, 0]),
      groupDocOffsets: Int32Array.from([0, 2, 3]),
    };
    const phis = [Float64Array.from([0.5, 0.5, 0.9, 0.1]), Float64Array.from([0.2, 0.8, 0.6, 0.4])];
    const seen: number[][] = [];
    const result = documentCompletionPerplexity(small, [0, 1], phis, 2, (_g, parts) => {
      seen.push(parts.map((p) => p.language));
      return Float64Array.from([0.5, 0.5]);
    });
    expect(seen).toEqual([[0, 1]]);
    expect(result.skippedGroups).toBe(1);
    expect(result.unknownTokens).toBe(1); // word 5 is outside language 0's 2-word vocabulary
    // Evaluated: doc 0 odd positions → words 1, 5(unknown); doc 1 → 1, 1.
    // p(1|lang0) = 0.5·0.5 + 0.5·0.1 = 0.3; p(1|lang1) = 0.5·0.8 + 0.5·0.4 = 0.6
    expect(result.logLikelihood).toBeCloseTo(Math.log(0.3) + 2 * Math.log(0.6), 12);
    expect(result.perplexity).toBeCloseTo(Math.exp(-(Math.log(0.3) + 2 * Math.log(0.6)) / 3), 12);
  });
});
