import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { readTable } from '../../../src/text/import/index.js';
import { INPUT_LIMITS, listNames } from '../../../src/text/import/input-limits.js';
import { mapColumns } from '../../../src/text/import/map-columns.js';
import { firstRecordWidth } from '../../../src/text/import/read-delimited.js';
import { InputError, type Table } from '../../../src/text/types.js';
import { inputError, readText } from './helpers/read.js';

// Issue 14: a 1.9 MB header of 200,000 columns and a single 10 MB cell must be refused early,
// with messages that stay short and name the limit.
const wideHeader = (n: number) => Array.from({ length: n }, (_, i) => `c${i}`).join(',');

describe('input limits', () => {
  it('refuses a CSV header of 200,000 columns before parsing the rows, in a short message', async () => {
    const text = `${wideHeader(200_000)}\n${Array(200_000).fill('x').join(',')}\n`;
    const err = await inputError(readText(text, 'wide.csv'));
    expect(err.message).toContain('wide.csv: the header');
    expect(err.message).toContain('over the limit of 1,000 columns');
    expect(err.message.length).toBeLessThan(400);
  });

  it('accepts exactly the column limit and refuses one more', async () => {
    const ok = await readText(`${wideHeader(INPUT_LIMITS.maxColumns)}\n${Array(INPUT_LIMITS.maxColumns).fill('1').join(',')}\n`, 'ok.csv');
    expect(ok.columns).toHaveLength(INPUT_LIMITS.maxColumns);
    const err = await inputError(readText(`${wideHeader(INPUT_LIMITS.maxColumns + 1)}\n1\n`, 'one-more.csv'));
    expect(err.message).toContain('has 1,001 columns');
  });

  it('counts the header width with RFC 4180 quoting (delimiters and line breaks inside quotes do not count)', () => {
    expect(firstRecordWidth('a,"b,c",d\ne,f', ',', 1000)).toEqual({ width: 3, complete: true });
    expect(firstRecordWidth('\n\n"x\ny";z\n1;2', ';', 1000)).toEqual({ width: 2, complete: true });
    expect(firstRecordWidth('he said "no",b\n', ',', 1000)).toEqual({ width: 2, complete: true });
    expect(firstRecordWidth('a,b,c,d', ',', 3)).toEqual({ width: 2, complete: false });
  });

  it('refuses a 10 MB cell (a quote never closed) while reading, naming the row limit', async () => {
    const text = `id,answer\n1,"${'word '.repeat(2_000_000)}"\n2,fine\n`;
    const err = await inputError(readText(text, 'big.csv'));
    expect(err.message).toContain('holds more than 1,000,000 characters, the limit for one row');
    expect(err.message.length).toBeLessThan(400);
  });

  it('names the row and column of a cell over the cell limit', async () => {
    const text = `id,answer,note\n1,ok,fine\n2,ok,${'n'.repeat(INPUT_LIMITS.maxCellChars + 1)}\n`;
    const err = await inputError(readText(text, 'cell.csv'));
    expect(err.message).toBe(
      'cell.csv: data row 2, column "note" holds 100,001 characters, over the limit of 100,000 for one cell. Check the row for a quote that is not closed, or split the text.',
    );
    expect([err.row, err.column]).toEqual([2, 'note']);
  });

  it('refuses a column name over 200 characters', async () => {
    const err = await inputError(readText(`id,${'h'.repeat(300)}\n1,2\n`, 'name.csv'));
    expect(err.message).toContain('the name of column 2');
    expect(err.message).toContain('300 characters long, over the limit of 200');
  });

  it('refuses JSON Lines objects with more keys than the column limit, naming the line', async () => {
    const wide = Object.fromEntries(Array.from({ length: 1_500 }, (_, i) => [`k${i}`, i]));
    const err = await inputError(readText(`{"id":1}\n${JSON.stringify(wide)}\n`, 'wide.jsonl'));
    expect(err.message).toContain('wide.jsonl: line 2 (with the lines before it) has 1,501 columns, over the limit of 1,000');
  });

  it('refuses a JSON Lines value over the cell limit', async () => {
    const err = await inputError(readText(`{"id":1,"answer":"${'a'.repeat(INPUT_LIMITS.maxCellChars + 5)}"}\n`, 'long.jsonl'));
    expect(err.message).toContain('data row 1, column "answer" holds 100,005 characters');
  });

  it('refuses an XLSX sheet wider than the column limit from its used range', async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Wide');
    ws.addRow(Array.from({ length: 1_200 }, (_, i) => `c${i}`));
    ws.addRow([1]);
    const bytes = Buffer.from(await wb.xlsx.writeBuffer());
    const err = await inputError(readTable(bytes, 'wide.xlsx'));
    expect(err.message).toContain('wide.xlsx: sheet "Wide" has 1,200 columns, over the limit of 1,000');
  });

  it('lists at most a dozen sheet names when a sheet is missing', async () => {
    const wb = new ExcelJS.Workbook();
    for (let i = 0; i < 30; i++) wb.addWorksheet(`S${i}`).addRow(['a']);
    const err = await inputError(readTable(Buffer.from(await wb.xlsx.writeBuffer()), 'many.xlsx', { sheet: 'Nope' }));
    expect(err.message).toContain('"S11" … and 18 more.');
  });

  it('refuses an answer over the answer limit, naming row and column', () => {
    const table: Table = {
      fileName: 'a.csv',
      format: 'csv',
      columns: ['id', 'answer'],
      rows: [['1', 'short'], ['2', 'x'.repeat(INPUT_LIMITS.maxAnswerChars + 1)]],
      assumed: { encoding: 'UTF-8' },
    };
    let err: unknown;
    try {
      mapColumns(table, { id: 'id', text: ['answer'], covariates: [] });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).message).toContain('a.csv: data row 2, column "answer": the answer is 50,001 characters long, over the limit of 50,000');
  });

  it('names every missing mapped column at once, with a bounded list of the file\'s columns', () => {
    const columns = Array.from({ length: 900 }, (_, i) => `c${i}`);
    const table: Table = { fileName: 'w.csv', format: 'csv', columns, rows: [columns.map(() => 'v')], assumed: { encoding: 'UTF-8' } };
    let err: InputError | undefined;
    try {
      mapColumns(table, { text: ['answer'], language: 'lang', link: 'pair', covariates: [{ column: 'wave', type: 'categorical' }] });
    } catch (e) {
      err = e as InputError;
    }
    expect(err?.message).toContain('there are no columns "answer" (chosen as text column), "lang" (chosen as language column), "pair" (chosen as link column), "wave" (chosen as covariate column)');
    expect(err?.message).toContain('"c11" … and 888 more.');
    expect(err!.message.length).toBeLessThan(500);
  });

  it('clips long values in lists of names', () => {
    expect(listNames(['a'.repeat(100), 'b'], 1)).toBe(`"${'a'.repeat(59)}…" … and 1 more`);
  });
});
