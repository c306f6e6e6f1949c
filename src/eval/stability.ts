// Stability of themes across runs that differ only in their seed.
//
// Method: after Greene, O'Callaghan & Cunningham, "How many topics? Stability analysis for
// topic models", ECML PKDD 2014, §3: the themes of two runs are put in one-to-one
// correspondence by the Hungarian method (Kuhn 1955; Munkres 1957) maximizing total
// similarity, and agreement is the mean similarity of matched pairs. Greene et al. compare
// top-term rankings by average Jaccard; here, as docs/design.md §6 asks, the similarity is the cosine
// of the themes' full word distributions, all languages concatenated (each φ_kℓ sums to 1, so
// every language weighs the same). With several runs, run 0 is the reference: a theme's score
// is the mean cosine to its matched theme in every other run; the overall score is the mean
// agreement over all pairs of runs.
import { assignRectangular } from './hungarian.js';

/** A run's themes: φ per language, K×V_ℓ row-major (see topicWordDistributions). */
export type RunThemes = readonly Float64Array[];

/** Ka×Kb cosine similarities between the themes of two runs (same vocabularies). */
export function themeCosineMatrix(a: RunThemes, Ka: number, b: RunThemes, Kb: number): Float64Array {
  if (a.length !== b.length) throw new Error(`Runs have ${a.length} and ${b.length} languages; stability needs the same vocabularies.`);
  const dot = new Float64Array(Ka * Kb);
  const na = new Float64Array(Ka);
  const nb = new Float64Array(Kb);
  for (let l = 0; l < a.length; l++) {
    const V = a[l].length / Ka;
    if (b[l].length / Kb !== V) throw new Error(`Language ${l} has ${V} and ${b[l].length / Kb} words in the two runs; stability needs the same vocabularies.`);
    const pa = a[l];
    const pb = b[l];
    for (let i = 0; i < Ka; i++) {
      const ra = i * V;
      for (let w = 0; w < V; w++) na[i] += pa[ra + w] * pa[ra + w];
      for (let j = 0; j < Kb; j++) {
        const rb = j * V;
        let s = 0;
        for (let w = 0; w < V; w++) s += pa[ra + w] * pb[rb + w];
        dot[i * Kb + j] += s;
      }
    }
    for (let j = 0; j < Kb; j++) for (let w = 0; w < V; w++) nb[j] += pb[j * V + w] * pb[j * V + w];
  }
  for (let i = 0; i < Ka; i++) {
    for (let j = 0; j < Kb; j++) {
      const d = Math.sqrt(na[i] * nb[j]);
      dot[i * Kb + j] = d > 0 ? dot[i * Kb + j] / d : 0;
    }
  }
  return dot;
}

export interface ThemeMatching {
  /** Matched theme of run b for each theme of run a (−1 when Ka > Kb leaves it unmatched). */
  readonly matchOf: Int32Array;
  /** Cosine of each theme of run a with its match (0 when unmatched). */
  readonly similarity: Float64Array;
  /** Mean similarity over the themes of run a (Greene et al. 2014 agreement). */
  readonly agreement: number;
}

/** Match the themes of run a to those of run b, maximizing total cosine similarity. */
export function matchThemes(a: RunThemes, Ka: number, b: RunThemes, Kb: number): ThemeMatching {
  const sim = themeCosineMatrix(a, Ka, b, Kb);
  const cost = sim.map((s) => -s);
  const { rowToColumn } = assignRectangular(cost, Ka, Kb);
  const similarity = new Float64Array(Ka);
  let sum = 0;
  for (let i = 0; i < Ka; i++) {
    const j = rowToColumn[i];
    similarity[i] = j >= 0 ? sim[i * Kb + j] : 0;
    sum += similarity[i];
  }
  return { matchOf: rowToColumn, similarity, agreement: Ka > 0 ? sum / Ka : NaN };
}

export interface StabilityResult {
  /** Per theme of the reference run (run 0): mean matched cosine over the other runs. */
  readonly perTheme: Float64Array;
  /** Mean agreement over all pairs of runs. */
  readonly overall: number;
  /** agreement[i][j] for i < j (upper triangle; NaN elsewhere). */
  readonly agreement: number[][];
  /** For each run r, the theme of run r matched to each reference theme (identity for run 0). */
  readonly matchesToReference: Int32Array[];
}

/** Stability of K themes over several runs (Greene, O'Callaghan & Cunningham 2014). */
export function stabilityAcrossRuns(runs: readonly RunThemes[], K: number): StabilityResult {
  const R = runs.length;
  if (R < 2) throw new Error('Stability needs at least two runs with different seeds.');
  const perTheme = new Float64Array(K);
  const agreement = Array.from({ length: R }, () => new Array<number>(R).fill(NaN));
  const matchesToReference: Int32Array[] = [Int32Array.from({ length: K }, (_, k) => k)];
  let total = 0;
  let count = 0;
  for (let i = 0; i < R; i++) {
    for (let j = i + 1; j < R; j++) {
      const m = matchThemes(runs[i], K, runs[j], K);
      agreement[i][j] = m.agreement;
      total += m.agreement;
      count++;
      if (i === 0) {
        matchesToReference.push(m.matchOf);
        for (let k = 0; k < K; k++) perTheme[k] += m.similarity[k] / (R - 1);
      }
    }
  }
  return { perTheme, overall: total / count, agreement, matchesToReference };
}
