// The export's tables as one XLSX workbook, one sheet per table, with the CSV files' guard
// against formula injection (csv.ts). Read back with exceljs (4.4.0, MIT), the library
// spreadsheet users' files are checked with elsewhere in Themata (read-xlsx.ts).
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { exportTables } from '../../src/services/export-run.js';
import { exportWorkbook, sheetName, tablesWorkbook, WORKBOOK_FILE } from '../../src/services/export-workbook.js';
import { createFitRun, importFile, loadRunModel, runFitJob } from '../../src/services/index.js';
import { withTempStore } from '../store/helpers.js';
import { FIXTURE_MAPPING, surveyCsv, surveyRows } from './survey-fixture.js';

async function read(bytes: Uint8Array): Promise<ExcelJS.Workbook> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(Buffer.from(bytes) as unknown as ArrayBuffer);
  return wb;
}

const values = (ws: ExcelJS.Worksheet, r: number) => (ws.getRow(r).values as unknown[]).slice(1);

describe('tables workbook', () => {
  it('writes one sheet per table, numbers as numbers, and guards text that would start a formula', async () => {
    const bytes = await tablesWorkbook([
      { sheet: 'answers by theme', header: ['id', 'answer', 'share'], rows: [['r1', '=HYPERLINK("http://x")', 0.25], ['r2', '+1', 1], ['r3', '@SUM(A1)', null], ['r4', '-2', 0], ['r5', '\tx', 0.5]] },
      { sheet: 'theme words', header: ['theme', 'word'], rows: [['Hours', 'open']] },
    ]);
    const wb = await read(bytes);
    expect(wb.worksheets.map((w) => w.name)).toEqual(['answers by theme', 'theme words']);
    const ws = wb.getWorksheet('answers by theme')!;
    expect(values(ws, 1)).toEqual(['id', 'answer', 'share']);
    expect(values(ws, 2)).toEqual(['r1', `'=HYPERLINK("http://x")`, 0.25]);
    expect(values(ws, 3)).toEqual(['r2', "'+1", 1]);
    expect(values(ws, 4).slice(0, 2)).toEqual(['r3', "'@SUM(A1)"]);
    expect(values(ws, 5)).toEqual(['r4', "'-2", 0]);
    expect(values(ws, 6)[1]).toBe("'\tx");
    // No cell of the file is a formula.
    ws.eachRow((row) => row.eachCell((cell) => expect(cell.type).not.toBe(ExcelJS.ValueType.Formula)));
  });

  it('continues a table longer than a sheet on the next sheet, with the header repeated', async () => {
    const rows = Array.from({ length: 7 }, (_, i) => [`r${i}`, i]);
    const wb = await read(await tablesWorkbook([{ sheet: 'answers by theme', header: ['id', 'n'], rows }], 4));
    expect(wb.worksheets.map((w) => [w.name, w.rowCount])).toEqual([
      ['answers by theme', 4],
      ['answers by theme (2)', 4],
      ['answers by theme (3)', 2],
    ]);
    expect(values(wb.worksheets[2], 1)).toEqual(['id', 'n']);
    expect(values(wb.worksheets[2], 2)).toEqual(['r6', 6]);
  });

  it('makes names Excel accepts for sheets', () => {
    expect(sheetName('shares: by group [all]/wave?')).toBe('shares  by group  all  wave');
    expect(sheetName('x'.repeat(40))).toHaveLength(31);
  });
});

describe('export workbook of a run', () => {
  const ctx = withTempStore();
  let runId = 0;
  beforeAll(async () => {
    const s = await importFile(ctx.store, { study: 'Library', bytes: new TextEncoder().encode(surveyCsv(surveyRows(60))), fileName: 'wave1.csv', mapping: FIXTURE_MAPPING, languages: ['en', 'es'] });
    const run = createFitRun(ctx.store, s.studyId, { themes: 3, sweeps: 10, burnIn: 2, seed: 5, covariates: ['region'] });
    await runFitJob({ store: ctx.store, runId: run.id });
    runId = run.id;
  });
  afterAll(() => ctx.cleanup());

  it('holds the same tables as the CSV files, one sheet each, with the guarded region levels', async () => {
    const tables = exportTables(ctx.store, loadRunModel(ctx.store, runId)!, { draws: 10 });
    const file = await exportWorkbook(tables);
    expect(file.name).toBe(WORKBOOK_FILE);
    const wb = await read(file.bytes);
    expect(wb.worksheets.map((w) => w.name)).toEqual(['themes', 'answers by theme', 'theme words', 'shares by group']);
    const answers = wb.getWorksheet('answers by theme')!;
    expect(answers.rowCount).toBe(tables.answers.rows.length + 1);
    expect(values(answers, 1)).toEqual(tables.answers.header);
    // The fixture's "=Coast" region is a formula in waiting: written as text with a quote.
    const region = tables.answers.header.indexOf('region') + 1;
    const regions = new Set<unknown>();
    answers.eachRow((row, r) => r > 1 && regions.add(row.getCell(region).value));
    expect(regions).toContain("'=Coast");
    expect(regions).not.toContain('=Coast');
    expect(wb.getWorksheet('shares by group')!.rowCount).toBe(tables.shares.rows.length + 1);
    expect(values(wb.getWorksheet('themes')!, 1).slice(0, 3)).toEqual(['theme', 'label', 'share']);
  });
});
