import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createFitRun, runFitJob } from '../../src/services/fit-run.js';
import { loadRunModel, themeWords } from '../../src/services/run-model.js';
import { runChecks } from '../../src/services/checks.js';
import { runContrasts } from '../../src/services/contrasts.js';
import * as S from '../../src/store/index.js';
import { InputError } from '../../src/text/types.js';
import { withTempStore } from '../store/helpers.js';
import { syntheticStudy } from './synthetic-study.js';

let ctx: ReturnType<typeof withTempStore>;
beforeEach(() => (ctx = withTempStore()));
afterEach(() => ctx.cleanup());

describe('runFitJob', () => {
  it('fits a stored study, stores the results and recovers the planted themes', async () => {
    const studyId = syntheticStudy(ctx.store);
    const run = createFitRun(ctx.store, studyId, { themes: 3, sweeps: 60, burnIn: 20, seed: 2, covariates: ['region'], holdout: 0.15 });
    const progress: number[] = [];
    const outcome = await runFitJob({ store: ctx.store, runId: run.id, onProgress: (p) => p.phase === 'sampling' && progress.push(p.sweep!) });
    expect(outcome.stopped).toBe(false);
    expect(progress).toEqual(Array.from({ length: 60 }, (_, i) => i + 1));
    const model = loadRunModel(ctx.store, run.id)!;
    expect(model.K).toBe(3);
    expect(model.languages).toEqual(['en', 'fr']);
    expect(model.heldOutIds.length).toBeGreaterThan(0);
    expect(model.features.names).toEqual(['intercept', 'region=South']);
    // Each fitted theme's top English words come from one planted theme, all three covered.
    const planted = [0, 1, 2].map((k) => {
      const top = themeWords(model, k, 'en', 5).map((w) => w.stem[1]);
      expect(new Set(top).size).toBe(1);
      return top[0];
    });
    expect(new Set(planted).size).toBe(3);
    // Polylingual: the same fitted theme holds the same planted theme in French.
    for (let k = 0; k < 3; k++) expect(themeWords(model, k, 'fr', 3).map((w) => w.stem[1])).toEqual([planted[k], planted[k], planted[k]]);
    const checks = runChecks(ctx.store, model);
    expect(checks.perplexity!.perplexity).toBeGreaterThan(1);
    expect(checks.perplexity!.perplexity).toBeLessThan(30); // 30 words per language; themes cut it to ~10
    expect(checks.coherence.themes).toHaveLength(6);
    // The planted North effect on theme 0 shows in the contrasts, with an interval excluding zero.
    const res = runContrasts(ctx.store, model, { by: 'region', draws: 300 });
    const k0 = planted.indexOf('0');
    const diff = res.differences.find((d) => d.theme === k0)!;
    const northMinusSouth = diff.levelA === 'North' ? diff : { ...diff, low: -diff.high, high: -diff.low };
    expect(northMinusSouth.low).toBeGreaterThan(0);
  });

  // Both samplers, one and two threads: a checkpoint holds z, the priors and the RNG state, and
  // every cached sum a sampler keeps is rebuilt from them, so a resumed run is bit-identical.
  it.each([
    ['reference', 1],
    ['fast', 1],
    ['fast', 2],
  ] as const)('resumed after a stop, gives exactly the result of an uninterrupted run (same seed; %s sampler, %i thread(s))', async (sampler, threads) => {
    const studyId = syntheticStudy(ctx.store, { documents: 120 });
    const request = { themes: 3, sweeps: 30, burnIn: 10, seed: 9, covariates: ['region'], checkpointEvery: 5, sampler, threads };
    const whole = createFitRun(ctx.store, studyId, { ...request, name: `whole-${sampler}-${threads}` });
    await runFitJob({ store: ctx.store, runId: whole.id });
    const parts = createFitRun(ctx.store, studyId, { ...request, name: `parts-${sampler}-${threads}` });
    let sweep = 0;
    const first = await runFitJob({ store: ctx.store, runId: parts.id, onProgress: (p) => (sweep = p.sweep ?? sweep), shouldStop: () => sweep >= 13 });
    expect(first.stopped).toBe(true);
    expect(S.latestCheckpoint(ctx.store, parts.id)!.sweep).toBe(13);
    let resumedFrom: number | null = null;
    const second = await runFitJob({ store: ctx.store, runId: parts.id, onStart: (s) => (resumedFrom = s) });
    expect(second.stopped).toBe(false);
    expect(resumedFrom).toBe(13);
    const a = loadRunModel(ctx.store, whole.id)!;
    const b = loadRunModel(ctx.store, parts.id)!;
    expect([...b.thetaGroups]).toEqual([...a.thetaGroups]);
    expect([...b.phi[0]]).toEqual([...a.phi[0]]);
    expect(b.diagnostics.trace).toEqual(a.diagnostics.trace);
    expect(S.latestCheckpoint(ctx.store, parts.id)).toBeUndefined(); // cleared once finished
  });

  // A crash (no checkpoint at the moment of death) after the hyperparameters were re-estimated:
  // the run resumes from the last periodic checkpoint and still ends bit-identical. This caught
  // the fast sampler's history-dependent ordering of tied word-topic counts.
  it('resumed after a crash between checkpoints, the fast sampler ends exactly as an uninterrupted run', async () => {
    const studyId = syntheticStudy(ctx.store, { documents: 3000, seed: 5 });
    const request = { themes: 5, sweeps: 100, burnIn: 30, seed: 11, threads: 1, covariates: ['region'], checkpointEvery: 5, sampler: 'fast' as const };
    const whole = createFitRun(ctx.store, studyId, { ...request, name: 'crash-whole' });
    await runFitJob({ store: ctx.store, runId: whole.id });
    const parts = createFitRun(ctx.store, studyId, { ...request, name: 'crash-parts' });
    let sweep = 0;
    const crash = runFitJob({
      store: ctx.store,
      runId: parts.id,
      onProgress: (p) => {
        sweep = p.sweep ?? sweep;
        if (sweep >= 58) throw new Error('simulated crash');
      },
    });
    await expect(crash).rejects.toThrow('simulated crash');
    S.setRunStatus(ctx.store, parts.id, 'interrupted');
    expect(S.latestCheckpoint(ctx.store, parts.id)!.sweep).toBe(55);
    await runFitJob({ store: ctx.store, runId: parts.id });
    const a = loadRunModel(ctx.store, whole.id)!;
    const b = loadRunModel(ctx.store, parts.id)!;
    expect(b.diagnostics.trace).toEqual(a.diagnostics.trace);
    expect([...b.thetaGroups]).toEqual([...a.thetaGroups]);
  });

  it('refuses bad settings with InputErrors a researcher can act on', () => {
    const studyId = syntheticStudy(ctx.store, { documents: 20 });
    expect(() => createFitRun(ctx.store, studyId, { themes: 1 })).toThrow(InputError);
    expect(() => createFitRun(ctx.store, studyId, { themes: 3, sweeps: 10, burnIn: 10 })).toThrow(/burn-in/);
    expect(() => createFitRun(ctx.store, studyId, { themes: 3, covariates: ['colour'] })).toThrow(/Known covariates: region/);
    expect(() => createFitRun(ctx.store, 'Nope', { themes: 3 })).toThrow(/no study called "Nope"/);
  });
});
