// fit, export, apply, contrasts (issues 4 and 6); remove-run (OWASP ASVS 4.0.3 V8.3.2).
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Command } from 'commander';
import {
  applyRun,
  buildBundle,
  createFitRun,
  installationKey,
  openBundle,
  describeRunContents,
  exportRun,
  loadRunModel,
  planRunRemoval,
  removeRun,
  requireStudy,
  runContrasts,
  runFitJob,
  SHARES_HEADER,
  type FitDiagnostics,
  type RunModel,
} from '../services/index.js';
import { csvBytes, round6, toCsv } from '../services/csv.js';
import { getRun, getRunByName, getStudy, interruptIfAbandoned, setRunProgress, setRunStatus, touchRunHeartbeat, type Run, type Store } from '../store/index.js';
import { InputError } from '../text/types.js';
import { scannerFromSetting, scanUpload } from '../services/scan-upload.js';
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
  const run = createFitRun(ctx.openStore(), flags.study, {
    themes: parseNumber('--themes', flags.themes)!,
    sweeps: parseNumber('--sweeps', flags.sweeps),
    burnIn: parseNumber('--burn-in', flags.burnIn),
    seed: parseNumber('--seed', flags.seed),
    threads: parseNumber('--threads', flags.threads),
    covariates: flags.covariate,
    holdout: parseNumber('--holdout', flags.holdout, 'float'),
    ...(flags.name ? { name: flags.name } : {}),
    ...(flags.checkpointEvery !== undefined ? { checkpointEvery: parseNumber('--checkpoint-every', flags.checkpointEvery) } : {}),
  });
  return executeRun(ctx, run, label);
}

/** Run (or continue from its last checkpoint) a stored run in this process. */
export async function executeRun(ctx: CliContext, run: Run, label = ''): Promise<FitDiagnostics> {
  const store = ctx.openStore();
  const bar = ctx.progressBar(`${label}sweep {value}/{total} |{bar}| {speed} tokens/s | log-lik/token {ll} | {left} left`);
  let stop = false;
  const onSignal = () => {
    stop = true;
  };
  process.once('SIGINT', onSignal);
  setRunStatus(store, run.id, 'running');
  try {
    let lastWrite = 0;
    let trace: number[] = [];
    const outcome = await runFitJob({
      store,
      runId: run.id,
      shouldStop: () => stop,
      onStart: (from) => {
        if (from !== null) trace = (run.progress.trace ?? []).slice(0, from);
        bar.start(run.settings.sweeps, from ?? 0, { speed: '-', ll: '-', left: '-' });
      },
      onProgress: (p) => {
        if (p.phase !== 'sampling') {
          // A sign of life while the corpus is read, so `resume` elsewhere knows the run is alive.
          touchRunHeartbeat(store, run.id);
          return;
        }
        if (typeof p.logLikelihoodPerToken === 'number') trace.push(p.logLikelihoodPerToken);
        bar.update(p.sweep ?? 0, {
          speed: Math.round(Number(p.tokensPerSecond ?? 0)).toLocaleString('en'),
          ll: Number(p.logLikelihoodPerToken ?? NaN).toFixed(4),
          left: formatSeconds(Number(p.secondsLeft ?? 0)),
        });
        if (Date.now() - lastWrite > 1000) {
          lastWrite = Date.now();
          setRunProgress(store, run.id, { ...p, trace });
        }
      },
    });
    bar.stop();
    if (outcome.stopped) {
      setRunStatus(store, run.id, 'interrupted', null, { from: ['running'] });
      throw new InputError(`Fit "${run.name}" stopped at your request; continue it with: themata resume --study "${getStudy(store, run.studyId)?.name}" --run "${run.name}".`);
    }
    // runFitJob stored the results, the final progress and status 'finished' in one transaction.
    return outcome.diagnostics!;
  } catch (error) {
    bar.stop();
    // Guarded: a run that finished (or was deleted) meanwhile keeps what it is.
    setRunStatus(store, run.id, 'failed', error instanceof Error ? error.message : String(error), { from: ['running'] });
    throw error;
  } finally {
    process.removeListener('SIGINT', onSignal);
  }
}

function formatSeconds(s: number): string {
  if (!Number.isFinite(s)) return '-';
  const m = Math.floor(s / 60);
  return m > 0 ? `${m}m${String(Math.round(s % 60)).padStart(2, '0')}s` : `${Math.round(s)}s`;
}

export function fitOptions(cmd: Command): Command {
  return cmd
    .requiredOption('--study <name>', 'study name')
    .option('--sweeps <n>', 'Gibbs sweeps (default 500)')
    .option('--burn-in <n>', 'sweeps before samples are kept (default a fifth, at most 200)')
    .option('--threads <t>', 'threads for parallel sweeps (default 1)')
    .option('--covariate <col>', 'metadata column the theme prior depends on (repeat)', collect, [])
    .option('--holdout <share>', 'share of answers held out for the checks (e.g. 0.1)')
    .option('--checkpoint-every <n>', 'save a checkpoint every n sweeps, to resume from after a crash (default 50; 0 = never)');
}

export function registerRunCommands(program: Command, ctx: CliContext): void {
  fitOptions(program.command('fit').description('fit a theme model to a study; prints one JSON line with the diagnostics'))
    .requiredOption('--themes <k>', 'number of themes')
    .option('--seed <s>', 'random seed (default 1)')
    .option('--name <run>', 'run name (default k<K>-seed<S>)')
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
    .description('write answers-by-theme.csv, theme-words.csv, theme-shares-by-group.csv, codebook.json and the saved-run bundle')
    .requiredOption('--study <name>', 'study name')
    .requiredOption('--run <name>', 'run name')
    .requiredOption('--out <dir>', 'folder to write into (created if missing)')
    .option('--draws <n>', 'bootstrap draws for the group intervals (default 1000)')
    .action(async (flags: { study: string; run: string; out: string; draws?: string }) => {
      const model = requireRunModel(ctx.openStore(), flags.study, flags.run);
      const files = exportRun(ctx.openStore(), model, { draws: parseNumber('--draws', flags.draws) });
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
    .option('--scan-command <command>', 'virus scanner the file of new answers is piped to before it is read (as for import; overrides THEMATA_SCAN_COMMAND)')
    .action(async (file: string, flags: MappingFlags & { out: string; study?: string; run?: string; bundle?: string; trustBundle?: boolean; sheet?: string; seed?: string; scanCommand?: string }) => {
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
      });
      await writeFile(flags.out, out.bytes);
      const left = Object.entries(summary.excluded).map(([reason, n]) => `${n} ${reason}`);
      ctx.err(
        `Coded ${summary.coded} of ${summary.answers} answers (${[`${summary.otherLanguage} in another or no language`, ...left, `${summary.noKnownWords} with no known word`].join(', ')}; ${Math.round(summary.unknownWordShare * 100)}% of words unknown to the run).`,
      );
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
