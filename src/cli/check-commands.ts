// checks and compare-k (issue 6 item 6).
import type { Command } from 'commander';
import { buildKComparison, type KRunSummary } from '../eval/index.js';
import { loadRunModel, numberSetting, requireStudy, runChecks, type RunChecks } from '../services/index.js';
import { getRunByName } from '../store/index.js';
import { InputError } from '../text/index.js';
import type { CliContext } from './context.js';
import { fitInProcess, fitOptions, requireRunModel, type FitFlags } from './run-commands.js';

const f = (x: number, digits = 3) => (Number.isFinite(x) ? x.toFixed(digits) : '-');

export function describeChecks(c: RunChecks): string[] {
  const lines = [`Run ${c.run}: ${c.K} themes.`];
  lines.push(`Log-likelihood per token: ${f(c.logLikelihoodPerToken.first, 4)} after sweep 1, ${f(c.logLikelihoodPerToken.last, 4)} after sweep ${c.logLikelihoodPerToken.sweeps}.`);
  if (c.perplexity) lines.push(`Held-out perplexity (document completion): ${f(c.perplexity.perplexity, 1)} over ${c.perplexity.evaluatedTokens} words of ${c.perplexity.groups} held-out answer groups.`);
  lines.push(`Coherence (top 10 words): mean NPMI ${f(c.coherence.meanNpmi)}, mean log-conditional ${f(c.coherence.meanLogConditional, 1)}.`);
  for (const t of c.coherence.themes) lines.push(`  ${t.label} [${t.languageName}]: NPMI ${f(t.npmi)}, log-conditional ${f(t.logConditional, 1)}`);
  if (c.alignment) {
    const o = c.alignment.overall;
    lines.push(`Cross-language alignment: partner found first ${f(o.precisionAt1 * 100, 1)}% (chance ${f(o.chancePrecisionAt1 * 100, 1)}%), mean reciprocal rank ${f(o.meanReciprocalRank)} (chance ${f(o.chanceMeanReciprocalRank)}), over ${o.queries} queries.`);
  }
  if (c.stability) lines.push(`Stability against ${c.stability.runs.join(', ')}: ${f(c.stability.overall)} mean matched cosine.`);
  lines.push(`β: ${Object.entries(c.hyperparameters.beta).map(([l, b]) => `${l} ${b.toPrecision(3)}`).join(', ')}; Σα from ${f(c.hyperparameters.alphaSum.min)} to ${f(c.hyperparameters.alphaSum.max)}; features: ${c.hyperparameters.features.join(', ')}.`);
  for (const n of c.notes) lines.push(`Note: ${n}`);
  return lines;
}

export function registerCheckCommands(program: Command, ctx: CliContext): void {
  program
    .command('checks')
    .description('held-out perplexity, coherence, cross-language alignment, stability and hyperparameters of a run')
    .requiredOption('--study <name>', 'study name')
    .requiredOption('--run <name>', 'run name')
    .option('--json', 'print one JSON line')
    .action((flags: { study: string; run: string; json?: boolean }) => {
      const store = ctx.openStore();
      const checks = runChecks(store, requireRunModel(store, flags.study, flags.run));
      if (flags.json) ctx.out(JSON.stringify(checks));
      else for (const line of describeChecks(checks)) ctx.out(line);
    });

  fitOptions(program.command('compare-k').description('fit several numbers of themes (and seeds) and compare perplexity, coherence and stability'))
    .requiredOption('--themes <list>', `numbers of themes, comma-separated (e.g. 10,20,30; each ${numberSetting('themes').min}–${numberSetting('themes').max})`)
    .option('--seeds <n>', 'seeds per number of themes (default 3)', '3')
    .option('--json', 'print the table as one JSON line')
    .action(async (flags: Omit<FitFlags, 'themes' | 'seed' | 'name'> & { themes: string; seeds: string; json?: boolean }) => {
      const ks = flags.themes.split(',').map((s) => Number(s.trim()));
      const themes = numberSetting('themes');
      if (ks.some((k) => !Number.isInteger(k) || k < themes.min || k > themes.max)) {
        throw new InputError(`${themes.flag} needs whole numbers from ${themes.min} to ${themes.max}, comma-separated (got "${flags.themes}").`);
      }
      const seeds = Number(flags.seeds);
      if (!Number.isInteger(seeds) || seeds < 1) throw new InputError(`--seeds needs a whole number of at least 1 (got "${flags.seeds}").`);
      const store = ctx.openStore();
      const summaries: KRunSummary[] = [];
      for (const K of ks) {
        for (let seed = 1; seed <= seeds; seed++) {
          const d = await fitInProcess(ctx, { ...flags, themes: String(K), seed: String(seed), holdout: flags.holdout ?? String(numberSetting('holdout').suggested) }, `K=${K} seed ${seed}: `);
          const model = loadRunModel(store, getRunByName(store, requireStudy(store, flags.study).id, d.run)!.id)!;
          const c = runChecks(store, model);
          summaries.push({ K, seed, perplexity: c.perplexity?.perplexity ?? NaN, npmi: c.coherence.meanNpmi, logConditional: c.coherence.meanLogConditional, themes: model.phi });
          ctx.err(`K=${K} seed ${seed}: run ${d.run}, perplexity ${f(c.perplexity?.perplexity ?? NaN, 1)}, NPMI ${f(c.coherence.meanNpmi)}.`);
        }
      }
      const rows = buildKComparison(summaries);
      if (flags.json) ctx.out(JSON.stringify(rows));
      else {
        ctx.out(['themes', 'runs', 'perplexity', 'perplexity range', 'NPMI', 'log-conditional', 'stability'].join('\t'));
        for (const r of rows) ctx.out([r.K, r.runs, f(r.perplexity, 1), `${f(r.perplexityMin, 1)}–${f(r.perplexityMax, 1)}`, f(r.npmi), f(r.logConditional, 1), f(r.stability)].join('\t'));
      }
    });
}
