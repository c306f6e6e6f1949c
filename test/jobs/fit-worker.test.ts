// The real fit worker (services' fit in a worker thread started through tsx), on an invented
// bilingual survey: progress arrives, the run's summaries are stored, and a stopped fit resumes
// from its checkpoint instead of starting again.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { contrastKey, JobQueue, type JobEvent } from '../../src/jobs/index.js';
import { createFitRun, importFile } from '../../src/services/index.js';
import { getRun, listResultKeys, openStore, type Store } from '../../src/store/index.js';
import { inventedSurvey } from '../server/helpers.js';

let dir: string;
let store: Store;
let studyId: number;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'themata-fit-worker-'));
  store = openStore(dir);
  const summary = await importFile(store, {
    study: 'Invented park survey',
    bytes: new TextEncoder().encode(inventedSurvey(120)),
    fileName: 'park.csv',
    mapping: { id: 'respondent_id', text: ['comment'], language: 'lang', covariates: [{ column: 'district', type: 'categorical' }], weight: 'weight' },
  });
  studyId = summary.studyId;
});
afterAll(() => {
  store.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('fit worker', () => {
  it('fits in a worker thread, reports every sweep and stores contrasts and checks', async () => {
    const run = createFitRun(store, studyId, { themes: 3, sweeps: 30, burnIn: 5, covariates: ['district'], name: 'whole' });
    const queue = new JobQueue({ store });
    const sweeps = new Set<number>();
    queue.subscribe(run.id, (e: JobEvent) => {
      if (e.kind === 'progress' && typeof e.progress.sweep === 'number' && e.progress.phase === 'sampling') sweeps.add(e.progress.sweep);
    });
    queue.start();
    await queue.idle();
    await queue.close();
    expect(getRun(store, run.id)!.status).toBe('finished');
    expect(sweeps.size).toBe(30);
    const keys = listResultKeys(store, run.id);
    expect(keys).toContain(contrastKey('district'));
    expect(keys).toContain('checks');
  });

  it('resumes a stopped fit from its checkpoint', async () => {
    const run = createFitRun(store, studyId, { themes: 3, sweeps: 150, burnIn: 5, name: 'stopped', checkpointEvery: 10 } as Parameters<typeof createFitRun>[2]);
    const queue = new JobQueue({ store });
    let stopAt = 0;
    queue.subscribe(run.id, (e) => {
      if (e.kind === 'progress' && typeof e.progress.sweep === 'number' && e.progress.sweep >= 25 && !stopAt) {
        stopAt = e.progress.sweep;
        queue.cancel(run.id);
      }
    });
    queue.start();
    await queue.idle();
    expect(getRun(store, run.id)!.status).toBe('cancelled');
    let firstSweep = -1;
    queue.subscribe(run.id, (e) => {
      if (firstSweep < 0 && e.kind === 'progress' && typeof e.progress.sweep === 'number' && e.progress.phase === 'sampling') firstSweep = e.progress.sweep;
    });
    expect(queue.resume(run.id)).toBe(true);
    await queue.idle();
    await queue.close();
    expect(getRun(store, run.id)!.status).toBe('finished');
    expect(firstSweep).toBeGreaterThan(20);
    expect(getRun(store, run.id)!.progress.trace).toHaveLength(150);
  });
});
