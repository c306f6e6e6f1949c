import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { readTable } from '../../../src/text/import/index.js';
import { inputError } from './helpers/read.js';
import { writeSav, type SavVariable } from './helpers/sav-writer.js';

const fixture = (name: string) => readFileSync(new URL(`../../fixtures/import/${name}`, import.meta.url));

// SPSS system files are written by the test-only writer, which follows the layout in the GNU
// PSPP manual, appendix "System File Format".

const VARS: SavVariable[] = [
  { name: 'RespondentId', type: 'numeric' },
  {
    name: 'région',
    type: 'numeric',
    valueLabels: [
      { value: 1, label: 'Nord' },
      { value: 2, label: 'Süd – Ost' },
      { value: 99, label: "Don't know" },
    ],
    missing: [98, 99],
  },
  { name: 'answer', type: 'string', width: 40, label: 'Open answer' },
  { name: 'sex', type: 'string', width: 1, valueLabels: [{ value: 'f', label: 'female' }, { value: 'm', label: 'male' }] },
  { name: 'score', type: 'numeric', missing: [-9] },
  { name: 'interviewed', type: 'numeric', format: 20 },
];

// 'aaaaaaaé': é is UTF-8 C3 A9 at bytes 7–8, across the first 8-byte string segment; '中' in
// 'bbbbbbb中' (E4 B8 AD) spans bytes 7–9. sav-reader on its own decodes each segment separately.
const ROWS = [
  [1, 1, 'aaaaaaaé 中文 naïve ☃ ok', 'f', 2.5, 13_797_216_000],
  [2, 2, 'plain', 'm', null, null],
  [3, 99, '', 'x', -9, 13_797_216_000 + 86_400],
  [4, 98, 'bbbbbbb中文', 'f', 1000.25, 13_797_216_000],
];

const EXPECTED = [
  ['1', 'Nord', 'aaaaaaaé 中文 naïve ☃ ok', 'female', '2.5', '2020-01-01'],
  ['2', 'Süd – Ost', 'plain', 'male', '', ''],
  ['3', "Don't know", '', 'x', '', '2020-01-02'],
  ['4', '', 'bbbbbbb中文', 'female', '1000.25', '2020-01-01'],
];

describe('SPSS .sav', () => {
  it('checks that the test strings really straddle 8-byte segments', () => {
    const a = Buffer.from('aaaaaaaé', 'utf8');
    expect(a.length).toBe(9); // é occupies bytes 8 and 9 (1-based): across the first boundary
    expect(Buffer.from('bbbbbbb中', 'utf8').length).toBe(10);
  });

  it.each([
    ['uncompressed', false],
    ['bytecode-compressed', true],
  ])('reads a %s file: labels, multi-byte text, missing values, dates', async (_, compressed) => {
    const t = await readTable(writeSav(VARS, ROWS, { compressed }), 'wave1.sav');
    expect(t.format).toBe('sav');
    expect(t.columns).toEqual(['RespondentId', 'région', 'answer', 'sex', 'score', 'interviewed']);
    expect(t.rows).toEqual(EXPECTED);
    expect(t.labelledColumns).toEqual(['région', 'sex']);
    expect(t.assumed.encoding).toBe('UTF-8');
  });

  it('decodes a windows-1252 file by its encoding record', async () => {
    const vars: SavVariable[] = [
      { name: 'straße', type: 'string', width: 24 },
      { name: 'q', type: 'numeric', valueLabels: [{ value: 1, label: 'Größer' }] },
    ];
    const t = await readTable(writeSav(vars, [['Café für 3 €', 1]], { encoding: 'windows-1252' }), 'w.sav');
    expect(t.assumed.encoding).toBe('windows-1252');
    expect(t.columns).toEqual(['straße', 'q']);
    expect(t.rows).toEqual([['Café für 3 €', 'Größer']]);
  });

  it('falls back to windows-1252 for strings that are not UTF-8 when the encoding record is missing', async () => {
    const vars: SavVariable[] = [{ name: 'answer', type: 'string', width: 16 }];
    const t = await readTable(writeSav(vars, [['Café €']], { encoding: 'windows-1252', omitEncodingRecord: true }), 'old.sav');
    expect(t.rows).toEqual([['Café €']]);
    expect(t.assumed).toEqual({ encoding: 'windows-1252', encodingConfidence: 0.5 });
  });

  it('reads the committed fixture with UTF-8 text across segments', async () => {
    const t = await readTable(fixture('survey-labels.sav'), 'survey-labels.sav');
    expect(t.rows).toEqual([
      ['1', 'Nord', 'Straße war sauber, Café gut'],
      ['2', 'Süd', '这个服务非常好，我很满意'],
      ['3', '', 'Très bien ☃'],
    ]);
    expect(t.labelledColumns).toEqual(['region']);
  });

  // Files written by GNU PSPP 1.6.2 from test/fixtures/import/pspp-survey.sps (an outside writer).
  // Expected values: the syntax file's data, as `pspp-convert --labels` prints them.
  it.each(['pspp-survey.sav', 'pspp-survey-uncompressed.sav'])('reads %s written by GNU PSPP', async (name) => {
    const t = await readTable(fixture(name), name);
    expect(t.columns).toEqual(['RespondentNumber', 'region', 'answer', 'lang', 'score', 'visited']);
    const long = 'xx' + Array(32).fill('Größe').join(' ') + ' Ende';
    expect(Buffer.byteLength(long)).toBeGreaterThan(255); // a "very long string": several 255-byte segments
    expect(t.rows).toEqual([
      ['1', 'Nord', 'Die Straße war sauber, der Kaffee gut.', 'Deutsch', '2.5', '2024-03-05'],
      ['2', 'Süd – Ost', '这个服务非常好，我很满意。', '中文', '', '2024-03-06'], // score -9 is user-missing
      ['3', 'Weiß nicht', long, 'fr', '4', '2024-03-07'],
      ['4', 'Nord', '', 'es', '', '2024-03-08'], // score is system-missing
    ]);
    expect(t.labelledColumns).toEqual(['region', 'lang']);
    expect(t.assumed.encoding).toBe('UTF-8');
  });

  it('says clearly that compressed .zsav files are not supported', async () => {
    const pspp = await inputError(readTable(fixture('pspp-survey.zsav'), 'pspp-survey.zsav'));
    expect(pspp.message).toContain('.zsav');
    const zsav = writeSav(VARS, ROWS);
    zsav.write('$FL3', 0, 'latin1');
    const err = await inputError(readTable(zsav, 'wave1.zsav'));
    expect(err.message).toContain('.zsav');
    expect(err.message).toMatch(/cannot read/);
  });

  it('refuses a truncated file with a message, not a crash', async () => {
    const whole = writeSav(VARS, ROWS);
    for (const cut of [10, 100, 300, whole.length - 500]) {
      const err = await inputError(readTable(whole.subarray(0, cut), 'cut.sav'));
      expect(err.message).toContain('cut.sav');
    }
  });

  it('refuses a file cut at a case boundary, which would otherwise lose cases silently', async () => {
    const whole = writeSav(VARS, ROWS); // uncompressed: 10 segments × 8 bytes per case
    const err = await inputError(readTable(whole.subarray(0, whole.length - 80), 'cut.sav'));
    expect(err.message).toContain('ends after 3 of its 4 cases');
  });

  it('refuses a file with variables but no cases', async () => {
    const err = await inputError(readTable(writeSav(VARS, []), 'empty.sav'));
    expect(err.message).toContain('no cases');
  });

  it('refuses more cases than maxRows', async () => {
    const err = await inputError(readTable(writeSav(VARS, ROWS), 'many.sav', { maxRows: 3 }));
    expect(err.message).toContain('more than 3 cases');
  });
});
