// One run lifecycle (issue 13): a fit from the command line (in its own process) and a fit queued
// in the workbench (in a worker thread) with the same seed and settings store the same results and
// the same summaries — contrasts from the same 1,000 draws, the same checks — and go through the
// same phases, each reported with a time left (issue 15).
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runFitInProcess, type JobEvent } from '../../src/jobs/index.js';
import { CONTRAST_DRAWS, contrastKey, createFitRun, FIT_PHASES } from '../../src/services/index.js';
import * as S from '../../src/store/index.js';
import { cli } from '../cli/cli-harness.js';
import { LOCAL_CSRF, makeApp, postForm, type TestApp } from '../server/helpers.js';
import { syntheticStudy } from '../services/synthetic-study.js';
import { tempDir } from '../store/helpers.js';

const t = tempDir('themata-same-results-');
const cliData = join(t.dir, 'cli');
const webData = join(t.dir, 'web');
const SETTINGS = { themes: '3', sweeps: '30', burnIn: '6', seed: '4', holdout: '0.2', covariate: 'region', name: 'same' };
let web: TestApp;
let webStudy = 0;

beforeAll(() => {
  for (const dir of [cliData, webData, join(t.dir, 'phases')]) {
    const store = S.openStore(dir);
    const id = syntheticStudy(store, { documents: 160 });
    if (dir === webData) webStudy = id;
    store.close();
  }
  web = makeApp({ dir: webData });
});
afterAll(async () => {
  await web.close();
  t.cleanup();
});

/** Every stored result of a run, typed arrays as plain arrays; timings left out of the diagnostics. */
function storedResults(store: S.Store, runId: number): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, r] of Object.entries(S.loadResults(store, runId))) {
    const v = r.value as unknown;
    if (ArrayBuffer.isView(v)) out[key] = { shape: r.shape, values: Array.from(v as Float64Array) };
    else out[key] = (v as { json: unknown }).json;
  }
  const d = out.diagnostics as Record<string, unknown>;
  delete d.seconds;
  delete d.tokensPerSecond;
  return out;
}

describe('the command line and the workbench', () => {
  it('store the same results and summaries for the same run', async () => {
    const r = await cli([
      '--data', cliData, 'fit', '--study', 'Synthetic', '--themes', SETTINGS.themes, '--sweeps', SETTINGS.sweeps, '--burn-in', SETTINGS.burnIn,
      '--seed', SETTINGS.seed, '--holdout', SETTINGS.holdout, '--covariate', SETTINGS.covariate, '--name', SETTINGS.name,
    ]);
    expect(r.stderr).toMatch(/^Estimate: [^\n]+\n(Note: [^\n]+\n)*$/); // only the estimate before the sweeps
    expect(r.code).toBe(0);

    const res = await postForm(web, `/studies/${webStudy}/runs`, {
      _csrf: LOCAL_CSRF, themes: SETTINGS.themes, sweeps: SETTINGS.sweeps, burnIn: SETTINGS.burnIn, seed: SETTINGS.seed, threads: '1',
      holdout: SETTINGS.holdout, covariates: SETTINGS.covariate, name: SETTINGS.name,
    });
    expect(res.status).toBe(303);
    await web.queue.idle();

    const cliStore = S.openStore(cliData);
    try {
      const cliRun = S.getRunByName(cliStore, 1, 'same')!;
      const webRun = S.getRunByName(web.store, webStudy, 'same')!;
      expect(cliRun.status).toBe('finished');
      expect(webRun.status).toBe('finished');
      expect(webRun.settings).toEqual(cliRun.settings);
      const a = storedResults(cliStore, cliRun.id);
      const b = storedResults(web.store, webRun.id);
      // The summaries are stored by both, the contrasts from the same number of draws.
      for (const key of [contrastKey('region'), contrastKey('language'), 'checks']) {
        expect(Object.keys(a), key).toContain(key);
        expect(Object.keys(b), key).toContain(key);
      }
      expect((a[contrastKey('region')] as { draws: number }).draws).toBe(CONTRAST_DRAWS);
      expect(Object.keys(b).sort()).toEqual(Object.keys(a).sort());
      for (const key of Object.keys(a)) expect(b[key], key).toEqual(a[key]);
      // Same final progress (trace included).
      expect(webRun.progress.trace).toEqual(cliRun.progress.trace);
      expect(webRun.progress.phase).toBe('finished');
      expect(cliRun.progress.phase).toBe('finished');
    } finally {
      cliStore.close();
    }
  });

  it('report every phase in order, with time left through the summaries and storing', async () => {
    const store = S.openStore(join(t.dir, 'phases'));
    try {
      const run = createFitRun(store, 'Synthetic', { themes: 3, sweeps: 12, burnIn: 2, covariates: ['region'], holdout: 0.1 });
      const seen: { phase: string; left: unknown }[] = [];
      const outcome = await runFitInProcess({ store, runId: run.id, onProgress: (p) => seen.push({ phase: String(p.phase), left: p.secondsLeft }) });
      expect(outcome.status).toBe('finished');
      const order = seen.map((s) => s.phase).filter((p, i, all) => p !== all[i - 1]);
      expect(order).toEqual([...FIT_PHASES]);
      // From the first sweep on, time left is a number and includes what follows the sweeps.
      const timed = seen.filter((s) => ['sampling', 'summarising', 'storing results'].includes(s.phase));
      expect(timed.every((s) => typeof s.left === 'number' && Number.isFinite(s.left))).toBe(true);
      const lastSweep = seen.filter((s) => s.phase === 'sampling').at(-1)!;
      expect(lastSweep.left as number).toBeGreaterThan(0);
      expect(seen.at(-1)!.left).toBe(0);
    } finally {
      store.close();
    }

    // The queue's events show the same phases for a run in a worker thread.
    const run = createFitRun(web.store, webStudy, { themes: 3, sweeps: 12, burnIn: 2, covariates: ['region'], name: 'phases' });
    const phases: string[] = [];
    const off = web.queue.subscribe(run.id, (e: JobEvent) => {
      if (e.kind === 'progress' && phases.at(-1) !== e.progress.phase) phases.push(String(e.progress.phase));
    });
    web.queue.enqueue(run.id);
    await web.queue.idle();
    off();
    expect(phases).toEqual([...FIT_PHASES]);
  });
});
