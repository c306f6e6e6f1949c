// Runs: the list and new-run form, a run's live page (server-sent events), cancel and resume.
import { availableParallelism } from 'node:os';
import { Hono, type Context } from 'hono';
import { streamSSE } from 'hono/streaming';
import { RunPage, RunProgressPanel, RunsPage, type ProgressView } from '../../../views/pages/runs.js';
import { createFitRun, describeEstimate, estimateFit, NUMBER_SETTINGS, readFitRequest, type FitRequest, type SettingLimits } from '../../services/index.js';
import { machineSize } from '../../platform/index.js';
import { FitEstimatePanel, type EstimateView } from '../../../views/fit-estimate.js';
import { covariateLevels, getRun, languageSummary, listRuns, studyRole, type Run, type Study } from '../../store/index.js';
import { InputError } from '../../text/index.js';
import type { JobEvent } from '../../jobs/index.js';
import { frame, runFor, studyFor } from '../access.js';
import { renderPage } from '../render.js';
import { runSummaries } from '../results/summaries.js';
import type { AppEnv } from '../types.js';
import { text, texts } from './forms.js';
import type { SettingField } from '../../../views/pages/runs.js';

/** The workbench offers no more threads than this server's cores. */
function placeLimits(): SettingLimits {
  return { threads: Math.max(1, availableParallelism()) };
}

/** The Runs form's fields, from the one settings schema (src/services/run-settings-schema.ts). */
function settingFields(limits: SettingLimits): Record<string, SettingField> {
  const fields: Record<string, SettingField> = {};
  for (const spec of NUMBER_SETTINGS) {
    if (!spec.onForm) continue;
    const fixed = typeof spec.fallback === 'number' ? spec.fallback : undefined;
    const value = spec.suggested ?? fixed;
    fields[spec.name] = {
      name: spec.name,
      label: spec.label,
      hint: spec.hint,
      min: spec.min,
      max: Math.min(spec.max, limits[spec.name] ?? spec.max),
      ...(spec.step !== undefined ? { step: spec.step } : {}),
      // A default that follows from another setting (burn-in from sweeps) is left to the server.
      ...(value !== undefined ? { value } : {}),
      ...(typeof spec.fallback === 'function' ? { placeholder: spec.fallbackText } : {}),
      required: spec.fallback === null,
    };
  }
  return fields;
}

/** The estimate of a fit with these settings (fit-estimate.ts in src/services), for the page. */
function estimateView(c: Context<AppEnv>, study: Study, request: FitRequest): EstimateView {
  const e = estimateFit(c.get('deps').store, study.id, request, machineSize());
  return { answers: e.answers, line: describeEstimate(e), notes: e.notes, fits: e.fits };
}

/** The form's defaults as a fit request: what a run started without changing anything would be. */
function defaultRequest(fields: Record<string, SettingField>): FitRequest {
  const raw: Record<string, string> = {};
  for (const [name, field] of Object.entries(fields)) if (field.value !== undefined) raw[name] = String(field.value);
  return readFitRequest(raw, 'label', placeLimits());
}

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
    step: typeof p.step === 'string' ? p.step : undefined,
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
    const limits = placeLimits();
    const fields = settingFields(limits);
    const estimate = included > 0 && canEdit(c, study) ? estimateView(c, study, defaultRequest(fields)) : null;
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
        fields={fields}
        estimate={estimate}
        maxThreads={limits.threads!}
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

  // The Runs form's estimate, for the fields as they are now (sent by htmx when one changes).
  app.get('/studies/:sid/runs/estimate', (c) => {
    const study = studyFor(c, 'write');
    const q = (name: string) => c.req.query(name);
    try {
      const request = readFitRequest({ themes: q('themes'), sweeps: q('sweeps'), threads: q('threads'), holdout: q('holdout') }, 'label', placeLimits());
      return c.html(<FitEstimatePanel studyId={study.id} estimate={estimateView(c, study, request)} />);
    } catch (error) {
      if (!(error instanceof InputError)) throw error;
      return c.html(<FitEstimatePanel studyId={study.id} estimate={null} error={`No estimate yet: ${error.message}`} />);
    }
  });

  app.post('/studies/:sid/runs', async (c) => {
    const study = studyFor(c, 'write');
    const { store, queue } = c.get('deps');
    const body = await c.req.parseBody({ all: true });
    try {
      // Read, bounded and defaulted by the one settings schema; messages name the fields' labels.
      const request = readFitRequest(
        {
          themes: text(body.themes),
          sweeps: text(body.sweeps),
          burnIn: text(body.burnIn),
          seed: text(body.seed),
          threads: text(body.threads),
          holdout: text(body.holdout),
          covariates: texts(body.covariates),
          name: text(body.name),
        },
        'label',
        placeLimits(),
      );
      // At most a few fits queued or running per account (src/jobs/queue.ts; ASVS 4.0.3 V11.1.3).
      queue.checkFitLimit(c.get('user').id);
      const run = createFitRun(store, study.id, request, { wording: 'label', limits: placeLimits() });
      queue.enqueue(run.id, c.get('user').id);
      return c.redirect(`/studies/${study.id}/runs/${run.id}`, 303);
    } catch (error) {
      if (error instanceof InputError) return runsPage(c, study, error.message);
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
