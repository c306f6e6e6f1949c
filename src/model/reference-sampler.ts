// Reference collapsed Gibbs sampler for the polylingual DMR topic model (docs/design.md §4).
//
// Method: for each token i of a document in language ℓ, link group g (pattern p), word w,
//   p(z_i = k | rest) ∝ (n_gk + α_pk) · (n_kw^ℓ + β_ℓ) / (n_k^ℓ + V_ℓ β_ℓ),   counts exclude i,
// the collapsed conditional of Griffiths & Steyvers ("Finding scientific topics", PNAS 2004,
// eq. 5) with one mixture per link group (Mimno et al., "Polylingual Topic Models", EMNLP 2009)
// and a group-specific α from Dirichlet-multinomial regression (Mimno & McCallum, UAI 2008).
// The plain O(K) loop, kept simple on purpose: it is the yardstick every faster sampler is
// tested against and the baseline of the benchmark.
//
// Notes: n_gk is never stored as a dense G×K array. Groups are contiguous in the corpus, so the
// group counts are rebuilt into one K-length scratch array when the sweep enters a group
// (O(tokens of g + K)), which keeps memory at O(N + ΣV·K) even for a million groups.
import type { Corpus, Priors, Rng, Sampler, SamplerFactory } from './types.js';

/** n_kw (ΣV_ℓ × K) and n_k^ℓ (L × K) from the assignments. */
export function countsFromAssignments(corpus: Corpus, z: Uint16Array, K: number): { nkw: Int32Array; nk: Int32Array } {
  const L = corpus.languages.length;
  const nkw = new Int32Array(corpus.wordBase[L] * K);
  const nk = new Int32Array(L * K);
  const D = corpus.docOffsets.length - 1;
  for (let d = 0; d < D; d++) {
    const l = corpus.docLanguage[d];
    const base = corpus.wordBase[l];
    for (let i = corpus.docOffsets[d]; i < corpus.docOffsets[d + 1]; i++) {
      const k = z[i];
      nkw[(base + corpus.words[i]) * K + k]++;
      nk[l * K + k]++;
    }
  }
  return { nkw, nk };
}

/** Uniformly random initial assignments (common practice). */
export function randomAssignments(corpus: Corpus, K: number, rng: Rng): Uint16Array {
  const z = new Uint16Array(corpus.words.length);
  for (let i = 0; i < z.length; i++) z[i] = rng.nextInt(K);
  return z;
}

export function checkPriors(corpus: Corpus, priors: Priors): void {
  const K = priors.K;
  if (!(K >= 1 && K <= 65535)) throw new Error(`The number of themes must be between 1 and 65535 (got ${K}).`);
  if (priors.groupPattern.length !== corpus.numGroups) {
    throw new Error(`groupPattern has ${priors.groupPattern.length} entries for ${corpus.numGroups} groups.`);
  }
  if (priors.alpha.length % K !== 0) throw new Error('alpha length is not a multiple of K.');
  if (priors.beta.length !== corpus.languages.length) throw new Error('beta needs one value per language.');
}

class ReferenceSampler implements Sampler {
  readonly name = 'reference';
  private readonly K: number;
  private readonly nkw: Int32Array;
  private readonly nk: Int32Array;
  private readonly ngk: Int32Array;
  private readonly cum: Float64Array;
  private priors: Priors;

  constructor(private readonly corpus: Corpus, readonly z: Uint16Array, priors: Priors) {
    checkPriors(corpus, priors);
    if (z.length !== corpus.words.length) throw new Error(`z has ${z.length} entries for ${corpus.words.length} tokens.`);
    this.K = priors.K;
    for (let i = 0; i < z.length; i++) {
      if (z[i] >= this.K) throw new Error(`Token ${i} has topic ${z[i]} but K = ${this.K}.`);
    }
    const counts = countsFromAssignments(corpus, z, this.K);
    this.nkw = counts.nkw;
    this.nk = counts.nk;
    this.ngk = new Int32Array(this.K);
    this.cum = new Float64Array(this.K);
    this.priors = priors;
  }

  setPriors(priors: Priors): void {
    checkPriors(this.corpus, priors);
    if (priors.K !== this.K) throw new Error('setPriors cannot change K.');
    this.priors = priors;
  }

  wordTopicCounts(): Int32Array {
    return this.nkw;
  }

  topicTotals(): Int32Array {
    return this.nk;
  }

  sweep(rng: Rng): void {
    const { corpus, z, K, nkw, nk, ngk, cum } = this;
    const { alpha, beta, groupPattern } = this.priors;
    const { words, docOffsets, docLanguage, groupDocOffsets, wordBase, vocabSizes } = corpus;
    const G = corpus.numGroups;
    for (let g = 0; g < G; g++) {
      const d0 = groupDocOffsets[g];
      const d1 = groupDocOffsets[g + 1];
      const t0 = docOffsets[d0];
      const t1 = docOffsets[d1];
      if (t0 === t1) continue;
      ngk.fill(0);
      for (let i = t0; i < t1; i++) ngk[z[i]]++;
      const aOff = groupPattern[g] * K;
      for (let d = d0; d < d1; d++) {
        const l = docLanguage[d];
        const b = beta[l];
        const vb = vocabSizes[l] * b;
        const nkOff = l * K;
        const base = wordBase[l];
        for (let i = docOffsets[d]; i < docOffsets[d + 1]; i++) {
          const row = (base + words[i]) * K;
          let k = z[i];
          ngk[k]--;
          nkw[row + k]--;
          nk[nkOff + k]--;
          let total = 0;
          for (let j = 0; j < K; j++) {
            total += ((ngk[j] + alpha[aOff + j]) * (nkw[row + j] + b)) / (nk[nkOff + j] + vb);
            cum[j] = total;
          }
          const u = rng.nextDouble() * total;
          k = 0;
          while (k < K - 1 && cum[k] <= u) k++;
          z[i] = k;
          ngk[k]++;
          nkw[row + k]++;
          nk[nkOff + k]++;
        }
      }
    }
  }
}

/** The plain O(K) collapsed Gibbs sampler (see file header). */
export const createReferenceSampler: SamplerFactory = (corpus, z, priors) => new ReferenceSampler(corpus, z, priors);
