// A run left 'running' by a process that no longer exists (killed `themata fit`, killed
// workbench) is told apart from a run still being fitted: by its owner process on this host,
// or by a heartbeat older than two minutes.
import { spawnSync } from 'node:child_process';
import { hostname } from 'node:os';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import * as S from '../../src/store/index.js';
import { withTempStore } from './helpers.js';

const settings = { themes: 3, sweeps: 10, burnIn: 2, seed: 7, threads: 1, covariates: [], holdout: 0 };
let ctx: ReturnType<typeof withTempStore>;
beforeEach(() => (ctx = withTempStore()));
afterEach(() => ctx.cleanup());

/** The id of a process that has ended. */
function deadPid(): number {
  const child = spawnSync(process.execPath, ['-e', '0']);
  return child.pid!;
}

function runningRun() {
  const st = S.createStudy(ctx.store, { name: 'S' });
  const run = S.createRun(ctx.store, { studyId: st.id, name: 'k3', settings });
  S.setRunStatus(ctx.store, run.id, 'running');
  return S.getRun(ctx.store, run.id)!;
}

describe('run heartbeat and owner', () => {
  it('records this process and host as the owner when a run starts', () => {
    const run = runningRun();
    expect(run).toMatchObject({ status: 'running', ownerPid: process.pid, ownerHost: hostname() });
    expect(Date.now() - Date.parse(run.heartbeatAt!)).toBeLessThan(60_000);
    expect(S.abandonedReason(run)).toBeNull();
  });

  it('takes a run whose owner process has ended on this host as abandoned, and only then', () => {
    const run = runningRun();
    const gone = { ...run, ownerPid: deadPid() };
    expect(S.processIsAlive(gone.ownerPid)).toBe(false);
    expect(S.abandonedReason(gone)).toMatch(/has ended/);
    // On another host the process id says nothing; a fresh heartbeat keeps it alive.
    expect(S.abandonedReason({ ...gone, ownerHost: 'another-host' })).toBeNull();
  });

  it('takes a run whose heartbeat is older than two minutes as abandoned', () => {
    const run = { ...runningRun(), ownerHost: 'another-host' };
    const beat = Date.parse(run.heartbeatAt!);
    expect(S.abandonedReason(run, { nowMs: beat + S.RUN_HEARTBEAT_STALE_MS - 1000 })).toBeNull();
    expect(S.abandonedReason(run, { nowMs: beat + S.RUN_HEARTBEAT_STALE_MS + 1000 })).toMatch(/no sign of life/);
  });

  it('progress writes beat the heart', () => {
    const run = runningRun();
    ctx.store.db.prepare("UPDATE runs SET heartbeat_at = '2000-01-01T00:00:00.000Z' WHERE id = ?").run(run.id);
    expect(S.abandonedReason(S.getRun(ctx.store, run.id)!)).toMatch(/no sign of life/);
    S.setRunProgress(ctx.store, run.id, { sweep: 3 });
    expect(S.abandonedReason(S.getRun(ctx.store, run.id)!)).toBeNull();
    ctx.store.db.prepare("UPDATE runs SET heartbeat_at = '2000-01-01T00:00:00.000Z' WHERE id = ?").run(run.id);
    S.touchRunHeartbeat(ctx.store, run.id);
    expect(S.abandonedReason(S.getRun(ctx.store, run.id)!)).toBeNull();
  });

  it('interruptIfAbandoned changes an abandoned run to interrupted and leaves a live one alone', () => {
    const run = runningRun();
    expect(S.interruptIfAbandoned(ctx.store, run.id)).toBeNull();
    expect(S.getRun(ctx.store, run.id)!.status).toBe('running');
    ctx.store.db.prepare('UPDATE runs SET owner_pid = ? WHERE id = ?').run(deadPid(), run.id);
    expect(S.interruptIfAbandoned(ctx.store, run.id)).toMatch(/has ended/);
    expect(S.getRun(ctx.store, run.id)!.status).toBe('interrupted');
  });
});
