// The floor loop of the sampler benchmark (issue #5): the memory traffic every Gibbs sampler of
// docs/design.md §4 must do per token (read word and topic, rebuild the group's counts, move the token in
// n_gk, n_kw and n_k), with the topic choice replaced by a fixed rotation: no probabilities, no
// random numbers. No sampler can beat it; its tokens/s is the practical ceiling.
import type { Corpus } from '../../src/model/types.js';

export function floorSweep(corpus: Corpus, z: Uint16Array, K: number, nkw: Int32Array, nk: Int32Array, ngk: Int32Array): void {
  const { words, docOffsets, docLanguage, groupDocOffsets, wordBase } = corpus;
  const G = corpus.numGroups;
  for (let g = 0; g < G; g++) {
    const d0 = groupDocOffsets[g];
    const d1 = groupDocOffsets[g + 1];
    const t0 = docOffsets[d0];
    const t1 = docOffsets[d1];
    for (let i = t0; i < t1; i++) ngk[z[i]]++;
    for (let d = d0; d < d1; d++) {
      const lK = docLanguage[d] * K;
      const base = wordBase[docLanguage[d]];
      const i1 = docOffsets[d + 1];
      for (let i = docOffsets[d]; i < i1; i++) {
        const rowK = (base + words[i]) * K;
        const old = z[i];
        ngk[old]--;
        nkw[rowK + old]--;
        nk[lK + old]--;
        const nw = old + 1 === K ? 0 : old + 1;
        ngk[nw]++;
        nkw[rowK + nw]++;
        nk[lK + nw]++;
        z[i] = nw;
      }
    }
    for (let i = t0; i < t1; i++) ngk[z[i]] = 0;
  }
}
