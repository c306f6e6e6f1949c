// `npm run bench -- --only web`: page latency of the results pages (Themes, a theme page,
// Contrasts, Answers) under 10 concurrent clients, on a study of 100,000 invented demo answers
// with a finished run (issue 7 item 5; goal p95 ≤ 150 ms). A benchmark, not a test: figures are
// printed, never asserted.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createRequire } from 'node:module';
import { demoCsv, DEMO_COLUMNS, generateDemo } from '../demo/index.js';
import { JobQueue } from '../src/jobs/index.js';
import { createFitRun, importFile } from '../src/services/index.js';
import { spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import { getRun, openStore } from '../src/store/index.js';

import type { BenchOptions } from './run.js';

// autocannon ships no types; only the small part used here is described.
interface AutocannonResult {
  requests: { total: number };
  errors: number;
  non2xx: number;
}
interface AutocannonInstance {
  on(event: 'response', listener: (client: unknown, status: number, bytes: number, responseTime: number) => void): void;
}
type Autocannon = (options: Record<string, unknown>, done: (error: Error | null, result: AutocannonResult) => void) => AutocannonInstance;
const autocannon = createRequire(import.meta.url)('autocannon') as Autocannon;

export interface BenchStudy {
  readonly dir: string;
  /** The workbench, served by `themata serve` in its own process (as in production). */
  readonly server: { readonly url: string; readonly process: ChildProcess };
  readonly studyId: number;
  readonly runId: number;
  readonly fitSeconds: number;
  readonly paths: Record<string, string>;
  close(): Promise<void>;
}

export async function buildBenchStudy(options: { answers: number; themes: number; sweeps: number; log: (line: string) => void }): Promise<BenchStudy> {
  const dir = mkdtempSync(join(tmpdir(), 'themata-bench-web-'));
  const store = openStore(dir);
  options.log(`generating ${options.answers.toLocaleString('en-GB')} invented demo answers…`);
  const { rows } = generateDemo({ answers: options.answers, seed: 11 });
  const bytes = new TextEncoder().encode(demoCsv(rows));
  let t0 = performance.now();
  const summary = await importFile(store, { study: 'Bench study', bytes, fileName: 'bench.csv', mapping: DEMO_COLUMNS });
  options.log(`imported in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  const run = createFitRun(store, summary.studyId, { themes: options.themes, sweeps: options.sweeps, burnIn: Math.floor(options.sweeps / 4), covariates: ['branch_region'], holdout: 0.05 });
  // Fitted through the job queue like the workbench does, so the run's summaries are stored too.
  t0 = performance.now();
  const queue = new JobQueue({ store });
  queue.start();
  await queue.idle();
  await queue.close();
  const fitSeconds = (performance.now() - t0) / 1000;
  options.log(`fitted K=${options.themes}, ${options.sweeps} sweeps, with summaries, in ${fitSeconds.toFixed(1)} s (${getRun(store, run.id)?.status}${getRun(store, run.id)?.error ? `: ${getRun(store, run.id)?.error}` : ""})`);
  store.close();
  const server = await serveInChild(dir);
  const base = `/studies/${summary.studyId}/runs/${run.id}`;
  return {
    dir,
    server,
    studyId: summary.studyId,
    runId: run.id,
    fitSeconds,
    paths: {
      themes: `${base}/themes`,
      theme: `${base}/themes/0`,
      contrasts: `${base}/contrasts?by=branch_region`,
      answers: `${base}/answers?language=en`,
    },
    async close() {
      await new Promise<void>((resolve) => {
        server.process.once('exit', () => resolve());
        server.process.kill('SIGTERM');
      });
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number };
      probe.close(() => resolve(port));
    });
  });
}

/** Start `themata serve` on a free loopback port and wait until it says where it listens. */
export async function serveInChild(dataDir: string): Promise<{ url: string; process: ChildProcess }> {
  const port = await freePort();
  const bin = new URL('../bin/themata.mjs', import.meta.url);
  // The load section's 50 clients all browse as the one local user: far beyond the request rate
  // limit a person needs (20 a second by default), so the benchmark raises it.
  const args = [bin.pathname, '--data', dataDir, 'serve', '--port', String(port), '--requests-per-second', '100000'];
  const child = spawn(process.execPath, args, { stdio: ['ignore', 'pipe', 'pipe'] });
  const url = await new Promise<string>((resolve, reject) => {
    let seen = '';
    const onData = (chunk: Buffer) => {
      seen += chunk.toString();
      const m = seen.match(/serving at (http:\/\/\S+?\/)(\s|$)/);
      if (m) resolve(m[1]);
    };
    child.stdout!.on('data', onData);
    child.stderr!.on('data', onData);
    child.once('exit', (code) => reject(new Error(`themata serve stopped (exit ${code}): ${seen}`)));
  });
  return { url, process: child };
}

function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil(p * sorted.length) - 1));
  return sorted[i];
}

export interface PageFigures {
  requests: number;
  errors: number;
  non2xx: number;
  p50Ms: number;
  p95Ms: number;
  firstLoadMs: number;
}

/** Warm each page once (first-load time), then load it with `connections` clients for `seconds`. */
export async function measurePages(url: string, paths: Record<string, string>, options: { connections: number; seconds: number; log: (line: string) => void }): Promise<Record<string, PageFigures>> {
  const out: Record<string, PageFigures> = {};
  for (const [name, path] of Object.entries(paths)) {
    const t0 = performance.now();
    const warm = await fetch(new URL(path, url), { headers: { Accept: 'text/html' } });
    await warm.text();
    const firstLoadMs = performance.now() - t0;
    const figures = await loadUrls(url, [path], options.connections, options.seconds);
    out[name] = { ...figures, firstLoadMs: Math.round(firstLoadMs) };
    options.log(`${name.padEnd(10)} p50 ${figures.p50Ms.toFixed(1)} ms  p95 ${figures.p95Ms.toFixed(1)} ms  (${figures.requests} requests, ${figures.errors + figures.non2xx} errors; first load ${Math.round(firstLoadMs)} ms)`);
  }
  return out;
}

/** Load a set of paths round-robin with autocannon; latency percentiles from every response. */
export function loadUrls(url: string, paths: string[], connections: number, seconds: number): Promise<Omit<PageFigures, 'firstLoadMs'>> {
  const times: number[] = [];
  return new Promise((resolve, reject) => {
    const instance = autocannon(
      {
        url,
        connections,
        duration: seconds,
        headers: { Accept: 'text/html' },
        requests: paths.map((path) => ({ method: 'GET', path })),
      },
      (error, result) => {
        if (error) return reject(error);
        times.sort((a, b) => a - b);
        resolve({ requests: result.requests.total, errors: result.errors, non2xx: result.non2xx, p50Ms: percentile(times, 0.5), p95Ms: percentile(times, 0.95) });
      },
    );
    instance.on('response', (_client: unknown, _status: number, _bytes: number, responseTime: number) => times.push(responseTime));
  });
}

export async function runBench(options: BenchOptions): Promise<Record<string, unknown>> {
  const answers = options.quick ? 20_000 : 100_000;
  const seconds = options.quick ? 4 : 10;
  const study = await buildBenchStudy({ answers, themes: 20, sweeps: options.quick ? 20 : 40, log: options.log });
  try {
    const pages = await measurePages(study.server.url, study.paths, { connections: 10, seconds, log: options.log });
    return { answers, connections: 10, seconds, fitSeconds: study.fitSeconds, pages };
  } finally {
    await study.close();
  }
}
