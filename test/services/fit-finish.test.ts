// A fit's results and its status 'finished' are written in one transaction: a process killed
// between the two must not leave a run that is not finished yet has lost the checkpoint it would
// resume from (issue 8, crash safety).
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createFitRun, runFitJob } from '../../src/services/fit-run.js';
import * as S from '../../src/store/index.js';
import { withTempStore } from '../store/helpers.js';
import { syntheticStudy } from './synthetic-study.js';

let ctx: ReturnType<typeof withTempStore>;
beforeEach(() => (ctx = withTempStore()));
afterEach(() => ctx.cleanup());

describe('storing a finished fit', () => {
  it('marks the run finished, with its final progress, together with its results', async () => {
    const studyId = syntheticStudy(ctx.store, { documents: 60 });
    const run = createFitRun(ctx.store, studyId, { themes: 3, sweeps: 12, burnIn: 4, seed: 3, checkpointEvery: 5 });
    S.setRunStatus(ctx.store, run.id, 'running');
    const outcome = await runFitJob({ store: ctx.store, runId: run.id });
    expect(outcome.stopped).toBe(false);
    const after = S.getRun(ctx.store, run.id)!;
    expect(after.status).toBe('finished');
    expect(after.finishedAt).not.toBeNull();
    expect(after.progress).toMatchObject({ phase: 'finished', sweep: 12, sweeps: 12 });
    expect(after.progress.trace).toHaveLength(12);
    expect(S.listResultKeys(ctx.store, run.id)).toContain('thetaGroups');
    expect(S.latestCheckpoint(ctx.store, run.id)).toBeUndefined();
  });

  it('keeps the checkpoint and stores no results when the status cannot be written', async () => {
    const studyId = syntheticStudy(ctx.store, { documents: 60 });
    const run = createFitRun(ctx.store, studyId, { themes: 3, sweeps: 12, burnIn: 4, seed: 3, checkpointEvery: 5 });
    S.setRunStatus(ctx.store, run.id, 'running');
    // Stands in for a kill at the moment the run turns finished.
    ctx.store.db.exec("CREATE TRIGGER no_finish BEFORE UPDATE OF status ON runs WHEN NEW.status = 'finished' BEGIN SELECT RAISE(ABORT, 'simulated crash'); END");
    await expect(runFitJob({ store: ctx.store, runId: run.id })).rejects.toThrow(/simulated crash/);
    expect(S.getRun(ctx.store, run.id)!.status).toBe('running');
    expect(S.listResultKeys(ctx.store, run.id)).toEqual([]);
    expect(S.latestCheckpoint(ctx.store, run.id)?.sweep).toBe(10);
  });
});
