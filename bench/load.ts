// `npm run bench -- --only load`: 50 concurrent clients browse the results pages of a finished
// run for 30 s on loopback while the server fits another run in its worker thread (issue 8
// item 6). Prints errors (goal: zero), p95 latency, and the fit's speed under load beside its
// speed with no load. The server runs as `themata serve` in its own process, as in production.
// A benchmark, not a test.
import { getRun, loadJsonResult, openStore } from '../src/store/index.js';
import type { BenchOptions } from './run.js';
import { buildBenchStudy, loadUrls, type BenchStudy } from './web.js';

/** Start a fit through the workbench's own form and wait for it; returns words per second. */
async function fitViaServer(study: BenchStudy, name: string, sweeps: number): Promise<{ tokensPerSecond: number; seconds: number; status: string }> {
  const runsUrl = new URL(`/studies/${study.studyId}/runs`, study.server.url);
  const page = await (await fetch(runsUrl, { headers: { Accept: 'text/html' } })).text();
  const csrf = page.match(/name="_csrf" value="([^"]+)"/)?.[1] ?? '';
  const form = new URLSearchParams({ _csrf: csrf, themes: '15', sweeps: String(sweeps), burnIn: '10', seed: '5', threads: '1', holdout: '0', name });
  const res = await fetch(runsUrl, { method: 'POST', body: form, redirect: 'manual' });
  const runId = Number(res.headers.get('Location')?.match(/\/runs\/(\d+)/)?.[1]);
  if (!runId) throw new Error(`The run was not created (HTTP ${res.status}).`);
  const store = openStore(study.dir, { readonly: true });
  try {
    for (;;) {
      const run = getRun(store, runId);
      if (run && !['queued', 'running'].includes(run.status)) {
        const d = loadJsonResult<{ tokensPerSecond: number; seconds: number }>(store, runId, 'diagnostics');
        return { tokensPerSecond: d?.tokensPerSecond ?? NaN, seconds: d?.seconds ?? NaN, status: run.status };
      }
      await new Promise((r) => setTimeout(r, 250));
    }
  } finally {
    store.close();
  }
}

export async function runBench(options: BenchOptions): Promise<Record<string, unknown>> {
  const seconds = options.quick ? 8 : 30;
  const answers = options.quick ? 10_000 : 40_000;
  const study = await buildBenchStudy({ answers, themes: 15, sweeps: 20, log: options.log });
  try {
    options.log('fit with no load…');
    const probe = await fitViaServer(study, 'bench-quiet', 50);
    // Size the loaded fit so it outlasts the browsing window at the quiet speed.
    const perSweep = probe.seconds / 50;
    const sweeps = Math.max(50, Math.ceil((seconds + 5) / Math.max(perSweep, 1e-3)));
    options.log(`  ${Math.round(probe.tokensPerSecond).toLocaleString('en-GB')} words/s (${probe.status}); loaded fit: ${sweeps} sweeps`);
    const paths = Object.values(study.paths);
    for (const p of paths) await (await fetch(new URL(p, study.server.url), { headers: { Accept: 'text/html' } })).text(); // warm
    options.log(`fit while 50 clients browse for ${seconds} s…`);
    const fit = fitViaServer(study, 'bench-busy', sweeps);
    await new Promise((r) => setTimeout(r, 1500)); // let the worker start
    const load = await loadUrls(study.server.url, paths, 50, seconds);
    const busy = await fit;
    options.log(`  ${Math.round(busy.tokensPerSecond).toLocaleString('en-GB')} words/s (${busy.status})`);
    options.log(`browsing: ${load.requests} requests, ${load.errors} errors, ${load.non2xx} non-2xx, p50 ${load.p50Ms.toFixed(1)} ms, p95 ${load.p95Ms.toFixed(1)} ms`);
    return {
      answers,
      clients: 50,
      seconds,
      requests: load.requests,
      errors: load.errors + load.non2xx,
      p50Ms: load.p50Ms,
      p95Ms: load.p95Ms,
      fitTokensPerSecondQuiet: Math.round(probe.tokensPerSecond),
      fitTokensPerSecondUnderLoad: Math.round(busy.tokensPerSecond),
      fitSpeedRatio: Math.round((100 * busy.tokensPerSecond) / probe.tokensPerSecond) / 100,
    };
  } finally {
    await study.close();
  }
}
