// Language reset: a perturbation for the start search that re-draws every assignment of one
// language while the other languages' assignments stay fixed.
//
// Why: a language with few answers is tied to the others only by its link groups; once its topics
// have formed as mixtures of several themes, single-token Gibbs updates rarely untangle them. With
// the other languages frozen, the linked documents carry their (usually cleaner) topics over.
//
// Method, the initialization of initialize.ts restricted to language ℓ: (1) the ℓ-tokens of
// multilingual link groups start at random and get `sweeps` Gibbs sweeps whose group counts
// include the frozen tokens of the other languages; (2) every other ℓ-token is drawn from the
// collapsed conditional (docs/design.md §4; Griffiths & Steyvers, PNAS 2004, eq. 5) with the word counts of
// step 1 held fixed; (3) `sweeps` Gibbs sweeps over all ℓ-tokens. The caller relaxes the whole
// chain and keeps the result only if the joint likelihood rises (start-search.ts).
import type { Corpus, Priors, Rng } from './types.js';

/** Re-draws the assignments of language ℓ in place (see the file header). */
export function resetLanguage(corpus: Corpus, z: Uint16Array, priors: Priors, language: number, sweeps: number, rng: Rng): void {
  const K = priors.K;
  const V = corpus.vocabSizes[language];
  const b = priors.beta[language];
  const vb = V * b;
  const nkw = new Int32Array(V * K);
  const nk = new Int32Array(K);
  const ngk = new Int32Array(K);
  const p = new Float64Array(K);
  const { docOffsets, groupDocOffsets, docLanguage, words } = corpus;
  // Which groups are multilingual and hold ℓ documents.
  const linked = new Uint8Array(corpus.numGroups);
  const hasOwn = new Uint8Array(corpus.numGroups);
  for (let g = 0; g < corpus.numGroups; g++) {
    let own = false;
    let other = false;
    for (let d = groupDocOffsets[g]; d < groupDocOffsets[g + 1]; d++) {
      if (docOffsets[d + 1] === docOffsets[d]) continue;
      if (docLanguage[d] === language) own = true;
      else other = true;
    }
    hasOwn[g] = own ? 1 : 0;
    linked[g] = own && other ? 1 : 0;
  }
  // 0 = not yet assigned (ignored in counts), 1 = assigned.
  const active = new Uint8Array(z.length);
  const draw = (i: number, g: number, update: boolean): void => {
    const row = words[i] * K;
    const off = priors.groupPattern[g] * K;
    let total = 0;
    for (let k = 0; k < K; k++) {
      total += ((ngk[k] + priors.alpha[off + k]) * (nkw[row + k] + b)) / (nk[k] + vb);
      p[k] = total;
    }
    const u = rng.nextDouble() * total;
    let k = 0;
    while (k < K - 1 && p[k] <= u) k++;
    z[i] = k;
    ngk[k]++;
    if (update) nkw[row + k]++, nk[k]++;
  };
  const groupCounts = (g: number): void => {
    ngk.fill(0);
    for (let d = groupDocOffsets[g]; d < groupDocOffsets[g + 1]; d++) {
      const own = docLanguage[d] === language;
      for (let i = docOffsets[d]; i < docOffsets[d + 1]; i++) if (!own || active[i]) ngk[z[i]]++;
    }
  };
  const sweep = (onlyLinked: boolean): void => {
    for (let g = 0; g < corpus.numGroups; g++) {
      if (!hasOwn[g] || (onlyLinked && !linked[g])) continue;
      groupCounts(g);
      for (let d = groupDocOffsets[g]; d < groupDocOffsets[g + 1]; d++) {
        if (docLanguage[d] !== language) continue;
        for (let i = docOffsets[d]; i < docOffsets[d + 1]; i++) {
          const row = words[i] * K;
          ngk[z[i]]--;
          nkw[row + z[i]]--;
          nk[z[i]]--;
          draw(i, g, true);
        }
      }
    }
  };
  // Step 1: linked ℓ-tokens from random labels.
  for (let g = 0; g < corpus.numGroups; g++) {
    if (!linked[g]) continue;
    for (let d = groupDocOffsets[g]; d < groupDocOffsets[g + 1]; d++) {
      if (docLanguage[d] !== language) continue;
      for (let i = docOffsets[d]; i < docOffsets[d + 1]; i++) {
        const k = rng.nextInt(K);
        z[i] = k;
        active[i] = 1;
        nkw[words[i] * K + k]++;
        nk[k]++;
      }
    }
  }
  for (let t = 0; t < sweeps; t++) sweep(true);
  // Step 2: every other ℓ-token with the word counts of step 1 fixed.
  const pending: number[] = [];
  for (let g = 0; g < corpus.numGroups; g++) {
    if (!hasOwn[g] || linked[g]) continue;
    groupCounts(g);
    for (let d = groupDocOffsets[g]; d < groupDocOffsets[g + 1]; d++) {
      if (docLanguage[d] !== language) continue;
      for (let i = docOffsets[d]; i < docOffsets[d + 1]; i++) {
        draw(i, g, false);
        active[i] = 1;
        pending.push(i);
      }
    }
  }
  for (const i of pending) nkw[words[i] * K + z[i]]++, nk[z[i]]++;
  // Step 3: sweeps over all ℓ-tokens.
  for (let t = 0; t < sweeps; t++) sweep(false);
}
