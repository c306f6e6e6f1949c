// One description of every setting of a fit (issue 13): its stored name, the label of its field
// on the Runs page, its command-line flag, its bounds, its default and how a wrong value is
// explained. The Runs form (src/server/routes/runs.tsx, views/pages/runs.tsx), the command line
// (src/cli/run-commands.ts) and the fit service (fit-run.ts) all read this module, so a bound or
// default is written once, and a message names the setting in the words of the place the user is:
// the flag on the command line, the field's label on the page.
//
// The settings as stored with a run use the researcher's words (themes, sweeps); the one place
// they become the model's names (K, keepThetaSamples) is `modelSettingsOf` below.
import type { RunSettings } from '../store/index.js';
import { InputError } from '../text/index.js';

/** Where the person is: the command line (messages name flags) or the workbench (field labels). */
export type Wording = 'flag' | 'label';

export type NumberSettingName = 'themes' | 'sweeps' | 'burnIn' | 'seed' | 'threads' | 'holdout' | 'checkpointEvery';
export type SettingName = NumberSettingName | 'covariates' | 'name';

export interface NumberSettingSpec {
  readonly name: NumberSettingName;
  readonly kind: 'whole' | 'share';
  readonly label: string;
  readonly flag: string;
  /** What the setting does, in a researcher's words (the field's hint, the flag's help). */
  readonly hint: string;
  readonly min: number;
  readonly max: number;
  /** Step of the form's field. */
  readonly step?: number;
  /** The value when none is given: a number, one that follows from other settings, or none (required). */
  readonly fallback: number | ((given: FitRequest) => number) | null;
  /** What the defaults say in words (help text). */
  readonly fallbackText: string;
  /** Shown pre-filled on the Runs form when it differs from the default. */
  readonly suggested?: number;
  /** Offered on the Runs form (the rest only on the command line). */
  readonly onForm: boolean;
}

export interface FitRequest {
  themes: number;
  sweeps?: number;
  burnIn?: number;
  seed?: number;
  threads?: number;
  covariates?: string[];
  holdout?: number;
  name?: string;
  checkpointEvery?: number;
  /** 'fast' (default) or 'reference' (the plain O(K) sampler) on one thread; not offered to users. */
  sampler?: 'fast' | 'reference';
}

const SWEEPS_DEFAULT = 500;
/** Burn-in when none is given: a fifth of the sweeps, at most 200 (common practice). */
export function defaultBurnIn(sweeps: number): number {
  return Math.min(Math.floor(sweeps / 5), 200);
}

/**
 * The numeric settings, in the order the form and the help show them. Bounds (ours): 2–200 themes
 * covers surveys from a few hundred to millions of answers (issue 13 reconciled 2–200 on the form,
 * 2–1000 in the service and 65,535 in the model to this); 1–100,000 sweeps; a held-out share of at
 * most a half, so that most answers still shape the themes; threads up to 64 (the page offers at
 * most the server's cores); seeds are unsigned 32-bit numbers (the generator's seed, rng.ts).
 */
export const NUMBER_SETTINGS: readonly NumberSettingSpec[] = [
  {
    name: 'themes', kind: 'whole', label: 'Number of themes', flag: '--themes', min: 2, max: 200, fallback: null, fallbackText: 'required', suggested: 10, onForm: true,
    hint: 'How many themes to look for. 10–30 suits most surveys of a few thousand answers; try two or three values and compare.',
  },
  {
    name: 'sweeps', kind: 'whole', label: 'Sweeps', flag: '--sweeps', min: 1, max: 100_000, fallback: SWEEPS_DEFAULT, fallbackText: `default ${SWEEPS_DEFAULT}`, onForm: true,
    hint: 'Passes over all words. More is slower and more settled.',
  },
  {
    name: 'burnIn', kind: 'whole', label: 'Burn-in sweeps', flag: '--burn-in', min: 0, max: 99_999, onForm: true,
    fallback: (given) => defaultBurnIn(given.sweeps ?? SWEEPS_DEFAULT), fallbackText: 'default a fifth of the sweeps, at most 200',
    hint: 'Early sweeps not used for the results; fewer than the sweeps.',
  },
  {
    name: 'seed', kind: 'whole', label: 'Seed', flag: '--seed', min: 0, max: 4_294_967_295, fallback: 1, fallbackText: 'default 1', onForm: true,
    hint: 'Same seed and settings give the same result. Change it to check stability.',
  },
  {
    name: 'threads', kind: 'whole', label: 'Threads', flag: '--threads', min: 1, max: 64, fallback: 1, fallbackText: 'default 1', onForm: true,
    hint: 'Processor cores used by this run.',
  },
  {
    name: 'holdout', kind: 'share', label: 'Held-out share', flag: '--holdout', min: 0, max: 0.5, step: 0.05, fallback: 0, fallbackText: 'default 0; 0.1 gives the checks held-out answers', suggested: 0.1, onForm: true,
    hint: 'Answers kept aside to check the model on text it has not seen.',
  },
  {
    name: 'checkpointEvery', kind: 'whole', label: 'Checkpoint every', flag: '--checkpoint-every', min: 0, max: 100_000, fallback: 50, fallbackText: 'default 50; 0 = only when stopped', onForm: false,
    hint: 'Save a checkpoint every this many sweeps, to resume from after a crash.',
  },
];

export const COVARIATES_SETTING = { name: 'covariates', label: 'Compare groups by', flag: '--covariate' } as const;
export const NAME_SETTING = { name: 'name', label: 'Name', flag: '--name', maxLength: 100 } as const;

export function numberSetting(name: NumberSettingName): NumberSettingSpec {
  return NUMBER_SETTINGS.find((s) => s.name === name)!;
}

/** The setting's name where the person is. */
export function settingWord(setting: { label: string; flag: string }, wording: Wording): string {
  return wording === 'flag' ? setting.flag : setting.label;
}

/** Upper bounds that depend on the place (the workbench offers no more threads than its cores). */
export type SettingLimits = Partial<Record<NumberSettingName, number>>;

function boundsOf(spec: NumberSettingSpec, limits: SettingLimits): { min: number; max: number } {
  return { min: spec.min, max: Math.min(spec.max, limits[spec.name] ?? spec.max) };
}

function rangeMessage(spec: NumberSettingSpec, wording: Wording, limits: SettingLimits, got: string): string {
  const { min, max } = boundsOf(spec, limits);
  const what = spec.kind === 'whole' ? 'a whole number' : 'a number';
  return `${settingWord(spec, wording)} must be ${what} from ${min.toLocaleString('en')} to ${max.toLocaleString('en')} (got ${got}).`;
}

/**
 * A fit request from text fields (a form's or a command line's), every problem named at once.
 * Empty or missing fields take their default later (`runSettingsOf`).
 */
export function readFitRequest(
  raw: Partial<Record<NumberSettingName, string | undefined>> & { covariates?: readonly string[]; name?: string },
  wording: Wording,
  limits: SettingLimits = {},
): FitRequest {
  const problems: string[] = [];
  const request: Partial<FitRequest> = {};
  for (const spec of NUMBER_SETTINGS) {
    const text = raw[spec.name]?.trim();
    if (text === undefined || text === '') {
      if (spec.fallback === null && spec.name in raw) problems.push(`${settingWord(spec, wording)} is needed: ${spec.hint}`);
      continue;
    }
    const n = Number(text);
    const { min, max } = boundsOf(spec, limits);
    if (!Number.isFinite(n) || (spec.kind === 'whole' && !Number.isInteger(n)) || n < min || n > max) problems.push(rangeMessage(spec, wording, limits, `"${text}"`));
    else (request as Record<string, number>)[spec.name] = n;
  }
  if (raw.covariates?.length) request.covariates = [...raw.covariates];
  const name = raw.name?.trim();
  if (name) request.name = name;
  if (problems.length) throw new InputError(problems.join(' '));
  return request as FitRequest;
}

/** Every setting with its default filled in, as stored with the run. */
export function runSettingsOf(request: FitRequest): RunSettings {
  const value = (name: NumberSettingName): number => {
    const given = request[name];
    if (given !== undefined) return given;
    const fb = numberSetting(name).fallback;
    return typeof fb === 'function' ? fb(request) : (fb ?? NaN);
  };
  const sweeps = value('sweeps');
  const burnIn = value('burnIn');
  return {
    themes: value('themes'),
    sweeps,
    burnIn,
    seed: value('seed'),
    threads: value('threads'),
    covariates: request.covariates ?? [],
    holdout: value('holdout'),
    // Derived, not offered: about 50 saved samples over the run, at least every 10th sweep, and
    // the latest 20 group-mixture samples kept for the intervals (common practice).
    sampleEvery: Math.max(1, Math.min(10, Math.floor((sweeps - burnIn) / 50))),
    keepThetaSamples: 20,
    checkpointEvery: value('checkpointEvery'),
    sampler: request.sampler ?? 'fast',
  };
}

/** Checks every setting's bounds (and burn-in below sweeps); InputError in the place's words. */
export function checkRunSettings(settings: RunSettings, wording: Wording, limits: SettingLimits = {}): void {
  const problems: string[] = [];
  for (const spec of NUMBER_SETTINGS) {
    const v = Number(settings[spec.name]);
    const { min, max } = boundsOf(spec, limits);
    if (!Number.isFinite(v) || (spec.kind === 'whole' && !Number.isInteger(v)) || v < min || v > max) problems.push(rangeMessage(spec, wording, limits, String(settings[spec.name])));
  }
  if (problems.length === 0 && !(settings.burnIn < settings.sweeps)) {
    problems.push(`${settingWord(numberSetting('burnIn'), wording)} must be below ${settingWord(numberSetting('sweeps'), wording)} (${settings.sweeps}); got ${settings.burnIn}.`);
  }
  if (settings.sampler !== 'fast' && settings.sampler !== 'reference') problems.push(`The sampler must be "fast" or "reference" (got ${String(settings.sampler)}).`);
  if (problems.length) throw new InputError(problems.join(' '));
}

/** The model's settings for a stored run (src/model/fit-settings.ts names), older runs included. */
export interface ModelRunSettings {
  K: number;
  sweeps: number;
  burnIn: number;
  seed: number;
  threads: number;
  sampleEvery: number;
  keepThetaSamples: number;
  checkpointEvery: number;
  sampler: 'fast' | 'reference';
}

export function modelSettingsOf(s: RunSettings): ModelRunSettings {
  return {
    K: s.themes,
    sweeps: s.sweeps,
    burnIn: s.burnIn,
    seed: s.seed,
    threads: s.threads,
    sampleEvery: Math.max(1, Number(s.sampleEvery ?? 5)),
    // Runs stored before issue 13 call it maxSamples.
    keepThetaSamples: Number(s.keepThetaSamples ?? s.maxSamples ?? 20),
    checkpointEvery: Number(s.checkpointEvery ?? 50),
    sampler: s.sampler === 'reference' ? 'reference' : 'fast',
  };
}

/** One line of command-line help for a setting: its hint and default. */
export function flagHelp(spec: NumberSettingSpec): string {
  return `${spec.hint} (${spec.fallbackText}; ${spec.min.toLocaleString('en')}–${spec.max.toLocaleString('en')})`;
}
