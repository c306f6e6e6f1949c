// Splits link groups into contiguous partitions of about equal token counts, one per thread
// (AD-LDA partitions documents: Newman, Asuncion, Smyth & Welling, "Distributed algorithms for
// topic models", JMLR 10, 2009, §2). Depends only on the corpus and the thread count, so a
// seeded run is reproducible for a given thread count.
import type { Corpus } from '../types.js';

/** bounds[p] .. bounds[p+1] are the groups of partition p (length parts + 1). */
export function partitionGroups(corpus: Corpus, parts: number): Int32Array {
  const G = corpus.numGroups;
  const bounds = new Int32Array(parts + 1);
  const total = corpus.words.length;
  let g = 0;
  for (let p = 1; p < parts; p++) {
    const target = (total * p) / parts;
    while (g < G && corpus.docOffsets[corpus.groupDocOffsets[g + 1]] <= target) g++;
    bounds[p] = Math.max(g, bounds[p - 1]);
  }
  bounds[parts] = G;
  return bounds;
}
