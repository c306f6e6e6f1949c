import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createFitRun, importFile, loadRunModel, prepareCorpus, runFitJob } from '../../src/services/index.js';
import { getRun } from '../../src/store/index.js';
import { withTempStore } from '../store/helpers.js';

let ctx: ReturnType<typeof withTempStore>;
beforeEach(() => (ctx = withTempStore()));
afterEach(() => ctx.cleanup());

// Invented answers: "taxi" and "wifi" are spelled the same in English and Spanish.
const rows = [
  ['1', 'en', 'the taxi was late and the taxi driver was rude'],
  ['2', 'en', 'no wifi in the reading room, wifi keeps dropping'],
  ['3', 'en', 'taxi rank outside is handy'],
  ['4', 'en', 'wifi password at the desk'],
  ['5', 'es', 'el taxi llegó tarde, otro taxi nunca vino'],
  ['6', 'es', 'no hay wifi en la sala, el wifi falla'],
  ['7', 'es', 'la parada de taxi está cerca'],
  ['8', 'es', 'la clave del wifi en el mostrador'],
];

describe('words spelled the same in two languages', () => {
  it('are fitted as extra link groups that the stored results leave out', async () => {
    const csv = ['id,lang,text', ...rows.map(([id, lang, text]) => `${id},${lang},"${text}"`)].join('\n');
    const summary = await importFile(ctx.store, {
      study: 'spellings',
      bytes: new TextEncoder().encode(csv),
      fileName: 'a.csv',
      mapping: { id: 'id', text: ['text'], language: 'lang', covariates: [] },
    });
    const run = createFitRun(ctx.store, summary.studyId, { themes: 2, sweeps: 30, seed: 3 });
    const prepared = prepareCorpus(ctx.store, getRun(ctx.store, run.id)!);
    expect(prepared.sharedSpellings).toBe(2); // taxi, wifi
    expect(prepared.fitCorpus.numGroups).toBeGreaterThan(prepared.corpus.numGroups);
    // The answers come first in the fitted corpus, unchanged.
    expect(Array.from(prepared.fitCorpus.docGroup.subarray(0, prepared.corpus.docGroup.length))).toEqual(Array.from(prepared.corpus.docGroup));
    await runFitJob({ store: ctx.store, runId: run.id });
    const model = loadRunModel(ctx.store, run.id)!;
    expect(model.documentIds.length).toBe(8);
    expect(model.thetaGroups.length).toBe(prepared.corpus.numGroups * 2);
    for (const s of model.thetaSamples) expect(s.length).toBe(prepared.corpus.numGroups * 2);
    expect(model.diagnostics.tokens).toBe(prepared.corpus.words.length);
  });
});
