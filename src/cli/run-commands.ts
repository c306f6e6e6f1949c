// fit, export, apply, contrasts (issues 4 and 6); remove-run (OWASP ASVS 4.0.3 V8.3.2).
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Command } from 'commander';
import {
  applyRun,
  buildBundle,
  COVARIATES_SETTING,
  createFitRun,
  describeEstimate,
  estimateFit,
  flagHelp,
  installationKey,
  NAME_SETTING,
  numberSetting,
  readFitRequest,
  type NumberSettingName,
  openBundle,
  describeRunContents,
  exportRun,
  loadRunModel,
  planRunRemoval,
  removeRun,
  requireStudy,
  runContrasts,
  SHARES_HEADER,
  csvBytes,
  round6,
  toCsv,
  exportFiles,
  exportTables,
  exportWorkbook,
  describeCovariateNote,
  type FitDiagnostics,
  type RunModel,
} from '../services/index.js';
import { runFitInProcess } from '../jobs/index.js';
import { getRun, getRunByName, getStudy, interruptIfAbandoned, type Run, type RunProgress, type Store } from '../store/index.js';
import { InputError } from '../text/index.js';
import { machineSize, scannerFromSetting, scanUpload } from '../platform/index.js';
import { removalOptions, reportRemoval } from './study-commands.js';
import { collect, mappingFromFlags, mappingOptions, parseNumber, readInputFile, type CliContext, type MappingFlags } from './context.js';

/** The finished run `name` of `study`, loaded; InputError when missing or unfinished. */
export function requireRunModel(store: Store, study: string, name: string): RunModel {
  const s = requireStudy(store, study);
  const run = getRunByName(store, s.id, name);
  if (!run) throw new InputError(`Study "${s.name}" has no run called "${name}". Fit one with: themata fit --study "${s.name}" --themes K --name "${name}".`);
  if (run.status !== 'finished') throw new InputError(`Run "${name}" is ${run.status}, not finished; resume or refit it first.`);
  const model = loadRunModel(store, run.id);
  if (!model) throw new InputError(`Run "${name}" has no stored results; fit it again.`);
  return model;
}

export interface FitFlags {
  study: string;
  themes: string;
  sweeps?: string;
  burnIn?: string;
  seed?: string;
  threads?: string;
  covariate: string[];
  holdout?: string;
  name?: string;
  checkpointEvery?: string;
}

/** Create and run one fit in this process, with a progress bar; returns its diagnostics. */
export async function fitInProcess(ctx: CliContext, flags: FitFlags, label = ''): Promise<FitDiagnostics> {
  // Every setting is read, bounded and defaulted by the one settings schema (services), in flags' words.
  const request = readFitRequest(
    { themes: flags.themes, sweeps: flags.sweeps, burnIn: flags.burnIn, seed: flags.seed, threads: flags.threads, holdout: flags.holdout, checkpointEvery: flags.checkpointEvery, covariates: flags.covariate, name: flags.name },
    'flag',
  );
  const run = createFitRun(ctx.openStore(), flags.study, request, { wording: 'flag' });
  // Said before the sweeps start, so a study too large for this machine is known at once (issue 15).
  const estimate = estimateFit(ctx.openStore(), run.studyId, request, machineSize());
  ctx.err(`${label}Estimate: ${describeEstimate(estimate)}`);
  for (const note of estimate.notes) ctx.err(`${label}${estimate.fits ? 'Note' : 'Warning'}: ${note}`);
  return executeRun(ctx, run, label);
}

/** What the progress bar says about the phase a fit is in (src/services fit-job.ts phases). */
function phaseText(p: RunProgress): string {
  const phase = typeof p.phase === 'string' ? p.phase : 'starting';
  return typeof p.step === 'string' ? `${phase}: ${p.step}` : phase;
}

/** Run (or continue from its last checkpoint) a stored run in this process. */
export async function executeRun(ctx: CliContext, run: Run, label = ''): Promise<FitDiagnostics> {
  const store = ctx.openStore();
  const bar = ctx.progressBar(`${label}{phase} | sweep {value}/{total} |{bar}| {speed} tokens/s | log-lik/token {ll} | {left} left`);
  let stop = false;
  const onSignal = () => {
    stop = true;
  };
  process.once('SIGINT', onSignal);
  try {
    const outcome = await runFitInProcess({
      store,
      runId: run.id,
      shouldStop: () => stop,
      onStart: (from) => bar.start(run.settings.sweeps, from ?? 0, { phase: 'preparing corpus', speed: '-', ll: '-', left: '-' }),
      onProgress: (p) =>
        bar.update(Number(p.sweep ?? 0), {
          phase: phaseText(p),
          speed: typeof p.tokensPerSecond === 'number' ? Math.round(p.tokensPerSecond).toLocaleString('en') : '-',
          ll: typeof p.logLikelihoodPerToken === 'number' ? p.logLikelihoodPerToken.toFixed(4) : '-',
          left: typeof p.secondsLeft === 'number' ? formatSeconds(p.secondsLeft) : '-',
        }),
    });
    bar.stop();
    if (outcome.status !== 'finished' || !outcome.diagnostics) {
      throw new InputError(`Fit "${run.name}" stopped at your request; continue it with: themata resume --study "${getStudy(store, run.studyId)?.name}" --run "${run.name}".`);
    }
    return outcome.diagnostics;
  } finally {
    bar.stop();
    process.removeListener('SIGINT', onSignal);
  }
}

function formatSeconds(s: number): string {
  if (!Number.isFinite(s)) return '-';
  const m = Math.floor(s / 60);
  return m > 0 ? `${m}m${String(Math.round(s % 60)).padStart(2, '0')}s` : `${Math.round(s)}s`;
}

/** The flag `--name` of a numeric setting with its value placeholder. */
function flagOf(name: NumberSettingName): string {
  const spec = numberSetting(name);
  return `${spec.flag} <${spec.kind === 'share' ? 'share' : 'n'}>`;
}

/** The settings every fitting command shares, their help read from the settings schema. */
export function fitOptions(cmd: Command): Command {
  cmd.requiredOption('--study <name>', 'study name');
  for (const name of ['sweeps', 'burnIn', 'threads', 'holdout', 'checkpointEvery'] as const) cmd.option(flagOf(name), flagHelp(numberSetting(name)));
  return cmd.option(`${COVARIATES_SETTING.flag} <col>`, 'metadata column the theme prior depends on (repeat)', collect, []);
}

export function registerRunCommands(program: Command, ctx: CliContext): void {
  fitOptions(program.command('fit').description('fit a theme model to a study; prints one JSON line with the diagnostics'))
    .requiredOption(flagOf('themes'), flagHelp(numberSetting('themes')))
    .option(flagOf('seed'), flagHelp(numberSetting('seed')))
    .option(`${NAME_SETTING.flag} <run>`, `run name, new in the study (default k<K>-seed<S>; at most ${NAME_SETTING.maxLength} characters)`)
    .action(async (flags: FitFlags) => {
      const d = await fitInProcess(ctx, flags);
      const { trace, ...rest } = d;
      ctx.out(JSON.stringify({ ...rest, logLikelihoodTrace: { first: trace[0], last: trace[trace.length - 1], sweeps: trace.length } }));
    });

  program
    .command('resume')
    .description('continue an interrupted, cancelled or failed fit from its last checkpoint')
    .requiredOption('--study <name>', 'study name')
    .requiredOption('--run <name>', 'run name')
    .action(async (flags: { study: string; run: string }) => {
      const store = ctx.openStore();
      const s = requireStudy(store, flags.study);
      const run = getRunByName(store, s.id, flags.run);
      if (!run) throw new InputError(`Study "${s.name}" has no run called "${flags.run}".`);
      let current = run;
      if (run.status === 'running') {
        // A run left 'running' by a killed `themata fit` (or workbench) is interrupted, not busy.
        const reason = interruptIfAbandoned(store, run.id);
        if (!reason) {
          const owner = run.ownerPid !== null ? ` by process ${run.ownerPid} on ${run.ownerHost}` : '';
          throw new InputError(`Run "${run.name}" is still being fitted${owner} (last sign of life ${run.heartbeatAt ?? run.startedAt ?? 'unknown'}). Wait for it, or stop that process first.`);
        }
        ctx.err(`Run "${run.name}" was left running: ${reason}. Continuing it from its last checkpoint.`);
        current = getRun(store, run.id)!;
      }
      if (current.status === 'finished' || current.status === 'running' || current.status === 'queued') throw new InputError(`Run "${current.name}" is ${current.status}; only interrupted, cancelled or failed runs can be resumed.`);
      const d = await executeRun(ctx, current);
      const { trace, ...rest } = d;
      ctx.out(JSON.stringify({ ...rest, logLikelihoodTrace: { first: trace[0], last: trace[trace.length - 1], sweeps: trace.length } }));
    });

  program
    .command('export')
    .description('write answers-by-theme.csv, theme-words.csv, theme-shares-by-group.csv, theme-tables.xlsx, codebook.json and the saved-run bundle')
    .requiredOption('--study <name>', 'study name')
    .requiredOption('--run <name>', 'run name')
    .requiredOption('--out <dir>', 'folder to write into (created if missing)')
    .option('--draws <n>', 'bootstrap draws for the group intervals (default 1000)')
    .option('--no-answer-text', "leave each answer's text out of answers-by-theme.csv and the workbook (ids, groups and shares only)")
    .option('--no-workbook', 'do not write theme-tables.xlsx (the same tables as one spreadsheet workbook, one sheet each)')
    .action(async (flags: { study: string; run: string; out: string; draws?: string; answerText: boolean; workbook: boolean }) => {
      const store = ctx.openStore();
      const model = requireRunModel(store, flags.study, flags.run);
      const tables = exportTables(store, model, { draws: parseNumber('--draws', flags.draws), answerText: flags.answerText });
      const files = exportFiles(store, model, tables);
      if (flags.workbook) files.push(await exportWorkbook(tables));
      await mkdir(flags.out, { recursive: true });
      for (const f of files) {
        await writeFile(join(flags.out, f.name), f.bytes);
        ctx.out(join(flags.out, f.name));
      }
    });

  mappingOptions(
    program
      .command('apply')
      .description('code a new file with a saved run; writes a CSV with the columns of answers-by-theme.csv')
      .argument('<file>', 'file with new answers')
      .requiredOption('--out <file>', 'CSV file to write')
      .option('--study <name>', 'study of the run')
      .option('--run <name>', 'run to apply')
      .option('--bundle <file>', 'a saved-run bundle (.themata-run) instead of --study/--run')
      .option('--trust-bundle', 'use a bundle saved by another Themata installation, or an unsigned one from an older Themata, after you have checked where it came from'),
  )
    .option('--seed <s>', 'random seed of the fold-in (default 1)')
    .option('--no-answer-text', "leave each answer's text out of the coded file")
    .option('--scan-command <command>', 'virus scanner the file of new answers is piped to before it is read (as for import; overrides THEMATA_SCAN_COMMAND)')
    .action(async (file: string, flags: MappingFlags & { out: string; study?: string; run?: string; bundle?: string; trustBundle?: boolean; sheet?: string; seed?: string; scanCommand?: string; answerText: boolean }) => {
      let bundle;
      if (flags.bundle) {
        const b = await readInputFile(flags.bundle);
        // Signed bundles of this data folder are accepted; others only with --trust-bundle (bundle.ts).
        const opened = openBundle(b.bytes, { fileName: b.fileName, key: installationKey(ctx.dataDir), trust: !!flags.trustBundle });
        if (opened.origin !== 'this installation') ctx.err(`Using ${b.fileName}, ${opened.origin === 'unsigned (trusted)' ? 'an unsigned bundle' : 'a bundle of another Themata installation'}, because --trust-bundle was given.`);
        bundle = opened.bundle;
      } else {
        if (!flags.study || !flags.run) throw new InputError('Say which run to apply: --study NAME --run RUN, or --bundle FILE.themata-run.');
        const store = ctx.openStore();
        bundle = buildBundle(store, requireRunModel(store, flags.study, flags.run));
      }
      const input = await readInputFile(file);
      await scanUpload(scannerFromSetting(flags.scanCommand, process.env), input.bytes, input.fileName);
      const { file: out, summary } = await applyRun(bundle, {
        bytes: input.bytes,
        fileName: input.fileName,
        ...(flags.text.length ? { mapping: mappingFromFlags(flags) } : {}),
        ...(flags.sheet ? { sheet: flags.sheet } : {}),
        seed: parseNumber('--seed', flags.seed),
        answerText: flags.answerText,
      });
      await writeFile(flags.out, out.bytes);
      const left = Object.entries(summary.excluded).map(([reason, n]) => `${n} ${reason}`);
      ctx.err(
        `Coded ${summary.coded} of ${summary.answers} answers (${[`${summary.otherLanguage} in another or no language`, ...left, `${summary.noKnownWords} with no known word`].join(', ')}; ${Math.round(summary.unknownWordShare * 100)}% of words unknown to the run).`,
      );
      if (summary.missingColumns.length) ctx.err(`Not in the file, so not used: ${summary.missingColumns.map((m) => `"${m.column}" (${m.role})`).join(', ')}.`);
      for (const note of summary.covariateNotes) ctx.err(describeCovariateNote(note));
      ctx.out(flags.out);
    });

  program
    .command('contrasts')
    .description('theme shares per level of a covariate, with 95% intervals, n and effective n')
    .requiredOption('--study <name>', 'study name')
    .requiredOption('--run <name>', 'run name')
    .requiredOption('--by <col>', 'covariate (or language, question)')
    .option('--out <file>', 'write the shares as CSV (UTF-8 with BOM)')
    .option('--draws <n>', 'bootstrap draws (default 1000)')
    .option('--json', 'print the whole result, differences included, as one JSON line')
    .action(async (flags: { study: string; run: string; by: string; out?: string; draws?: string; json?: boolean }) => {
      const store = ctx.openStore();
      const model = requireRunModel(store, flags.study, flags.run);
      const res = runContrasts(store, model, { by: flags.by, draws: parseNumber('--draws', flags.draws) });
      const rows = res.shares.map((r) => [r.covariate, r.level, r.themeLabel, round6(r.share), round6(r.low), round6(r.high), r.n, Math.round(r.effectiveN * 10) / 10]);
      if (flags.out) {
        await writeFile(flags.out, csvBytes(SHARES_HEADER, rows));
        ctx.err(`Wrote ${rows.length} rows to ${flags.out}.`);
      }
      if (flags.json) ctx.out(JSON.stringify(res));
      else if (!flags.out) ctx.io.stdout.write(toCsv(SHARES_HEADER, rows).replace(/\r\n/g, '\n'));
      for (const note of res.notes) ctx.err(note);
      const found = res.differences.filter((d) => d.discovery);
      ctx.err(`${found.length} of ${res.differences.length} level differences stand out after false-discovery control (Benjamini & Hochberg, 5%). Differences are associations in this sample, not causes.`);
    });

  removalOptions(
    program
      .command('remove-run')
      .description('delete a run with its checkpoints, results, theme labels and exported files (without --yes: only say what would go)')
      .requiredOption('--study <name>', 'study name')
      .requiredOption('--run <name>', 'run name')
  )
    .action(async (flags: { study: string; run: string; yes?: boolean; vacuum?: boolean }) => {
      const store = ctx.openStore();
      const s = requireStudy(store, flags.study);
      const run = getRunByName(store, s.id, flags.run);
      if (!run) throw new InputError(`Study "${s.name}" has no run called "${flags.run}".`);
      const plan = planRunRemoval(store, run.id);
      if (plan.refusal) throw new InputError(plan.refusal);
      if (!flags.yes) {
        ctx.out(`Would delete run "${run.name}" (${run.status}) of study "${s.name}": ${describeRunContents(plan.contents)}.`);
        ctx.out('Nothing was deleted. Add --yes to delete.');
        return;
      }
      reportRemoval(ctx, store, await removeRun(store, run.id), flags.vacuum);
    });
}
