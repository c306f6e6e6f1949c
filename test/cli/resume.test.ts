// `themata resume` continues a run left 'running' by a killed `themata fit` (its process is gone),
// refuses one still being fitted, and `fit --checkpoint-every N` sets how often it checkpoints.
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { createFitRun } from '../../src/services/index.js';
import * as S from '../../src/store/index.js';
import { syntheticStudy } from '../services/synthetic-study.js';
import { tempDir } from '../store/helpers.js';
import { cli } from './cli-harness.js';

const t = tempDir('themata-resume-');
afterAll(() => t.cleanup());

function setUp(data: string): { runId: number } {
  const store = S.openStore(data);
  try {
    const studyId = syntheticStudy(store, { documents: 60 });
    const run = createFitRun(store, studyId, { themes: 3, sweeps: 12, burnIn: 4, seed: 3, name: 'left running', checkpointEvery: 4 });
    S.setRunStatus(store, run.id, 'running');
    return { runId: run.id };
  } finally {
    store.close();
  }
}

describe('themata resume', () => {
  it('continues a run whose fitting process was killed', async () => {
    const data = join(t.dir, 'killed');
    const { runId } = setUp(data);
    const dead = spawnSync(process.execPath, ['-e', '0']).pid!;
    const store = S.openStore(data);
    store.db.prepare('UPDATE runs SET owner_pid = ? WHERE id = ?').run(dead, runId);
    store.close();
    const r = await cli(['--data', data, 'resume', '--study', 'Synthetic', '--run', 'left running']);
    expect(r.stderr).toMatch(/was left running: its process \(\d+ on .+\) has ended/);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout.trim().split('\n').pop()!)).toMatchObject({ run: 'left running', sweeps: 12 });
    const after = S.openStore(data);
    try {
      expect(S.getRun(after, runId)!.status).toBe('finished');
    } finally {
      after.close();
    }
  });

  it('refuses a run whose process is alive and beating', async () => {
    const data = join(t.dir, 'alive');
    setUp(data); // owner: this test process, heartbeat now
    const r = await cli(['--data', data, 'resume', '--study', 'Synthetic', '--run', 'left running']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/still being fitted by process \d+/);
  });

  it('fit --checkpoint-every stores the interval in the run settings', async () => {
    const data = join(t.dir, 'every');
    setUp(data);
    const r = await cli(['--data', data, 'fit', '--study', 'Synthetic', '--themes', '2', '--sweeps', '6', '--burn-in', '2', '--checkpoint-every', '3', '--name', 'often']);
    expect(r.code).toBe(0);
    const store = S.openStore(data);
    try {
      const study = S.getStudyByName(store, 'Synthetic')!;
      expect(S.getRunByName(store, study.id, 'often')!.settings.checkpointEvery).toBe(3);
    } finally {
      store.close();
    }
  });
});
