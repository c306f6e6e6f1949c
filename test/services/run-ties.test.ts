// How the languages were tied when a run was fitted is stored with its summaries, so its pages
// warn about the run as it was fitted and need no pass over every answer (issue 15: a first visit
// after a restart at a million answers). Invented data (synthetic study).
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createFitRun, runFitJob, runTies } from '../../src/services/index.js';
import * as S from '../../src/store/index.js';
import { withTempStore } from '../store/helpers.js';
import { syntheticStudy } from './synthetic-study.js';

let ctx: ReturnType<typeof withTempStore>;
beforeEach(() => (ctx = withTempStore()));
afterEach(() => ctx.cleanup());

describe('the ties of a fitted run', () => {
  it('are stored at the fit and stay those of the fit when the study gains links afterwards', async () => {
    const studyId = syntheticStudy(ctx.store, { documents: 60 });
    const run = createFitRun(ctx.store, studyId, { themes: 2, sweeps: 6, burnIn: 2, holdout: 0 });
    await runFitJob({ store: ctx.store, runId: run.id });
    const atFit = S.linkSummary(ctx.store, studyId);
    expect(atFit.answerGroupsAcrossLanguages).toBeGreaterThan(0);
    expect(S.loadJsonResult(ctx.store, run.id, 'ties')).toEqual(atFit);
    // A later import with two more translated pairs: the study has more ties, the run does not.
    const imp = S.insertImport(ctx.store, { studyId, fileName: 'more.csv', format: 'csv', bytes: new Uint8Array([1]), encoding: 'UTF-8', mapping: { text: ['answer'], covariates: [] } });
    const docs = ['en', 'fr', 'en', 'fr'].map((language, i) => ({ rowId: `m${i}`, question: 'answer', text: `more ${i}`, language, languageSource: 'declared' as const, confidence: 1, linkKey: `M${i >> 1}`, covariates: {}, weight: 1 }));
    const ids = S.insertDocuments(ctx.store, studyId, imp, docs);
    S.setDocumentTokens(ctx.store, ids.map((id, i) => ({ id, vocabularyLanguage: docs[i].language, tokens: Int32Array.of(1, 2), excluded: null })));
    expect(S.linkSummary(ctx.store, studyId).answerGroupsAcrossLanguages).toBe(atFit.answerGroupsAcrossLanguages + 2);
    expect(runTies(ctx.store, S.getRun(ctx.store, run.id)!)).toEqual(atFit);
  });
});
