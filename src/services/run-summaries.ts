// The summaries a fit stores beside its results, so the results pages and every way of fitting
// (the command line in process, the workbench in a worker thread) show the same figures: group
// contrasts for every covariate (and language, question) and the checks. Computed once after the
// sweeps, off the request path, instead of while someone waits for a page.
import { linkSummary, loadJsonResult, type LinkSummary, type ResultValue, type Run, type StoredResult, type Store } from '../store/index.js';
import { runChecks } from './checks.js';
import { contrastCovariates, contrastData, contrastsFromData, type ContrastData } from './contrasts.js';
import type { RunModel } from './run-model.js';

/** Bootstrap × posterior draws for stored group contrasts (common practice for 95% percentile intervals). */
export const CONTRAST_DRAWS = 1000;

export function contrastKey(covariate: string): string {
  return `contrast:${covariate}`;
}

export interface SummaryHooks {
  /** One call per summary about to be computed: its description, and its place among all. */
  onStep?: (step: { label: string; index: number; count: number }) => void;
  /** Checked before each summary; true stops and returns what is done so far. */
  shouldStop?: () => boolean;
}

/** Names of the summaries of a run of this study, in the order they are computed. */
export function summarySteps(store: Store, studyId: number): string[] {
  return [...contrastCovariates(store, studyId).map(contrastKey), 'checks'];
}

/**
 * Contrasts and checks of a fitted run (given as a model, stored or not yet), as result entries.
 * A covariate the contrasts cannot use (e.g. one level only) is left out and computed on demand.
 */
export function computeRunSummaries(store: Store, model: RunModel, hooks: SummaryHooks = {}): { entries: Record<string, ResultValue | StoredResult>; stopped: boolean } {
  const entries: Record<string, ResultValue | StoredResult> = {};
  const names = contrastCovariates(store, model.run.studyId);
  const count = names.length + 1;
  let data: ContrastData | null = null;
  for (let i = 0; i < names.length; i++) {
    if (hooks.shouldStop?.()) return { entries, stopped: true };
    hooks.onStep?.({ label: `comparing groups by ${names[i]}`, index: i, count });
    try {
      // The answers are read once for all covariates (contrasts.ts).
      data ??= contrastData(store, model, names);
      entries[contrastKey(names[i])] = { json: contrastsFromData(model, data, { by: names[i], draws: CONTRAST_DRAWS }) };
    } catch {
      // computed on demand instead (see above)
    }
  }
  if (hooks.shouldStop?.()) return { entries, stopped: true };
  hooks.onStep?.({ label: 'checking the model', index: names.length, count });
  // How the languages were tied when the run was fitted: what its pages warn about; and the
  // covariates its answers can be compared by (both need a pass over every answer otherwise).
  entries[TIES_KEY] = { json: linkSummary(store, model.run.studyId) };
  entries[COVARIATES_KEY] = { json: names };
  try {
    entries.checks = { json: runChecks(store, model) };
  } catch {
    // The Checks page computes them when opened.
  }
  return { entries, stopped: false };
}

const TIES_KEY = 'ties';
const COVARIATES_KEY = 'contrast-covariates';

/** The names a run's contrasts can be asked for, as stored with its summaries or as the study has them now. */
export function runContrastCovariates(store: Store, run: Run): string[] {
  return loadJsonResult<string[]>(store, run.id, COVARIATES_KEY) ?? contrastCovariates(store, run.studyId);
}

/**
 * How the study's languages were tied together (link groups, glossary rows) when the run was
 * fitted — stored with its summaries, so its pages need no pass over every answer — or, for a
 * run fitted before that was stored, as the study is now.
 */
export function runTies(store: Store, run: Run): LinkSummary {
  return loadJsonResult<LinkSummary>(store, run.id, TIES_KEY) ?? linkSummary(store, run.studyId);
}
