// Apply matches new answers to the run's vocabulary as the study's pipeline did: adjacent words
// are joined where the run's vocabulary holds their collocation (text/vocabulary/encode.ts), so
// a study fitted with collocations codes next year's answers with the same word units.
// Invented study and file.
import { afterAll, describe, expect, it } from 'vitest';
import { applyRun } from '../../src/services/apply-run.js';
import { buildBundle } from '../../src/services/export-run.js';
import { createFitRun, runFitJob } from '../../src/services/fit-run.js';
import { loadRunModel } from '../../src/services/run-model.js';
import { withTempStore } from '../store/helpers.js';
import { syntheticStudy } from './synthetic-study.js';

const ctx = withTempStore();
afterAll(() => ctx.cleanup());

describe('Apply and collocations', () => {
  it('joins a pair of words into the collocation the run knows, so neither word counts as unknown', async () => {
    const studyId = syntheticStudy(ctx.store, { documents: 40 });
    const run = createFitRun(ctx.store, studyId, { themes: 2, sweeps: 4, burnIn: 1, seed: 2 });
    await runFitJob({ store: ctx.store, runId: run.id });
    const bundle = buildBundle(ctx.store, loadRunModel(ctx.store, run.id)!);
    const l = bundle.languages.indexOf('en');
    expect(l).toBeGreaterThanOrEqual(0);
    // The run's English vocabulary, as if the study had found the collocation "library card".
    const v = bundle.vocabularies[l];
    const withPair = { ...bundle, pipeline: { ...bundle.pipeline, collocationNpmi: 0.5 }, vocabularies: bundle.vocabularies.map((x, i) => (i === l ? { stems: [...v.stems.slice(0, -1), 'librari_card'], surfaces: [...v.surfaces.slice(0, -1), 'library card'] } : x)) };
    const csv = 'id,answer\nr1,library card library card\n';
    const mapping = { id: 'id', text: ['answer'], covariates: [] };
    const joined = await applyRun(withPair, { bytes: new TextEncoder().encode(csv), fileName: 'wave2.csv', mapping });
    expect(joined.summary.coded).toBe(1);
    expect(joined.summary.unknownWordShare).toBe(0);
    // Without the collocation in the vocabulary the same words are unknown to the run.
    const plain = await applyRun({ ...withPair, vocabularies: bundle.vocabularies }, { bytes: new TextEncoder().encode(csv), fileName: 'wave2.csv', mapping });
    expect(plain.summary.coded).toBe(0);
    expect(plain.summary.noKnownWords).toBe(1);
  });
});
