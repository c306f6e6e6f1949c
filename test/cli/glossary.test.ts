// `themata glossary`: imports a glossary (CSV, or XLSX with --sheet) into a study, prints rows and
// terms per language, lists a study's glossaries, exits 2 with one line on input errors, and is
// removed by remove-import like any file. Outside check: real five-language text from the
// `emojibase-data` package (MIT licence; messages.json `subgroups`, data.json `label`; see
// test/services/emojibase-glossary.ts).
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { getStudyByName, iterateDocuments, openStore } from '../../src/store/index.js';
import { EMOJIBASE_LOCALES, GLOSSARY_HEADERS, emojiAnswersCsv, subgroupGlossaryCsv, subgroupNames } from '../services/emojibase-glossary.js';
import { tempDir } from '../store/helpers.js';
import { cli } from './cli-harness.js';

let t: ReturnType<typeof tempDir>;
let data: string;
const file = (name: string) => join(t.dir, name);

function glossaryDocuments(): number {
  const store = openStore(data);
  try {
    return [...iterateDocuments(store, getStudyByName(store, 'Emoji')!.id, { kind: 'glossary' })].length;
  } finally {
    store.close();
  }
}

beforeAll(async () => {
  t = tempDir('themata-cli-glossary-');
  data = join(t.dir, 'data');
  writeFileSync(file('answers.csv'), emojiAnswersCsv(40));
  writeFileSync(file('subgroups.csv'), subgroupGlossaryCsv());
  writeFileSync(file('bad.csv'), 'en,es,comment\nred apple,manzana roja,fruit\n');
  writeFileSync(file('one-column.csv'), 'en\nred apple\n');
  // The same glossary as an Excel workbook, on its second sheet.
  const book = new ExcelJS.Workbook();
  book.addWorksheet('Notes').addRow(['terms from emojibase-data']);
  const sheet = book.addWorksheet('Terms');
  sheet.addRow(GLOSSARY_HEADERS);
  for (const s of subgroupNames().slice(0, 20)) sheet.addRow(EMOJIBASE_LOCALES.map((l) => s.names[l]));
  await book.xlsx.writeFile(file('subgroups.xlsx'));
  const imported = await cli(['--data', data, 'import', file('answers.csv'), '--study', 'Emoji', '--text', 'text', '--id', 'id', '--lang', 'lang']);
  expect(imported.code, imported.stderr).toBe(0);
});
afterAll(() => t.cleanup());

describe('themata glossary', () => {
  it('imports a CSV glossary and prints its rows and terms per language', async () => {
    const r = await cli(['--data', data, 'glossary', '--study', 'Emoji', file('subgroups.csv')]);
    expect(r.code, r.stderr).toBe(0);
    const rows = subgroupNames().length;
    expect(r.stdout).toContain(`Imported glossary subgroups.csv into study "Emoji"`);
    expect(r.stdout).toContain(`${rows} rows, ${rows} link groups`);
    expect(r.stdout).toContain('Columns: English = en, Español = es, français = fr, Deutsch = de, 日本語 = ja.');
    expect(r.stdout).toMatch(/Terms per language: en \d+, es \d+, fr \d+, de \d+, ja \d+\./);
    expect(glossaryDocuments()).toBe(rows * EMOJIBASE_LOCALES.length);
  });

  it('reads the sheet named by --sheet of an XLSX glossary', async () => {
    const r = await cli(['--data', data, 'glossary', '--study', 'Emoji', file('subgroups.xlsx'), '--sheet', 'Terms', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const summary = JSON.parse(r.stdout) as { format: string; sheet: string; linkGroups: number; termsPerLanguage: Record<string, number> };
    expect(summary).toMatchObject({ format: 'xlsx', sheet: 'Terms', linkGroups: 20 });
    expect(Object.keys(summary.termsPerLanguage).sort()).toEqual([...EMOJIBASE_LOCALES].sort());
  });

  it('lists the study\'s glossaries', async () => {
    const r = await cli(['--data', data, 'glossary', '--study', 'Emoji']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout.trim().split('\n')).toEqual([expect.stringMatching(/^\d+ subgroups\.csv: \d+ rows/), expect.stringMatching(/^\d+ subgroups\.xlsx: 20 rows/)]);
  });

  it('exits 2 with one line for columns that are not languages, one language column, or no such study', async () => {
    const before = glossaryDocuments();
    const bad = await cli(['--data', data, 'glossary', '--study', 'Emoji', file('bad.csv')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr.trim().split('\n')).toHaveLength(1);
    expect(bad.stderr).toMatch(/^themata: bad\.csv: "comment" is not a language\. .*study's languages \((en|es|fr|de|ja)(, (en|es|fr|de|ja)){4}\)/);
    const one = await cli(['--data', data, 'glossary', '--study', 'Emoji', file('one-column.csv')]);
    expect(one.code).toBe(2);
    expect(one.stderr).toContain('at least two language columns');
    const none = await cli(['--data', data, 'glossary', '--study', 'Nope', file('subgroups.csv')]);
    expect(none.code).toBe(2);
    expect(none.stderr).toContain('no study called "Nope"');
    expect(glossaryDocuments()).toBe(before);
  });

  it('is deleted by remove-import', async () => {
    const r = await cli(['--data', data, 'remove-import', '--study', 'Emoji', '--import', 'subgroups.xlsx', '--yes']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain('Deleted subgroups.xlsx');
    expect(glossaryDocuments()).toBe(subgroupNames().length * EMOJIBASE_LOCALES.length);
  });
});
