// A finished run's results as one typed object, and the summaries every page and file needs:
// theme labels, top words per language with probability and exclusivity, document mixtures and
// overall shares.
import { getRun, getThemeLabels, loadJsonResult, loadResults, type Run, type Store } from '../store/index.js';
import type { FeatureEncoding } from '../model/index.js';
import type { FitDiagnostics } from './fit-run.js';

export interface RunModel {
  readonly run: Run;
  readonly K: number;
  readonly languages: string[];
  /** Vocabulary snapshot at fit time, per language. */
  readonly vocabularies: { stems: string[]; surfaces: string[] }[];
  /** φ̂ per language, K×V_ℓ row-major (φ_kw at k·V_ℓ + w). */
  readonly phi: Float64Array[];
  /** Corpus document index → document id; and → link group. */
  readonly documentIds: Int32Array;
  /**
   * Per corpus document, as fitted: language index, survey weight, 1 for an answer; null for a
   * run stored before these were kept (then read from the study's answers).
   */
  readonly fitted: { readonly language: Uint8Array; readonly weight: Float64Array; readonly isAnswer: Uint8Array } | null;
  readonly docGroup: Int32Array;
  readonly heldOutIds: Int32Array;
  /** θ̂ per group, G×K. */
  readonly thetaGroups: Float64Array;
  /** Posterior samples of group mixtures, each G×K. */
  readonly thetaSamples: Float32Array[];
  readonly alpha: Float64Array;
  readonly beta: Float64Array;
  /** λ, K×F row-major, and how covariates become features (null without covariates). */
  readonly lambda: Float64Array | null;
  readonly features: { names: string[]; encoding: FeatureEncoding | null };
  readonly diagnostics: FitDiagnostics;
  /** Label per theme: the saved label or "Theme k+1". */
  readonly labels: string[];
}

export function themeLabel(labels: ReadonlyMap<number, string>, k: number): string {
  return labels.get(k) ?? `Theme ${k + 1}`;
}

/** Load a finished run's results; undefined when the run has none yet. */
export function loadRunModel(store: Store, runId: number): RunModel | undefined {
  const run = getRun(store, runId);
  if (!run) return undefined;
  const r = loadResults(store, runId);
  if (!r.layout || !r.thetaGroups) return undefined;
  const layout = (r.layout.value as { json: { K: number; languages: string[] } }).json;
  const K = layout.K;
  const G = r.thetaGroups.shape[0];
  const samplesFlat = r.thetaSamples.value as Float32Array;
  const S = r.thetaSamples.shape[0] ?? 0;
  const thetaSamples = Array.from({ length: S }, (_, s) => samplesFlat.subarray(s * G * K, (s + 1) * G * K));
  const labels = getThemeLabels(store, runId);
  return {
    run,
    K,
    languages: layout.languages,
    vocabularies: layout.languages.map((l) => (r[`vocabulary:${l}`].value as { json: { stems: string[]; surfaces: string[] } }).json),
    phi: layout.languages.map((l) => r[`phi:${l}`].value as Float64Array),
    documentIds: r.documentIds.value as Int32Array,
    fitted: r.docLanguage && r.docWeight && r.docIsAnswer ? { language: r.docLanguage.value as Uint8Array, weight: r.docWeight.value as Float64Array, isAnswer: r.docIsAnswer.value as Uint8Array } : null,
    docGroup: r.docGroup.value as Int32Array,
    heldOutIds: (r.heldOutIds?.value as Int32Array | undefined) ?? new Int32Array(0),
    thetaGroups: r.thetaGroups.value as Float64Array,
    thetaSamples,
    alpha: r.alpha.value as Float64Array,
    beta: r.beta.value as Float64Array,
    lambda: (r.lambda?.value as Float64Array | undefined) ?? null,
    features: loadJsonResult<{ names: string[]; encoding: FeatureEncoding | null }>(store, runId, 'features') ?? { names: ['intercept'], encoding: null },
    diagnostics: loadJsonResult<FitDiagnostics>(store, runId, 'diagnostics')!,
    labels: Array.from({ length: K }, (_, k) => themeLabel(labels, k)),
  };
}

export interface ThemeWord {
  readonly theme: number;
  readonly language: string;
  readonly rank: number;
  readonly wordId: number;
  /** Most frequent surface form of the stem. */
  readonly word: string;
  readonly stem: string;
  readonly probability: number;
  /**
   * φ_kw / Σ_j φ_jw: how much of the word's weight belongs to this theme (the exclusivity of
   * Bischof & Airoldi, "Summarizing topical content with word frequency and exclusivity", ICML 2012).
   */
  readonly exclusivity: number;
}

/** Top `n` words of theme k in one language (by probability). */
export function themeWords(model: Pick<RunModel, 'K' | 'languages' | 'phi' | 'vocabularies'>, k: number, language: string, n = 10): ThemeWord[] {
  const l = model.languages.indexOf(language);
  if (l < 0) return [];
  const { K } = model;
  const phi = model.phi[l];
  const V = phi.length / K;
  const row = k * V;
  // Partial selection of the n largest (ties: lower word id first): O(V·n), no full sort.
  const m = Math.max(0, Math.min(n, V));
  const order: number[] = [];
  for (let w = 0; w < V && m > 0; w++) {
    const v = phi[row + w];
    if (order.length === m && v <= phi[row + order[m - 1]]) continue;
    let i = order.length === m ? m - 1 : order.length;
    if (order.length < m) order.push(w);
    while (i > 0 && phi[row + order[i - 1]] < v) {
      order[i] = order[i - 1];
      i--;
    }
    order[i] = w;
  }
  return order.map((w, i) => {
    let sum = 0;
    for (let j = 0; j < K; j++) sum += phi[j * V + w];
    return {
      theme: k,
      language,
      rank: i + 1,
      wordId: w,
      word: model.vocabularies[l].surfaces[w] || model.vocabularies[l].stems[w],
      stem: model.vocabularies[l].stems[w],
      probability: phi[row + w],
      exclusivity: sum > 0 ? phi[row + w] / sum : 0,
    };
  });
}

/** θ̂ of every corpus document (its group's mixture), keyed by document id. */
export function documentMixtures(model: RunModel): Map<number, Float64Array> {
  const out = new Map<number, Float64Array>();
  const { K } = model;
  for (let d = 0; d < model.documentIds.length; d++) {
    const g = model.docGroup[d];
    out.set(model.documentIds[d], model.thetaGroups.subarray(g * K, (g + 1) * K));
  }
  return out;
}

/**
 * Mean mixture over the fitted documents, optionally weighted (survey weights by document id);
 * with weights, a fitted document missing from them (a glossary's term list) does not count.
 */
export function overallShares(model: RunModel, weights?: ReadonlyMap<number, number>): Float64Array {
  const { K } = model;
  const out = new Float64Array(K);
  let total = 0;
  for (let d = 0; d < model.documentIds.length; d++) {
    const w = weights ? (weights.get(model.documentIds[d]) ?? 0) : 1;
    const g = model.docGroup[d];
    for (let k = 0; k < K; k++) out[k] += w * model.thetaGroups[g * K + k];
    total += w;
  }
  return total > 0 ? out.map((x) => x / total) : out;
}

/** Index of the largest share (first on ties). */
export function dominantTheme(mixture: ArrayLike<number>): number {
  let best = 0;
  for (let k = 1; k < mixture.length; k++) if (mixture[k] > mixture[best]) best = k;
  return best;
}
