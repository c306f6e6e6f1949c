// `npm run bench -- --only load`: 50 concurrent clients browse the results pages of a finished
// run for 30 s on loopback while another fit runs in the job queue's worker thread (issue 8
// item 6). Prints errors (goal: zero), p95 latency, and the fit's speed under load beside its
// speed with no load. A benchmark, not a test.
import { openStore, createRun, getRun, type RunSettings } from '../src/store/index.js';
import { JobQueue } from '../src/jobs/index.js';
import type { BenchOptions } from './run.js';
import { buildBenchStudy, loadUrls } from './web.js';

/** Run one fit through the job queue (worker thread) and return its mean words per second. */
async function timedFit(dataDir: string, studyId: number, settings: RunSettings, name: string, during?: () => Promise<unknown>) {
  const store = openStore(dataDir);
  const queue = new JobQueue({ store });
  const run = createRun(store, { studyId, name, settings });
  const speeds: number[] = [];
  queue.subscribe(run.id, (e) => {
    if (e.kind === 'progress' && typeof e.progress.tokensPerSecond === 'number' && e.progress.phase === 'sampling') speeds.push(e.progress.tokensPerSecond);
  });
  queue.start();
  const [loadResult] = await Promise.all([during?.(), queue.idle()]);
  const status = getRun(store, run.id)?.status;
  await queue.close();
  store.close();
  const mean = speeds.length ? speeds.reduce((a, b) => a + b, 0) / speeds.length : NaN;
  return { tokensPerSecond: Math.round(mean), status, loadResult };
}

export async function runBench(options: BenchOptions): Promise<Record<string, unknown>> {
  const seconds = options.quick ? 8 : 30;
  const answers = options.quick ? 10_000 : 40_000;
  const study = await buildBenchStudy({ answers, themes: 15, sweeps: 20, log: options.log });
  try {
    const settings: RunSettings = { themes: 15, sweeps: options.quick ? 60 : 150, burnIn: 10, seed: 5, threads: 1, covariates: [], holdout: 0 };
    options.log('fit with no load…');
    const quiet = await timedFit(study.dir, study.studyId, settings, 'bench-quiet');
    options.log(`  ${quiet.tokensPerSecond.toLocaleString('en-GB')} words/s (${quiet.status})`);
    options.log(`fit while 50 clients browse for ${seconds} s…`);
    const paths = Object.values(study.paths);
    for (const p of paths) await (await fetch(new URL(p, study.server.url))).text(); // warm the caches
    const busy = await timedFit(study.dir, study.studyId, settings, 'bench-busy', () => loadUrls(study.server.url, paths, 50, seconds));
    const load = busy.loadResult as Awaited<ReturnType<typeof loadUrls>>;
    options.log(`  ${busy.tokensPerSecond.toLocaleString('en-GB')} words/s (${busy.status})`);
    options.log(`browsing: ${load.requests} requests, ${load.errors} errors, ${load.non2xx} non-2xx, p50 ${load.p50Ms.toFixed(1)} ms, p95 ${load.p95Ms.toFixed(1)} ms`);
    return {
      answers,
      clients: 50,
      seconds,
      requests: load.requests,
      errors: load.errors + load.non2xx,
      p50Ms: load.p50Ms,
      p95Ms: load.p95Ms,
      fitTokensPerSecondQuiet: quiet.tokensPerSecond,
      fitTokensPerSecondUnderLoad: busy.tokensPerSecond,
      fitSpeedRatio: Math.round((100 * busy.tokensPerSecond) / quiet.tokensPerSecond) / 100,
    };
  } finally {
    await study.close();
  }
}
