// A deleted run's cached pages (answer text among them) must not stay in the server's memory.
import { afterAll, describe, expect, it } from 'vitest';
import { createFitRun, removeRun, runFitJob } from '../../src/services/index.js';
import { RunDataCache } from '../../src/server/results/run-data.js';
import { syntheticStudy } from '../services/synthetic-study.js';
import { makeApp } from './helpers.js';

const t = makeApp();
afterAll(() => t.close());

describe('results cache', () => {
  it('lets go of a deleted run at the next visit to any run', async () => {
    const studyId = syntheticStudy(t.store);
    const fit = async (name: string) => {
      const run = createFitRun(t.store, studyId, { themes: 2, sweeps: 6, burnIn: 2, sampler: 'reference', name });
      await runFitJob({ store: t.store, runId: run.id });
      return run.id;
    };
    const gone = await fit('k2a');
    const kept = await fit('k2b');
    const cache = new RunDataCache(t.store);
    expect(cache.get(gone)).toBeDefined();
    expect(cache.holds(gone)).toBe(true);
    await removeRun(t.store, gone);
    cache.get(kept);
    expect(cache.holds(gone)).toBe(false);
    expect(cache.get(gone)).toBeUndefined();
  });
});
