// Creating a fit: a run of a study with its settings checked and completed from the one settings
// schema (run-settings-schema.ts), refused with a message in the words of the place the person
// is (a flag on the command line, a field on the Runs page) when a setting is out of bounds, a
// covariate or the study is unknown, the name is taken, or the study has no answers to fit.
// Running it is fit-job.ts; the lifecycle around it (status, progress, workers) is src/jobs.
import { covariateLevels, createRun, getRunByName, getStudy, getStudyByName, languageSummary, uniqueRunName, type Run, type RunSettings, type Store } from '../store/index.js';
import { InputError } from '../text/index.js';
import {
  checkRunSettings,
  COVARIATES_SETTING,
  NAME_SETTING,
  runSettingsOf,
  settingWord,
  type FitRequest,
  type SettingLimits,
  type Wording,
} from './run-settings-schema.js';

export type { FitRequest } from './run-settings-schema.js';
// Running a fit lives in fit-job.ts; re-exported here for the callers of the one fit module.
export { runFitJob, prepareCorpus, type FitJobOptions, type FitJobOutcome, type PreparedCorpus } from './fit-job.js';
export type { FitDiagnostics } from './fit-results.js';

/** Settings with defaults filled in (run-settings-schema.ts has every default and its source). */
export function fitSettings(request: FitRequest): RunSettings {
  return runSettingsOf(request);
}

export interface FitPlace {
  /** Words of the messages: flags (command line, the default) or field labels (workbench). */
  wording?: Wording;
  /** Bounds that depend on the place, e.g. the server's cores for threads. */
  limits?: SettingLimits;
}

/** Check a fit's settings against the schema and the study; throws an InputError a researcher can act on. */
export function validateFit(store: Store, studyId: number, settings: RunSettings, place: FitPlace = {}): void {
  const wording = place.wording ?? 'flag';
  checkRunSettings(settings, wording, place.limits);
  const levels = covariateLevels(store, studyId, 1);
  for (const c of settings.covariates) {
    if (!(c in levels)) {
      const known = Object.keys(levels);
      const how = wording === 'flag' ? 'Import the file with --covariate COL first.' : 'Import the file again with a group column first.';
      throw new InputError(`The study has no covariate "${c}" (${settingWord(COVARIATES_SETTING, wording)}). ${known.length ? `Known covariates: ${known.join(', ')}.` : how}`);
    }
  }
}

/** Resolve a study by name or id; InputError when missing. */
export function requireStudy(store: Store, study: string | number) {
  const found = typeof study === 'number' ? getStudy(store, study) : getStudyByName(store, study);
  if (!found) throw new InputError(`There is no study called "${study}". Import a file with --study "${study}" first.`);
  return found;
}

/** Answers of the study a fit would use (included, in a language). */
export function answersToFit(store: Store, studyId: number): number {
  return languageSummary(store, studyId).reduce((n, row) => n + (row.language === null ? 0 : row.included), 0);
}

/** Create a queued run for a study after checking the request. */
export function createFitRun(store: Store, study: string | number, request: FitRequest, place: FitPlace = {}): Run {
  const wording = place.wording ?? 'flag';
  const s = requireStudy(store, study);
  const settings = runSettingsOf(request);
  validateFit(store, s.id, settings, place);
  if (answersToFit(store, s.id) === 0) {
    throw new InputError(
      `Study "${s.name}" has no answers to fit yet. ` +
        (wording === 'flag'
          ? `Import a file with answers first (themata import FILE --study "${s.name}" --text COLUMN), or check \`themata languages\` and \`themata vocabulary\` for answers left out.`
          : 'Import a file with answers on the Data page first, or check the Languages and Vocabulary pages for answers left out.'),
    );
  }
  const given = request.name?.trim();
  if (given !== undefined && given.length > NAME_SETTING.maxLength) {
    throw new InputError(`${settingWord(NAME_SETTING, wording)} may be at most ${NAME_SETTING.maxLength} characters (got ${given.length}).`);
  }
  if (given && getRunByName(store, s.id, given)) {
    throw new InputError(`Study "${s.name}" has a run called "${given}" already. Choose another ${settingWord(NAME_SETTING, wording)}, or remove that run first.`);
  }
  const name = given || uniqueRunName(store, s.id, `k${settings.themes}-seed${settings.seed}`);
  try {
    return createRun(store, { studyId: s.id, name, settings });
  } catch (error) {
    // Another process took the name between the check and the insert.
    if (error instanceof Error && /UNIQUE/.test(error.message)) throw new InputError(`Study "${s.name}" has a run called "${name}" already. Choose another ${settingWord(NAME_SETTING, wording)}.`);
    throw error;
  }
}
