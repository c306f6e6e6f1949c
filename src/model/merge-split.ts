// Merge–split search for the start of a fit.
//
// Why: on short answers a Gibbs chain often settles where one theme is split over two topics
// and two other themes share one topic; leaving that state needs hundreds of coordinated token
// moves that single-token Gibbs updates almost never make.
//
// Method: the split proposal of Jain & Neal ("A split-merge Markov chain Monte Carlo procedure
// for the Dirichlet process mixture model", J. Comput. Graph. Stat. 2004): merge topics a and b
// (every b token becomes a), then split topic c into c and the freed label b by restricted Gibbs
// sweeps that only choose between c and b, using the collapsed conditional of DESIGN §4
// (Griffiths & Steyvers, PNAS 2004, eq. 5). The move is kept when it raises
// log p(w, z | α, β). Used greedily, only to build the starting state (never between saved
// samples): any starting state is valid for a Markov chain.
import { logJointLikelihood } from './log-likelihood.js';
import type { Corpus, Priors, Rng } from './types.js';

export interface MergeSplitSettings {
  /** Restricted Gibbs sweeps per split (Jain & Neal 2004 use a handful; common practice). */
  restrictedSweeps: number;
  /** Rounds over all (merge pair, split topic) candidates; stops early when none helps. */
  rounds: number;
}

export interface MergeSplitResult {
  accepted: number;
  gain: number;
}

/** Token indices of topic c after merging b into a, in corpus order; z is updated. */
export function splitTopic(corpus: Corpus, z: Uint16Array, priors: Priors, c: number, b: number, sweeps: number, rng: Rng): void {
  const K = priors.K;
  const L = corpus.languages.length;
  const rows = corpus.wordBase[L];
  const tokens: number[] = [];
  const tokenDoc: number[] = [];
  const D = corpus.docOffsets.length - 1;
  for (let d = 0; d < D; d++) {
    for (let i = corpus.docOffsets[d]; i < corpus.docOffsets[d + 1]; i++) {
      if (z[i] === c) tokens.push(i), tokenDoc.push(d);
    }
  }
  if (tokens.length === 0) return;
  // Counts of labels c (slot 0) and b (slot 1) per word row, per language, per group.
  const nw = new Int32Array(rows * 2);
  const nl = new Int32Array(L * 2);
  const ng = new Int32Array(corpus.numGroups * 2);
  const slot = new Uint8Array(tokens.length);
  for (let j = 0; j < tokens.length; j++) {
    const d = tokenDoc[j];
    const l = corpus.docLanguage[d];
    const s = rng.nextDouble() < 0.5 ? 0 : 1;
    slot[j] = s;
    nw[(corpus.wordBase[l] + corpus.words[tokens[j]]) * 2 + s]++;
    nl[l * 2 + s]++;
    ng[corpus.docGroup[d] * 2 + s]++;
  }
  for (let t = 0; t < sweeps; t++) {
    for (let j = 0; j < tokens.length; j++) {
      const d = tokenDoc[j];
      const l = corpus.docLanguage[d];
      const g = corpus.docGroup[d];
      const row = (corpus.wordBase[l] + corpus.words[tokens[j]]) * 2;
      const s = slot[j];
      nw[row + s]--;
      nl[l * 2 + s]--;
      ng[g * 2 + s]--;
      const off = priors.groupPattern[g] * K;
      const bl = priors.beta[l];
      const vb = corpus.vocabSizes[l] * bl;
      const p0 = ((ng[g * 2] + priors.alpha[off + c]) * (nw[row] + bl)) / (nl[l * 2] + vb);
      const p1 = ((ng[g * 2 + 1] + priors.alpha[off + b]) * (nw[row + 1] + bl)) / (nl[l * 2 + 1] + vb);
      const ns = rng.nextDouble() * (p0 + p1) < p0 ? 0 : 1;
      slot[j] = ns;
      nw[row + ns]++;
      nl[l * 2 + ns]++;
      ng[g * 2 + ns]++;
    }
  }
  for (let j = 0; j < tokens.length; j++) z[tokens[j]] = slot[j] === 0 ? c : b;
}

/**
 * Greedy merge–split moves (see the file header); z is changed in place and keeps only moves
 * that raise the joint log-likelihood under `priors`.
 */
export function mergeSplitSearch(corpus: Corpus, z: Uint16Array, priors: Priors, rng: Rng, settings: MergeSplitSettings): MergeSplitResult {
  const K = priors.K;
  const result: MergeSplitResult = { accepted: 0, gain: 0 };
  if (K < 3 || z.length === 0) return result;
  let current = logJointLikelihood(corpus, z, K, priors);
  const trial = new Uint16Array(z.length);
  for (let round = 0; round < settings.rounds; round++) {
    let improved = false;
    for (let a = 0; a < K; a++) {
      for (let b = 0; b < K; b++) {
        if (b === a) continue;
        for (let c = 0; c < K; c++) {
          if (c === a || c === b) continue;
          trial.set(z);
          for (let i = 0; i < trial.length; i++) if (trial[i] === b) trial[i] = a;
          splitTopic(corpus, trial, priors, c, b, settings.restrictedSweeps, rng);
          const ll = logJointLikelihood(corpus, trial, K, priors);
          if (ll > current + 1e-9) {
            result.gain += ll - current;
            result.accepted++;
            current = ll;
            z.set(trial);
            improved = true;
          }
        }
      }
    }
    if (!improved) break;
  }
  return result;
}
