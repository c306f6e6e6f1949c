// Group contrasts for a run (docs/design.md §6): the fitted answers' posterior mixture samples, the
// chosen covariate's levels and the survey weights, handed to src/stats.
import { groupContrasts, type ContrastResult } from '../stats/index.js';
import { covariateLevels, iterateDocuments, type Store } from '../store/index.js';
import { InputError } from '../text/index.js';
import type { RunModel } from './run-model.js';

export interface ContrastRequest {
  /** Covariate name; also 'language' and 'question'. */
  by: string;
  draws?: number;
  seed?: number;
  reference?: string;
  fdr?: number | null;
  /** Bins for a numeric covariate (quartiles by default). */
  bins?: number;
}

/** Names a contrast can be asked for: the study's covariates, plus language and question. */
export function contrastCovariates(store: Store, studyId: number): string[] {
  return ['language', 'question', ...Object.keys(covariateLevels(store, studyId, 1))];
}

/** Most θ values held in memory for the draws (≈40 MB of float32; common practice). */
const MAX_THETA_VALUES = 10_000_000;

/**
 * What the contrasts of one fitted run read from the study, read once for every covariate asked
 * for: the answers' weights and levels, the glossary documents that were fitted, and the
 * posterior mixture samples per answer. A run's summaries compare groups by several covariates;
 * reading the answers once instead of once per covariate keeps the summaries off the critical
 * path at a million answers (issue 15).
 */
export interface ContrastData {
  readonly known: readonly string[];
  readonly weights: Float64Array;
  readonly values: ReadonlyMap<string, readonly (string | number | null)[]>;
  readonly glossaryDocs: number;
  readonly samples: readonly Float32Array[];
}

export function contrastData(store: Store, model: RunModel, covariates?: readonly string[]): ContrastData {
  const known = contrastCovariates(store, model.run.studyId);
  const names = covariates ?? known;
  for (const by of names) if (!known.includes(by)) throw unknownCovariate(by, known);
  const { K } = model;
  const D = model.documentIds.length;
  const index = new Map<number, number>();
  model.documentIds.forEach((id, d) => index.set(id, d));
  const weights = new Float64Array(D).fill(1);
  const values = new Map(names.map((by) => [by, new Array<string | number | null>(D).fill(null)]));
  for (const doc of iterateDocuments(store, model.run.studyId, { excluded: false })) {
    const d = index.get(doc.id);
    if (d === undefined) continue;
    weights[d] = doc.weight;
    for (const [by, raw] of values) raw[d] = by === 'language' ? doc.language : by === 'question' ? doc.question : (doc.covariates[by] ?? null);
  }
  // A glossary's term lists were fitted (they tie the languages together) but are no answers:
  // they have no level, and are not reported as answers left out either.
  let glossaryDocs = 0;
  for (const doc of iterateDocuments(store, model.run.studyId, { kind: 'glossary' })) if (index.has(doc.id)) glossaryDocs++;
  const S = Math.max(1, Math.min(model.thetaSamples.length, Math.floor(MAX_THETA_VALUES / Math.max(1, D * K))));
  const sources = model.thetaSamples.length ? model.thetaSamples.slice(-S) : [Float32Array.from(model.thetaGroups)];
  const samples = sources.map((groups) => {
    const out = new Float32Array(D * K);
    for (let d = 0; d < D; d++) out.set(groups.subarray(model.docGroup[d] * K, model.docGroup[d] * K + K), d * K);
    return out;
  });
  return { known, weights, values, glossaryDocs, samples };
}

function unknownCovariate(by: string, known: readonly string[]): InputError {
  return new InputError(`There is no covariate "${by}" in this study. Choose one of: ${known.join(', ')}.`);
}

export function runContrasts(store: Store, model: RunModel, request: ContrastRequest): ContrastResult {
  return contrastsFromData(model, contrastData(store, model, [request.by]), request);
}

/** The contrasts by one covariate, from data read by contrastData (which must include it). */
export function contrastsFromData(model: RunModel, data: ContrastData, request: ContrastRequest): ContrastResult {
  const source = data.values.get(request.by);
  if (!source) throw unknownCovariate(request.by, data.known);
  const { K } = model;
  const D = model.documentIds.length;
  const { weights, glossaryDocs, samples } = data;
  const raw = source.slice();
  // Linked answers (translations, paired texts) are one respondent with one mixture: count each
  // link group once per level, by its first answer (and that answer's weight), so a translated
  // answer does not double its respondent's weight; members in different levels (e.g. by
  // language) count once in each.
  const seen = new Set<string>();
  let merged = 0;
  for (let d = 0; d < D; d++) {
    if (raw[d] === null) continue;
    const key = `${model.docGroup[d]}\u0000${String(raw[d])}`;
    if (seen.has(key)) {
      raw[d] = null;
      merged++;
    } else seen.add(key);
  }
  const numeric = raw.every((v) => v === null || typeof v === 'number') && raw.some((v) => v !== null) && request.by !== 'language' && request.by !== 'question';
  // Resample a link group's answers together (cluster bootstrap, Davison & Hinkley 1997, §3.8).
  const options = { weights, clusterOfDoc: model.docGroup, draws: request.draws ?? 1000, seed: request.seed ?? 1, themeLabels: model.labels, fdr: request.fdr === undefined ? 0.05 : request.fdr, ...(request.reference ? { reference: request.reference } : {}) };
  // The linked answers set aside above reach the statistics as "left out"; say what they are
  // instead, and count as left out only the answers that really lack a value or a weight.
  const withNote = (res: ContrastResult): ContrastResult => {
    if (!merged && !glossaryDocs) return res;
    const excluded = res.excludedDocuments - merged - glossaryDocs;
    const notes = res.notes.filter((n) => !/document\(s\) left out/.test(n));
    if (excluded > 0) notes.unshift(`${excluded} document(s) left out: no value for "${request.by}" or an unusable weight.`);
    if (merged) notes.push(`Linked answers are one respondent: each link group counts once per level (its first answer and weight); ${merged} linked ${merged === 1 ? 'answer was' : 'answers were'} not counted again.`);
    return { ...res, excludedDocuments: excluded, notes };
  };
  if (numeric) {
    const values = Float64Array.from(raw, (v) => (typeof v === 'number' ? v : NaN));
    return withNote(groupContrasts({ K, D, samples }, { name: request.by, kind: 'numeric', values, bins: request.bins }, options));
  }
  const levels = [...new Set(raw.filter((v): v is string | number => v !== null).map(String))].sort((a, b) => a.localeCompare(b, undefined, { numeric: true }));
  const levelIndex = new Map(levels.map((l, i) => [l, i]));
  const levelOfDoc = Int32Array.from(raw, (v) => (v === null ? -1 : levelIndex.get(String(v))!));
  return withNote(groupContrasts({ K, D, samples }, { name: request.by, kind: 'categorical', levels, levelOfDoc }, options));
}

export const SHARES_HEADER = ['covariate', 'level', 'theme', 'share', 'low', 'high', 'n', 'effective n'];
