// Runs: the list and new-run form, a run's live page (server-sent events), cancel and resume.
import { availableParallelism } from 'node:os';
import { Hono, type Context } from 'hono';
import { streamSSE } from 'hono/streaming';
import { RunPage, RunProgressPanel, RunsPage, type ProgressView } from '../../../views/pages/runs.js';
import { createFitRun } from '../../services/fit-run.js';
import { covariateLevels, getRun, languageSummary, listRuns, studyRole, type Run, type Study } from '../../store/index.js';
import { InputError } from '../../text/types.js';
import type { JobEvent } from '../../jobs/index.js';
import { frame, runFor, studyFor } from '../access.js';
import { renderPage } from '../render.js';
import { runSummaries } from '../results/summaries.js';
import type { AppEnv } from '../types.js';
import { intField, numberField, text, texts } from './forms.js';

function canEdit(c: Context<AppEnv>, study: Study): boolean {
  const user = c.get('user');
  if (user.id === null) return true;
  const role = studyRole(c.get('deps').store, study.id, user.id);
  return role === 'owner' || role === 'editor';
}

function isOwner(c: Context<AppEnv>, study: Study): boolean {
  const user = c.get('user');
  return user.id === null || studyRole(c.get('deps').store, study.id, user.id) === 'owner';
}

function progressView(c: Context<AppEnv>, run: Run): ProgressView {
  const live = c.get('deps').queue.progress(run.id);
  const p = live ?? run.progress;
  return {
    studyId: run.studyId,
    runId: run.id,
    status: run.status,
    error: run.error,
    phase: typeof p.phase === 'string' ? p.phase : undefined,
    sweep: typeof p.sweep === 'number' ? p.sweep : undefined,
    sweeps: typeof p.sweeps === 'number' ? p.sweeps : run.settings.sweeps,
    tokensPerSecond: typeof p.tokensPerSecond === 'number' ? p.tokensPerSecond : undefined,
    logLikelihoodPerToken: typeof p.logLikelihoodPerToken === 'number' ? p.logLikelihoodPerToken : undefined,
    secondsLeft: typeof p.secondsLeft === 'number' ? p.secondsLeft : undefined,
    trace: Array.isArray(p.trace) ? (p.trace as number[]) : [],
  };
}

function describeSettings(run: Run): string {
  const s = run.settings;
  return `${s.themes} themes · ${s.sweeps} sweeps (${s.burnIn} burn-in) · seed ${s.seed} · ${s.threads} thread${s.threads === 1 ? '' : 's'}` +
    `${s.covariates.length ? ` · groups: ${s.covariates.join(', ')}` : ''}${s.holdout ? ` · ${Math.round(100 * s.holdout)}% held out` : ''}`;
}

export function runRoutes(): Hono<AppEnv> {
  const app = new Hono<AppEnv>();

  async function runsPage(c: Context<AppEnv>, study: Study, error?: string) {
    const { store } = c.get('deps');
    const runs = listRuns(store, study.id);
    const summaries = runSummaries(store, runs);
    const levels = covariateLevels(store, study.id, 1);
    const included = languageSummary(store, study.id).reduce((s, r) => s + r.included, 0);
    const maxThreads = Math.max(1, availableParallelism());
    return renderPage(
      c,
      <RunsPage
        frame={frame(c, `Runs · ${study.name}`, { study, active: 'runs' })}
        studyId={study.id}
        runs={runs.map((r) => ({
          id: r.id,
          name: r.name,
          themes: r.settings.themes,
          sweeps: r.settings.sweeps,
          seed: r.settings.seed,
          covariates: r.settings.covariates,
          status: r.status,
          sweep: typeof r.progress.sweep === 'number' ? r.progress.sweep : undefined,
          createdAt: r.createdAt,
          finishedAt: r.finishedAt,
          error: r.error,
          ...summaries.get(r.id),
        }))}
        defaults={{ themes: 10, sweeps: 500, burnIn: 100, seed: 1, threads: 1, maxThreads, holdout: 0.1 }}
        covariates={Object.entries(levels).map(([name, v]) => ({ name, levels: v.distinct, numeric: v.numeric }))}
        answers={included}
        canEdit={canEdit(c, study)}
        canDelete={isOwner(c, study)}
        error={error}
      />,
      error ? 400 : 200,
    );
  }

  app.get('/studies/:sid/runs', (c) => runsPage(c, studyFor(c)));

  app.post('/studies/:sid/runs', async (c) => {
    const study = studyFor(c, 'write');
    const { store, queue } = c.get('deps');
    const body = await c.req.parseBody({ all: true });
    const themes = intField(body.themes, 'Number of themes', 2, 200);
    const sweeps = intField(body.sweeps, 'Sweeps', 1, 100000, 500);
    const burnIn = intField(body.burnIn, 'Burn-in sweeps', 0, 100000, typeof sweeps === 'number' ? Math.min(200, Math.floor(sweeps / 5)) : 0);
    const seed = intField(body.seed, 'Seed', 0, 4294967295, 1);
    const threads = intField(body.threads, 'Threads', 1, Math.max(1, availableParallelism()), 1);
    const holdout = numberField(body.holdout, 'Held-out share', 0, 0.5, 0);
    const problems = [themes, sweeps, burnIn, seed, threads, holdout].filter((v): v is string => typeof v === 'string');
    if (problems.length) return runsPage(c, study, problems.join(' '));
    if ((burnIn as number) >= (sweeps as number)) return runsPage(c, study, 'Burn-in sweeps must be fewer than sweeps.');
    try {
      // At most a few fits queued or running per account (src/jobs/queue.ts; ASVS 4.0.3 V11.1.3).
      queue.checkFitLimit(c.get('user').id);
      const run = createFitRun(store, study.id, {
        themes: themes as number,
        sweeps: sweeps as number,
        burnIn: burnIn as number,
        seed: seed as number,
        threads: threads as number,
        holdout: holdout as number,
        covariates: texts(body.covariates),
        name: text(body.name).trim().slice(0, 100) || undefined,
      });
      queue.enqueue(run.id, c.get('user').id);
      return c.redirect(`/studies/${study.id}/runs/${run.id}`, 303);
    } catch (error) {
      if (error instanceof InputError) return runsPage(c, study, error.message);
      if (error instanceof Error && /UNIQUE/.test(error.message)) return runsPage(c, study, 'A run with that name exists already. Choose another name.');
      throw error;
    }
  });

  app.get('/studies/:sid/runs/:rid', async (c) => {
    const study = studyFor(c);
    const run = runFor(c, study);
    if (run.status === 'finished' && c.req.query('progress') === undefined) return c.redirect(`/studies/${study.id}/runs/${run.id}/themes`, 303);
    return renderPage(c, <RunPage frame={frame(c, `Run ${run.name}`, { study, run, active: 'runs' })} p={progressView(c, run)} settings={describeSettings(run)} />);
  });

  app.get('/studies/:sid/runs/:rid/events', (c) => {
    const study = studyFor(c);
    const run = runFor(c, study);
    const { queue, store } = c.get('deps');
    const csrf = c.get('csrf');
    return streamSSE(c, async (stream) => {
      const pending: JobEvent[] = [];
      let wake: (() => void) | undefined;
      const unsubscribe = queue.subscribe(run.id, (e) => {
        pending.push(e);
        wake?.();
      });
      stream.onAbort(() => {
        unsubscribe();
        wake?.();
      });
      const send = async (r: Run) => {
        const html = await (<RunProgressPanel p={progressView(c, r)} csrf={csrf} />).toString();
        await stream.writeSSE({ event: 'progress', data: html });
      };
      let current = getRun(store, run.id) ?? run;
      await send(current);
      let lastSent = Date.now();
      try {
        while (!stream.aborted && (current.status === 'queued' || current.status === 'running')) {
          if (pending.length === 0) {
            await new Promise<void>((resolve) => {
              wake = resolve;
              setTimeout(resolve, 15_000).unref();
            });
            wake = undefined;
          }
          const batch = pending.splice(0);
          const statusChanged = batch.some((e) => e.kind === 'status');
          // Coalesce progress: at most a few updates per second per page (common practice).
          if (!statusChanged && Date.now() - lastSent < 250 && batch.length > 0) {
            await stream.sleep(250 - (Date.now() - lastSent));
            pending.splice(0);
          }
          const fresh = getRun(store, run.id);
          if (!fresh) break; // deleted meanwhile
          current = fresh;
          await send(current);
          lastSent = Date.now();
        }
        if (!stream.aborted) await stream.writeSSE({ event: 'done', data: current.status });
      } finally {
        unsubscribe();
      }
    });
  });

  app.post('/studies/:sid/runs/:rid/cancel', (c) => {
    const study = studyFor(c, 'write');
    const run = runFor(c, study);
    c.get('deps').queue.cancel(run.id);
    return c.redirect(`/studies/${study.id}/runs/${run.id}?progress`, 303);
  });

  app.post('/studies/:sid/runs/:rid/resume', async (c) => {
    const study = studyFor(c, 'write');
    const run = runFor(c, study);
    try {
      c.get('deps').queue.resume(run.id, c.get('user').id);
    } catch (error) {
      if (error instanceof InputError) return runsPage(c, study, error.message);
      throw error;
    }
    return c.redirect(`/studies/${study.id}/runs/${run.id}`, 303);
  });
  return app;
}
