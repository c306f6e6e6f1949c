// Collocations: frequent adjacent word pairs that behave as one word ("waiting time",
// "customer service") become one token "waiting_time".
//
// Method. Normalized pointwise mutual information (Bouma 2009, "Normalized (pointwise) mutual
// information in collocation extraction", Proceedings of GSCL, eq. 7):
//   npmi(x, y) = ln( p(x, y) / (p(x) p(y)) ) / −ln p(x, y)   ∈ [−1, 1]
// with p(x, y) = c(x y) / N and p(x) = c(x) / N over the N tokens (one denominator, so that
// p(x, y) ≤ min(p(x), p(y)) and NPMI stays in [−1, 1]). 1 means x and y only ever occur
// together; 0 means independence. Pairs below a minimum count
// are not considered: NPMI of rare pairs is unreliable (Bouma 2009, §4).

/** Separator in a token sequence: the neighbours across it were not adjacent in the text. */
export const GAP = -1;

/**
 * Find collocations among id sequences (GAP marks breaks): the set of pair keys
 * `a * typeCount + b` whose count reaches minCount and whose NPMI reaches the threshold.
 */
export function findCollocations(
  sequences: readonly Int32Array[],
  typeCount: number,
  minCount: number,
  threshold: number,
): Set<number> {
  const unigram = new Float64Array(typeCount);
  const pairs = new Map<number, number>();
  let tokens = 0;
  let pairTotal = 0; // pairs seen; 0 means no pair at all
  for (const seq of sequences) {
    let previous = GAP;
    for (let i = 0; i < seq.length; i++) {
      const id = seq[i];
      if (id === GAP) {
        previous = GAP;
        continue;
      }
      unigram[id]++;
      tokens++;
      if (previous !== GAP) {
        const key = previous * typeCount + id;
        pairs.set(key, (pairs.get(key) ?? 0) + 1);
        pairTotal++;
      }
      previous = id;
    }
  }
  const chosen = new Set<number>();
  if (pairTotal === 0) return chosen;
  for (const [key, count] of pairs) {
    if (count < minCount) continue;
    const a = Math.floor(key / typeCount);
    const b = key - a * typeCount;
    const pxy = count / tokens;
    const px = unigram[a] / tokens;
    const py = unigram[b] / tokens;
    const npmi = Math.log(pxy / (px * py)) / -Math.log(pxy);
    if (npmi >= threshold) chosen.add(key);
  }
  return chosen;
}

/**
 * Join chosen pairs left to right (a token joins at most one pair) and drop the GAP markers.
 * `joinedId(a, b)` gives the id of the joined token.
 */
export function joinCollocations(
  seq: Int32Array,
  typeCount: number,
  chosen: ReadonlySet<number>,
  joinedId: (a: number, b: number) => number,
): Int32Array {
  const out: number[] = [];
  for (let i = 0; i < seq.length; i++) {
    const id = seq[i];
    if (id === GAP) continue;
    const next = i + 1 < seq.length ? seq[i + 1] : GAP;
    if (next !== GAP && chosen.has(id * typeCount + next)) {
      out.push(joinedId(id, next));
      i++;
    } else out.push(id);
  }
  return Int32Array.from(out);
}
