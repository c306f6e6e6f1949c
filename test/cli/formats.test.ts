// Importing every supported format through the command line: TSV, JSON Lines, XLSX (sheet
// choice) and SPSS .sav (value labels become region names). Files are made here from the
// invented survey of test/services/survey-fixture.ts.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openStore, covariateLevels, getStudyByName, listImports } from '../../src/store/index.js';
import { tempDir } from '../store/helpers.js';
import { FIXTURE_FLAGS, REGIONS, surveyCsv, surveyJsonl, surveyRows } from '../services/survey-fixture.js';
import { writeSav } from '../text/import/helpers/sav-writer.js';
import { cli } from './cli-harness.js';

const rows = surveyRows(40);
let t: ReturnType<typeof tempDir>;
let data: string;

beforeAll(async () => {
  t = tempDir('themata-formats-');
  data = join(t.dir, 'data');
  writeFileSync(join(t.dir, 'survey.tsv'), surveyCsv(rows, '\t'));
  writeFileSync(join(t.dir, 'survey.jsonl'), surveyJsonl(rows));
  const wb = new ExcelJS.Workbook();
  wb.addWorksheet('Notes').addRow(['nothing to see']);
  const ws = wb.addWorksheet('Answers');
  const header = ['id', 'answer', 'lang', 'link', 'region', 'age', 'weight'] as const;
  ws.addRow([...header]);
  for (const r of rows) ws.addRow([r.id, r.answer, r.lang, r.link, r.region, Number(r.age), Number(r.weight)]);
  writeFileSync(join(t.dir, 'survey.xlsx'), Buffer.from(await wb.xlsx.writeBuffer()));
  const sav = writeSav(
    [
      { name: 'id', type: 'string', width: 8 },
      { name: 'answer', type: 'string', width: 200 },
      { name: 'lang', type: 'string', width: 2 },
      { name: 'link', type: 'string', width: 8 },
      { name: 'region', type: 'numeric', valueLabels: REGIONS.map((label, i) => ({ value: i + 1, label })) },
      { name: 'age', type: 'numeric' },
      { name: 'weight', type: 'numeric' },
    ],
    rows.map((r) => [r.id, r.answer, r.lang, r.link, REGIONS.indexOf(r.region) + 1, Number(r.age), Number(r.weight)]),
  );
  writeFileSync(join(t.dir, 'survey.sav'), sav);
});
afterAll(() => t.cleanup());

describe('import through the command line', () => {
  for (const [file, format, extra] of [
    ['survey.tsv', 'TSV', []],
    ['survey.jsonl', 'JSONL', []],
    ['survey.xlsx', 'XLSX', ['--sheet', 'Answers']],
    ['survey.sav', 'SAV', []],
  ] as const) {
    it(`reads ${format}`, async () => {
      const study = `From ${format}`;
      const r = await cli(['--data', data, 'import', join(t.dir, file), '--study', study, '--languages', 'en,es', ...FIXTURE_FLAGS, ...extra]);
      expect(r.stderr).toBe('');
      expect(r.code).toBe(0);
      expect(r.stdout).toContain(`Read as ${format}`);
      expect(r.stdout).toContain(`${rows.length} rows, ${rows.length} answers`);
      const store = openStore(data);
      try {
        const s = getStudyByName(store, study)!;
        expect(listImports(store, s.id)[0].format).toBe(format.toLowerCase());
        // Value labels (SAV) and plain text cells agree on the region names.
        expect(covariateLevels(store, s.id).region.values.sort()).toEqual([...REGIONS].sort());
        expect(covariateLevels(store, s.id).age.numeric).toBe(true);
      } finally {
        store.close();
      }
    });
  }

  it('names the sheet choices when the asked sheet is missing', async () => {
    const r = await cli(['--data', data, 'import', join(t.dir, 'survey.xlsx'), '--study', 'X', '--sheet', 'Nope', ...FIXTURE_FLAGS]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/Answers/);
  });
});
