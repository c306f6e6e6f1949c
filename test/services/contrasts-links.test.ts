// Linked answers (a respondent's answer and its translation) share one mixture: the group
// contrasts count a link group once per level and resample its answers together (cluster
// bootstrap, Davison & Hinkley, "Bootstrap Methods and their Application", 1997, §3.8).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runContrasts } from '../../src/services/contrasts.js';
import { createFitRun, runFitJob } from '../../src/services/fit-run.js';
import { loadRunModel, type RunModel } from '../../src/services/run-model.js';
import * as S from '../../src/store/index.js';
import { withTempStore } from '../store/helpers.js';
import { syntheticStudy } from './synthetic-study.js';

let ctx: ReturnType<typeof withTempStore>;
let model: RunModel;
let docs: S.DocumentRecord[];
beforeAll(async () => {
  ctx = withTempStore();
  const studyId = syntheticStudy(ctx.store, { documents: 120 });
  const run = createFitRun(ctx.store, studyId, { themes: 3, sweeps: 8, burnIn: 2, seed: 4 });
  await runFitJob({ store: ctx.store, runId: run.id });
  model = loadRunModel(ctx.store, run.id)!;
  docs = [...S.iterateDocuments(ctx.store, studyId)];
});
afterAll(() => ctx.cleanup());

/** Distinct respondents (link groups) per value of `f`, counting a group once per value. */
function respondents(f: (d: S.DocumentRecord) => string): Map<string, number> {
  const seen = new Map<string, Set<string>>();
  for (const d of docs) {
    const level = f(d);
    if (!seen.has(level)) seen.set(level, new Set());
    seen.get(level)!.add(d.linkKey ?? `#${d.id}`);
  }
  return new Map([...seen].map(([k, v]) => [k, v.size]));
}

function nByLevel(by: string): Map<string, number> {
  const res = runContrasts(ctx.store, model, { by, draws: 50 });
  return new Map(res.shares.filter((r) => r.theme === 0).map((r) => [r.level, r.n]));
}

describe('contrasts with linked translations', () => {
  it('the invented study has linked pairs', () => {
    expect(docs.filter((d) => d.linkKey !== null).length).toBe(24);
  });

  it('counts a link group once in its level, not once per answer', () => {
    expect(nByLevel('region')).toEqual(respondents((d) => String(d.covariates.region)));
  });

  it('counts a group once in each language its answers are written in', () => {
    expect(nByLevel('language')).toEqual(respondents((d) => d.language!));
  });

  it('resamples linked answers together and says so', () => {
    const res = runContrasts(ctx.store, model, { by: 'region', draws: 50 });
    expect(res.notes.join(' ')).toMatch(/cluster bootstrap/);
    expect(res.notes.join(' ')).toMatch(/Linked answers are one respondent.*12 linked answers/);
    // The linked answers not counted again are not reported as answers without a value.
    expect(res.notes.join(' ')).not.toMatch(/left out/);
    expect(res.excludedDocuments).toBe(0);
    expect(res.excludedDocuments).toBe(0);
  });
});
