// Merge–split search for the start of a fit.
//
// Why: on short answers a Gibbs chain often settles where one theme is split over two topics
// and two other themes share one topic; leaving that state needs hundreds of coordinated token
// moves that single-token Gibbs updates almost never make.
//
// Method: the split proposal of Jain & Neal ("A split-merge Markov chain Monte Carlo procedure
// for the Dirichlet process mixture model", J. Comput. Graph. Stat. 2004): merge topics a and b
// (every b token becomes a), then split topic c into c and the freed label b by restricted Gibbs
// sweeps that only choose between c and b, using the collapsed conditional of docs/design.md §4
// (Griffiths & Steyvers, PNAS 2004, eq. 5). Here it is a perturbation for a search, not an MCMC
// move: the caller lets the chain relax for some sweeps and keeps the result only if the joint
// likelihood is then higher (iterated local search, common practice). Used only to build the
// starting state (never between saved samples): any starting state is valid for a Markov chain.
import { logJointLikelihood } from './log-likelihood.js';
import { relabelLanguages } from './relabel.js';
import type { Corpus, Priors, Rng } from './types.js';

/** Splits topic c into c and the empty label b by restricted Gibbs sweeps from a random halving. */
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
 * One merge–split perturbation (see the file header): merge one of the `choices` pairs whose
 * merge costs least likelihood, then split the topic whose split (followed by per-language
 * relabelling) scores best. z is changed in place; the caller decides whether to keep the result
 * after letting the chain relax. Cost: K(K−1) likelihood evaluations for the merges and K−2
 * restricted splits, each O(tokens of the topic · restrictedSweeps).
 */
export function perturbMergeSplit(corpus: Corpus, z: Uint16Array, priors: Priors, rng: Rng, restrictedSweeps: number, choices = 3): void {
  const K = priors.K;
  if (K < 3 || z.length === 0) return;
  const merges: [number, number, number][] = [];
  const trial = new Uint16Array(z.length);
  for (let a = 0; a < K; a++) {
    for (let b = 0; b < K; b++) {
      if (a === b) continue;
      trial.set(z);
      for (let i = 0; i < trial.length; i++) if (trial[i] === b) trial[i] = a;
      merges.push([logJointLikelihood(corpus, trial, K, priors), a, b]);
    }
  }
  merges.sort((x, y) => y[0] - x[0] || x[1] - y[1] || x[2] - y[2]);
  const [, a, b] = merges[Math.min(merges.length - 1, rng.nextInt(Math.max(1, choices)))];
  let best = -Infinity;
  let bestZ: Uint16Array | null = null;
  for (let c = 0; c < K; c++) {
    if (c === a || c === b) continue;
    const t = z.slice();
    for (let i = 0; i < t.length; i++) if (t[i] === b) t[i] = a;
    splitTopic(corpus, t, priors, c, b, restrictedSweeps, rng);
    relabelLanguages(corpus, t, priors);
    const ll = logJointLikelihood(corpus, t, K, priors);
    if (ll > best) (best = ll), (bestZ = t);
  }
  if (bestZ) z.set(bestZ);
}
