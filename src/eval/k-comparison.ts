// Choosing K: held-out perplexity, coherence and stability over a range of K, side by side
// (docs/design.md §6). Several seeds per K give the spread of perplexity and the stability score
// (Greene, O'Callaghan & Cunningham, ECML PKDD 2014).
import { stabilityAcrossRuns, type RunThemes } from './stability.js';

/** Figures of one fitted run. */
export interface KRunSummary {
  readonly K: number;
  readonly seed?: number;
  readonly perplexity: number;
  /** Mean NPMI over themes and languages. */
  readonly npmi: number;
  /** Mean log-conditional coherence over themes and languages. */
  readonly logConditional: number;
  /** The run's themes, for stability (needs ≥ 2 runs of the same K). */
  readonly themes?: RunThemes;
}

export interface KComparisonRow {
  readonly K: number;
  readonly runs: number;
  readonly perplexity: number;
  readonly perplexityMin: number;
  readonly perplexityMax: number;
  readonly npmi: number;
  readonly logConditional: number;
  /** Mean matched cosine over pairs of seeds; NaN with a single run. */
  readonly stability: number;
}

/** One row per K (ascending): means over the runs of that K and their stability. */
export function buildKComparison(runs: readonly KRunSummary[]): KComparisonRow[] {
  const byK = new Map<number, KRunSummary[]>();
  for (const r of runs) {
    const list = byK.get(r.K) ?? [];
    list.push(r);
    byK.set(r.K, list);
  }
  const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;
  return [...byK.keys()].sort((a, b) => a - b).map((K) => {
    const list = byK.get(K)!;
    const perplexities = list.map((r) => r.perplexity);
    const withThemes = list.filter((r) => r.themes).map((r) => r.themes!);
    return {
      K,
      runs: list.length,
      perplexity: mean(perplexities),
      perplexityMin: Math.min(...perplexities),
      perplexityMax: Math.max(...perplexities),
      npmi: mean(list.map((r) => r.npmi)),
      logConditional: mean(list.map((r) => r.logConditional)),
      stability: withThemes.length >= 2 ? stabilityAcrossRuns(withThemes, K).overall : NaN,
    };
  });
}

/** Mean NPMI and log-conditional coherence over rows (themes × languages), skipping NaN. */
export function meanCoherence(rows: readonly { npmi: number; logConditional: number; pairs: number }[]): { npmi: number; logConditional: number } {
  let n = 0;
  let npmi = 0;
  let lc = 0;
  for (const r of rows) {
    if (r.pairs === 0 || Number.isNaN(r.npmi)) continue;
    n++;
    npmi += r.npmi;
    lc += r.logConditional;
  }
  return { npmi: n > 0 ? npmi / n : NaN, logConditional: n > 0 ? lc / n : NaN };
}
