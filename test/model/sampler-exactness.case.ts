// Shared exactness suite for every collapsed Gibbs sampler of Themata (reference, fast,
// parallel): one interface, several implementations, one suite (as hono's router tests do).
//
// (a) Enumeration: on a corpus small enough to list every assignment z, the exact posterior
//     p(z | w, α, β) ∝ Π_g DirMult(n_g | α_p(g)) · Π_ℓ,k DirMult(n_kℓ | β_ℓ) is computed with
//     rising factorials (no special functions), and the sampler's long-run state frequencies
//     must match it in total-variation distance.
// (b) Geweke, "Getting it right: joint distribution tests of posterior simulators", JASA 99
//     (2004) 799–804: the marginal-conditional simulator (draw z, w from the model) and the
//     successive-conditional simulator (alternate one sweep of the sampler on z | w with an exact
//     draw of w | z) have the same stationary joint distribution iff the sampler is right; the
//     means of several statistics are compared with a z-test (batch means for the chain, §3).
import { describe, expect, it } from 'vitest';
import { Xoshiro128 } from '../../src/model/rng.js';
import { buildCorpus } from '../../src/model/corpus.js';
import type { Corpus, Priors, Rng, SamplerFactory } from '../../src/model/types.js';

export interface ExactnessOptions {
  /** Sweeps recorded in the enumeration test for K = 2 and K = 3. */
  enumerationSweeps?: { 2: number; 3: number };
  /** Draws of each Geweke simulator. */
  gewekeDraws?: number;
}

/** log of Γ(a + n) / Γ(a) for integer n ≥ 0, as a sum of logs (rising factorial). */
function logRising(a: number, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += Math.log(a + i);
  return s;
}

/** Exact log p(w, z | α, β) of the collapsed model, by rising factorials. */
export function exactLogJoint(corpus: Corpus, z: ArrayLike<number>, priors: Priors): number {
  const K = priors.K;
  let s = 0;
  const ngk = new Int32Array(K);
  for (let g = 0; g < corpus.numGroups; g++) {
    ngk.fill(0);
    let n = 0;
    for (let i = corpus.docOffsets[corpus.groupDocOffsets[g]]; i < corpus.docOffsets[corpus.groupDocOffsets[g + 1]]; i++) {
      ngk[z[i]]++;
      n++;
    }
    let aSum = 0;
    for (let k = 0; k < K; k++) {
      const a = priors.alpha[priors.groupPattern[g] * K + k];
      aSum += a;
      s += logRising(a, ngk[k]);
    }
    s -= logRising(aSum, n);
  }
  const L = corpus.languages.length;
  for (let l = 0; l < L; l++) {
    const V = corpus.vocabSizes[l];
    const b = priors.beta[l];
    const nkw = new Int32Array(V * K);
    const nk = new Int32Array(K);
    for (let d = 0; d < corpus.docOffsets.length - 1; d++) {
      if (corpus.docLanguage[d] !== l) continue;
      for (let i = corpus.docOffsets[d]; i < corpus.docOffsets[d + 1]; i++) {
        nkw[corpus.words[i] * K + z[i]]++;
        nk[z[i]]++;
      }
    }
    for (let k = 0; k < K; k++) {
      for (let w = 0; w < V; w++) s += logRising(b, nkw[w * K + k]);
      s -= logRising(V * b, nk[k]);
    }
  }
  return s;
}

/** Two languages, one link group of two documents plus a one-token group: 5 tokens. */
export function enumerationFixture(K: number): { corpus: Corpus; priors: Priors } {
  const { corpus } = buildCorpus({
    languages: ['en', 'de'],
    vocabSizes: [2, 3],
    documents: [
      { language: 0, tokens: Int32Array.of(0, 1), linkKey: 'a' },
      { language: 1, tokens: Int32Array.of(2, 0), linkKey: 'a' },
      { language: 0, tokens: Int32Array.of(1) },
    ],
  });
  const a0 = [0.3, 0.7, 0.5];
  const a1 = [1.2, 0.4, 0.8];
  const priors: Priors = {
    K,
    groupPattern: Int32Array.of(0, 1),
    alpha: Float64Array.from([...a0.slice(0, K), ...a1.slice(0, K)]),
    beta: Float64Array.of(0.4, 0.15),
  };
  return { corpus, priors };
}

/** Total-variation distance between the sampler's state frequencies and the exact posterior. */
export async function enumerationDistance(factory: SamplerFactory, K: number, sweeps: number, seed = 20040406): Promise<number> {
  const { corpus, priors } = enumerationFixture(K);
  const N = corpus.words.length;
  const S = K ** N;
  const exact = new Float64Array(S);
  const z = new Uint16Array(N);
  let max = -Infinity;
  for (let s = 0; s < S; s++) {
    for (let i = 0, r = s; i < N; i++, r = Math.floor(r / K)) z[i] = r % K;
    exact[s] = exactLogJoint(corpus, z, priors);
    max = Math.max(max, exact[s]);
  }
  let norm = 0;
  for (let s = 0; s < S; s++) norm += exact[s] = Math.exp(exact[s] - max);
  for (let s = 0; s < S; s++) exact[s] /= norm;

  const rng = Xoshiro128.fromSeed(seed);
  const z0 = new Uint16Array(N);
  for (let i = 0; i < N; i++) z0[i] = rng.nextInt(K);
  const sampler = factory(corpus, z0, priors);
  const freq = new Float64Array(S);
  try {
    for (let t = 0; t < 100; t++) sampler.sweep(rng);
    for (let t = 0; t < sweeps; t++) {
      sampler.sweep(rng);
      let s = 0;
      for (let i = N - 1; i >= 0; i--) s = s * K + sampler.z[i];
      freq[s]++;
    }
  } finally {
    await sampler.dispose?.();
  }
  let tv = 0;
  for (let s = 0; s < S; s++) tv += Math.abs(freq[s] / sweeps - exact[s]);
  return tv / 2;
}

/** Corpus of the joint-distribution test: 4 groups, 2 languages, 16 tokens, K = 3. */
function gewekeFixture(): { corpus: Corpus; priors: Priors } {
  const tokens = (n: number) => new Int32Array(n);
  const { corpus } = buildCorpus({
    languages: ['en', 'fr'],
    vocabSizes: [4, 3],
    documents: [
      { language: 0, tokens: tokens(3), linkKey: 'g0' },
      { language: 1, tokens: tokens(2), linkKey: 'g0' },
      { language: 0, tokens: tokens(4) },
      { language: 1, tokens: tokens(3) },
      { language: 0, tokens: tokens(2), linkKey: 'g3' },
      { language: 1, tokens: tokens(2), linkKey: 'g3' },
    ],
  });
  const priors: Priors = {
    K: 3,
    groupPattern: Int32Array.of(0, 1, 0, 1),
    alpha: Float64Array.of(0.5, 1.0, 0.3, 1.5, 0.4, 0.8),
    beta: Float64Array.of(0.3, 0.7),
  };
  return { corpus, priors };
}

function drawCategorical(weights: Float64Array, total: number, rng: Rng): number {
  let u = rng.nextDouble() * total;
  for (let k = 0; k < weights.length - 1; k++) {
    u -= weights[k];
    if (u < 0) return k;
  }
  return weights.length - 1;
}

/** Draws z from p(z | α) by the Pólya urn of each group's Dirichlet-multinomial. */
function drawTopics(corpus: Corpus, priors: Priors, z: Uint16Array, rng: Rng): void {
  const K = priors.K;
  const w = new Float64Array(K);
  for (let g = 0; g < corpus.numGroups; g++) {
    for (let k = 0; k < K; k++) w[k] = priors.alpha[priors.groupPattern[g] * K + k];
    let total = w.reduce((a, b) => a + b, 0);
    for (let i = corpus.docOffsets[corpus.groupDocOffsets[g]]; i < corpus.docOffsets[corpus.groupDocOffsets[g + 1]]; i++) {
      const k = drawCategorical(w, total, rng);
      z[i] = k;
      w[k]++;
      total++;
    }
  }
}

/** Draws w from p(w | z, β) exactly, by the Pólya urn of each (language, topic). */
function drawWords(corpus: Corpus, priors: Priors, z: Uint16Array, words: Int32Array, rng: Rng): void {
  const K = priors.K;
  for (let l = 0; l < corpus.languages.length; l++) {
    const V = corpus.vocabSizes[l];
    const urns = Array.from({ length: K }, () => new Float64Array(V).fill(priors.beta[l]));
    const totals = new Float64Array(K).fill(V * priors.beta[l]);
    for (let d = 0; d < corpus.docOffsets.length - 1; d++) {
      if (corpus.docLanguage[d] !== l) continue;
      for (let i = corpus.docOffsets[d]; i < corpus.docOffsets[d + 1]; i++) {
        const k = z[i];
        const w = drawCategorical(urns[k], totals[k], rng);
        words[i] = w;
        urns[k][w]++;
        totals[k]++;
      }
    }
  }
}

const STAT_NAMES = ['tokens in topic 0', 'distinct topics per group', 'en word 0 in topic 0', 'sum of squared group counts'];

function statistics(corpus: Corpus, K: number, z: Uint16Array, words: Int32Array): number[] {
  let topic0 = 0;
  let word0 = 0;
  let distinct = 0;
  let squares = 0;
  const ngk = new Int32Array(K);
  for (let g = 0; g < corpus.numGroups; g++) {
    ngk.fill(0);
    for (let d = corpus.groupDocOffsets[g]; d < corpus.groupDocOffsets[g + 1]; d++) {
      for (let i = corpus.docOffsets[d]; i < corpus.docOffsets[d + 1]; i++) {
        ngk[z[i]]++;
        if (z[i] === 0) topic0++;
        if (z[i] === 0 && words[i] === 0 && corpus.docLanguage[d] === 0) word0++;
      }
    }
    for (let k = 0; k < K; k++) {
      if (ngk[k] > 0) distinct++;
      squares += ngk[k] * ngk[k];
    }
  }
  return [topic0, distinct / corpus.numGroups, word0, squares];
}

export interface GewekeResult {
  names: string[];
  marginalMeans: number[];
  successiveMeans: number[];
  z: number[];
}

/** Geweke's test: z-scores of the difference in means of each statistic. */
export async function gewekeTest(factory: SamplerFactory, draws: number, seed = 2004): Promise<GewekeResult> {
  const { corpus, priors } = gewekeFixture();
  const K = priors.K;
  const N = corpus.words.length;
  const rng = Xoshiro128.fromSeed(seed);
  const z = new Uint16Array(N);
  const words = new Int32Array(N);
  const m = STAT_NAMES.length;
  const mc: number[][] = Array.from({ length: m }, () => []);
  for (let t = 0; t < draws; t++) {
    drawTopics(corpus, priors, z, rng);
    drawWords(corpus, priors, z, words, rng);
    statistics(corpus, K, z, words).forEach((v, j) => mc[j].push(v));
  }
  const sc: number[][] = Array.from({ length: m }, () => []);
  drawTopics(corpus, priors, z, rng);
  drawWords(corpus, priors, z, words, rng);
  for (let t = 0; t < draws; t++) {
    const current: Corpus = { ...corpus, words: words.slice() };
    const sampler = factory(current, z.slice(), priors);
    try {
      sampler.sweep(rng);
      z.set(sampler.z);
    } finally {
      await sampler.dispose?.();
    }
    drawWords(corpus, priors, z, words, rng);
    statistics(corpus, K, z, words).forEach((v, j) => sc[j].push(v));
  }
  const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
  const variance = (a: number[], mu: number) => a.reduce((s, v) => s + (v - mu) ** 2, 0) / (a.length - 1);
  const batches = 50;
  const zs: number[] = [];
  const mcMeans: number[] = [];
  const scMeans: number[] = [];
  for (let j = 0; j < m; j++) {
    const muM = mean(mc[j]);
    const muS = mean(sc[j]);
    const size = Math.floor(draws / batches);
    const batchMeans = Array.from({ length: batches }, (_, b) => mean(sc[j].slice(b * size, (b + 1) * size)));
    const varS = variance(batchMeans, mean(batchMeans)) / batches;
    const varM = variance(mc[j], muM) / draws;
    zs.push((muM - muS) / Math.sqrt(varM + varS));
    mcMeans.push(muM);
    scMeans.push(muS);
  }
  return { names: STAT_NAMES, marginalMeans: mcMeans, successiveMeans: scMeans, z: zs };
}

/**
 * Registers the exactness tests for one sampler. `factory` may return a sampler whose dispose
 * returns a Promise (parallel samplers); the suite awaits it.
 */
export function describeSamplerExactness(name: string, factory: SamplerFactory, options: ExactnessOptions = {}): void {
  const sweeps = options.enumerationSweeps ?? { 2: 500_000, 3: 2_000_000 };
  const draws = options.gewekeDraws ?? 20_000;
  describe(`${name} sampler: exactness`, () => {
    for (const K of [2, 3] as const) {
      it(`long-run state frequencies match the enumerated posterior within TV 0.01 (K = ${K})`, async () => {
        const tv = await enumerationDistance(factory, K, sweeps[K]);
        expect(tv, `total-variation distance ${tv.toFixed(5)} over ${sweeps[K]} sweeps; tolerance 0.01`).toBeLessThan(0.01);
      });
    }
    it('passes Geweke (JASA 2004) joint distribution test on four statistics', async () => {
      const result = await gewekeTest(factory, draws);
      // Four statistics, each two-sided at 0.1%: |z| < 3.29 (Bonferroni family level ≈ 0.4%).
      result.z.forEach((zj, j) => {
        const msg = `${result.names[j]}: marginal-conditional mean ${result.marginalMeans[j].toFixed(4)}, successive-conditional mean ${result.successiveMeans[j].toFixed(4)}, z = ${zj.toFixed(2)}; tolerance |z| < 3.29`;
        expect(Math.abs(zj), msg).toBeLessThan(3.29);
      });
    });
  });
}
