// answers-by-theme.csv carries the original id and metadata columns under the names they have in
// the researcher's file (docs/design.md §8), in Export and in Apply. Invented study and file.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { applyRun } from '../../src/services/apply-run.js';
import { buildBundle, exportRun, studyIdColumn } from '../../src/services/export-run.js';
import { createFitRun, runFitJob } from '../../src/services/index.js';
import { loadRunModel, type RunModel } from '../../src/services/run-model.js';
import * as S from '../../src/store/index.js';
import { withTempStore } from '../store/helpers.js';
import { syntheticStudy } from './synthetic-study.js';

const ID = 'Respondent Nr. "A"';
let ctx: ReturnType<typeof withTempStore>;
let model: RunModel;
let studyId: number;
beforeAll(async () => {
  ctx = withTempStore();
  studyId = syntheticStudy(ctx.store, { documents: 40 });
  // The invented file's id column, as its import mapping records it.
  ctx.store.db.prepare('UPDATE imports SET mapping = ? WHERE study_id = ?').run(JSON.stringify({ id: ID, text: ['answer'], covariates: [{ column: 'region', type: 'categorical' }] }), studyId);
  const run = createFitRun(ctx.store, studyId, { themes: 3, sweeps: 6, burnIn: 2, seed: 4 });
  await runFitJob({ store: ctx.store, runId: run.id });
  model = loadRunModel(ctx.store, run.id)!;
});
afterAll(() => ctx.cleanup());

function header(bytes: Uint8Array): string {
  return new TextDecoder().decode(bytes.slice(3)).split(/\r?\n/)[0];
}

describe('answers-by-theme.csv column names', () => {
  it('names the id column as the imported file did', () => {
    expect(studyIdColumn(ctx.store, studyId)).toBe(ID);
    const file = exportRun(ctx.store, model, { draws: 20 }).find((f) => f.name === 'answers-by-theme.csv')!;
    // One text column: no question column; the answer text follows the id.
    expect(header(file.bytes)).toBe('"Respondent Nr. ""A""",answer,region,language,link key,weight,Theme 1,Theme 2,Theme 3,dominant theme,left out because');
  });

  it('Apply names the id and metadata columns as the new file does', async () => {
    const csv = 'Case number,answer,Zone\nc1,hello there,East\nc2,good words,West\n';
    const { file } = await applyRun(buildBundle(ctx.store, model), {
      bytes: new TextEncoder().encode(csv),
      fileName: 'wave2.csv',
      mapping: { id: 'Case number', text: ['answer'], covariates: [{ column: 'Zone', type: 'categorical' }] },
    });
    // The run has no covariates in its prior, so no coding note column.
    expect(header(file.bytes)).toBe('Case number,answer,Zone,language,link key,weight,Theme 1,Theme 2,Theme 3,dominant theme,left out because');
    expect(new TextDecoder().decode(file.bytes.slice(3)).split(/\r?\n/)[1]).toMatch(/^c1,hello there,East,/);
  });
});
