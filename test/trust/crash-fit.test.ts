// Issue 8, item 5 (fits): the real workbench process is killed with SIGKILL at seeded random
// moments while its worker thread fits a run that checkpoints every 5 sweeps, ten times, and
// started again on the same data folder. After every kill the SQLite file passes
// `PRAGMA integrity_check` (SQLite documentation, "PRAGMA integrity_check") and no checkpoint is
// lost; after every restart the run shows as interrupted (or still queued) and is resumed through
// the Resume button's form. The finished run must equal, bit for bit, an uninterrupted run with
// the same seed and thread count (docs/design.md §4: "same seed + settings + thread count ⇒ same result,
// including after resume").
import { afterAll, describe, expect, it } from 'vitest';
import { Xoshiro128 } from '../../src/model/rng.js';
import { createFitRun, loadRunModel, runFitJob, type FitRequest, type RunModel } from '../../src/services/index.js';
import { openStore, setRunStatus } from '../../src/store/index.js';
import { syntheticStudy } from '../services/synthetic-study.js';
import { databaseProblems, inspect, LocalClient, sleep, startServerProcess, tempFolder, type ServerProcess } from './server-process.js';

const KILLS = 10;
const SWEEPS = 160;
const CHECKPOINT_EVERY = 5;

interface RunState {
  status: string;
  checkpoint: number | null;
  results: number;
}

function runState(dataDir: string, runId: number): RunState {
  return inspect(dataDir, (db) => {
    const run = db.prepare('SELECT status FROM runs WHERE id = ?').get(runId) as { status: string };
    const cp = db.prepare('SELECT MAX(sweep) AS s FROM run_checkpoints WHERE run_id = ?').get(runId) as { s: number | null };
    const results = db.prepare('SELECT COUNT(*) AS n FROM run_results WHERE run_id = ?').get(runId) as { n: number };
    return { status: run.status, checkpoint: cp.s, results: results.n };
  });
}

/** Poll the database until `done` holds (or the timeout passes); returns the last state seen. */
async function waitForState(dataDir: string, runId: number, done: (s: RunState) => boolean, timeoutMs: number): Promise<RunState> {
  const until = Date.now() + timeoutMs;
  let state = runState(dataDir, runId);
  while (!done(state) && Date.now() < until) {
    await sleep(20);
    state = runState(dataDir, runId);
  }
  return state;
}

function bytesOf(a: ArrayBufferView): Buffer {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength);
}

function expectSameFit(resumed: RunModel, whole: RunModel): void {
  const pairs: [string, ArrayBufferView | null, ArrayBufferView | null][] = [
    ['documentIds', resumed.documentIds, whole.documentIds],
    ['thetaGroups', resumed.thetaGroups, whole.thetaGroups],
    ['alpha', resumed.alpha, whole.alpha],
    ['beta', resumed.beta, whole.beta],
    ['lambda', resumed.lambda, whole.lambda],
    ...resumed.phi.map((p, l): [string, ArrayBufferView, ArrayBufferView] => [`phi:${resumed.languages[l]}`, p, whole.phi[l]]),
    ...resumed.thetaSamples.map((s, i): [string, ArrayBufferView, ArrayBufferView] => [`thetaSample${i}`, s, whole.thetaSamples[i]]),
  ];
  expect(resumed.thetaSamples.length).toBe(whole.thetaSamples.length);
  for (const [name, a, b] of pairs) {
    expect(a === null, name).toBe(b === null);
    if (a && b) expect(bytesOf(a).equals(bytesOf(b)), `${name} differs`).toBe(true);
  }
  expect(resumed.diagnostics.trace).toEqual(whole.diagnostics.trace);
}

describe('killing the server during a fit', () => {
  const folder = tempFolder('themata-crash-fit-');
  let server: ServerProcess | undefined;
  afterAll(async () => {
    await server?.kill();
    folder.cleanup();
  });

  // One thread, a covariate (so the DMR prior and its optimisation state are part of what a
  // checkpoint must carry) and the default (fast) sampler, as the workbench runs it.
  const request: FitRequest = { themes: 5, sweeps: SWEEPS, burnIn: 30, seed: 11, threads: 1, covariates: ['region'], checkpointEvery: CHECKPOINT_EVERY };

  it('resumes after each of ten kills and ends with exactly the result of an uninterrupted run', { timeout: 300_000 }, async () => {
    // An invented study of 3,000 answers written straight into the store, and the uninterrupted
    // fit, run to the end in this process.
    const store = openStore(folder.dir);
    let studyId: number;
    let wholeId: number;
    let crashedId: number;
    try {
      studyId = syntheticStudy(store, { documents: 3000, seed: 5 });
      const whole = createFitRun(store, studyId, { ...request, name: 'uninterrupted' });
      wholeId = whole.id;
      const outcome = await runFitJob({ store, runId: whole.id });
      expect(outcome.stopped).toBe(false);
      setRunStatus(store, whole.id, 'finished');
      crashedId = createFitRun(store, studyId, { ...request, name: 'killed ten times' }).id; // queued
    } finally {
      store.close();
    }

    const rng = Xoshiro128.fromSeed(8081);
    let saved = 0; // newest checkpoint sweep seen so far
    let resumed = 0;
    let left = 'queued'; // the run's status in the file when the server went away
    const killedAt: string[] = [];
    for (let i = 1; i <= KILLS; i++) {
      server = await startServerProcess(folder.dir);
      const before = runState(folder.dir, crashedId);
      // A run left 'running' by the dead process shows as interrupted (never failed, never still
      // running without a worker); a run left queued is simply started.
      expect(before.status, `status after restart ${i} (kills so far: ${killedAt.join(' ')})`).toBe(left === 'running' ? 'interrupted' : 'running');
      if (before.status === 'interrupted') {
        const client = new LocalClient(server.url);
        const res = await client.postForm(`/studies/${studyId}/runs/${crashedId}/resume`, {});
        expect(res.status, `resume after restart ${i}`).toBe(303);
        resumed++;
      }
      const moving = (s: RunState) => s.status === 'running' || s.status === 'queued';
      if (i % 3 === 0) {
        // Anywhere early: while the worker starts, reads the corpus, or runs its first sweeps
        // (at most two checkpoints on, so ten kills cannot outrun the fit on a fast machine).
        await waitForState(folder.dir, crashedId, (s) => (s.checkpoint ?? 0) >= saved + 2 * CHECKPOINT_EVERY || !moving(s), 1500 * rng.nextDouble());
      } else {
        // After the next checkpoint, plus a little, so kills fall mid-sweep and mid-write.
        const target = saved + CHECKPOINT_EVERY + Math.floor(6 * rng.nextDouble());
        await waitForState(folder.dir, crashedId, (s) => (s.checkpoint ?? 0) >= target || !moving(s), 60_000);
        await sleep(40 * rng.nextDouble());
      }
      await server.kill();
      server = undefined;

      inspect(folder.dir, (db) => expect(databaseProblems(db), `after kill ${i}`).toEqual([]));
      const after = runState(folder.dir, crashedId);
      killedAt.push(`${after.status}@${after.checkpoint ?? '-'}`);
      expect(after.status, `kill ${i} came too late to interrupt the fit (${killedAt.join(' ')})`).not.toBe('finished');
      expect(after.checkpoint ?? 0, `a checkpoint was lost at kill ${i}`).toBeGreaterThanOrEqual(saved);
      saved = after.checkpoint ?? saved;
      left = after.status;
    }
    expect(resumed, killedAt.join(' ')).toBeGreaterThanOrEqual(KILLS - 2);

    // The last start: resume once more and let the fit finish.
    server = await startServerProcess(folder.dir);
    if (runState(folder.dir, crashedId).status === 'interrupted') {
      expect((await new LocalClient(server.url).postForm(`/studies/${studyId}/runs/${crashedId}/resume`, {})).status).toBe(303);
    }
    const end = await waitForState(folder.dir, crashedId, (s) => s.status === 'finished' || s.status === 'failed', 90_000);
    expect(end.status).toBe('finished');
    await server.kill();
    server = undefined;

    inspect(folder.dir, (db) => expect(databaseProblems(db)).toEqual([]));
    const check = openStore(folder.dir);
    try {
      expectSameFit(loadRunModel(check, crashedId!)!, loadRunModel(check, wholeId!)!);
    } finally {
      check.close();
    }
  });
});
