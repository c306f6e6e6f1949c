import { describe, expect, it } from 'vitest';
import { inputError, readText } from './helpers/read.js';

// "Common Format and MIME Type for Comma-Separated Values (CSV) Files", RFC 4180 (2005),
// section 2, rules 1–7. Themata always treats the first record as the header (rule 3 makes the
// header optional; a survey export always has one), so each example's first record is the header.
describe('RFC 4180 section 2 examples', () => {
  it('rule 1: records are separated by CRLF', async () => {
    const t = await readText('aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n');
    expect(t.columns).toEqual(['aaa', 'bbb', 'ccc']);
    expect(t.rows).toEqual([['zzz', 'yyy', 'xxx']]);
  });

  it('rule 2: the last record may lack a line break', async () => {
    const t = await readText('aaa,bbb,ccc\r\nzzz,yyy,xxx');
    expect(t.rows).toEqual([['zzz', 'yyy', 'xxx']]);
  });

  it('rule 3: a header line with the same number of fields; repeated names get a suffix', async () => {
    const t = await readText('field_name,field_name,field_name\r\naaa,bbb,ccc\r\nzzz,yyy,xxx\r\n');
    expect(t.columns).toEqual(['field_name', 'field_name_2', 'field_name_3']);
    expect(t.rows).toEqual([
      ['aaa', 'bbb', 'ccc'],
      ['zzz', 'yyy', 'xxx'],
    ]);
  });

  it('rule 4: spaces are part of a field', async () => {
    const t = await readText('a,b\r\n aaa , bbb \r\n');
    expect(t.rows).toEqual([[' aaa ', ' bbb ']]);
  });

  it('rule 5: fields may be enclosed in double quotes', async () => {
    const t = await readText('h1,h2,h3\r\n"aaa","bbb","ccc"\r\nzzz,yyy,xxx');
    expect(t.rows).toEqual([
      ['aaa', 'bbb', 'ccc'],
      ['zzz', 'yyy', 'xxx'],
    ]);
  });

  it('rule 6: quoted fields may hold CRLF line breaks and commas', async () => {
    const t = await readText('h1,h2,h3\r\n"aaa","b\r\nbb","ccc"\r\nzzz,"y,y",xxx\r\n');
    expect(t.rows).toEqual([
      ['aaa', 'b\r\nbb', 'ccc'],
      ['zzz', 'y,y', 'xxx'],
    ]);
  });

  it('rule 7: a double quote inside a quoted field is written twice', async () => {
    const t = await readText('h1,h2,h3\r\n"aaa","b""bb","ccc"\r\n');
    expect(t.rows).toEqual([['aaa', 'b"bb', 'ccc']]);
  });
});

describe('delimiter sniffing', () => {
  it.each([
    [';', 'id;answer;region\n1;Bien, merci;Sud\n2;"Pas mal; sauf le prix";Nord\n'],
    ['\t', 'id\tanswer\tregion\n1\tGood, thanks\tNorth\n2\tOk; fine\tSouth\n'],
    ['|', 'id|answer|region\n1|Good, thanks; really|North\n2|Fine|South\n'],
    [',', 'id,answer,region\n1,"Good; thanks | ok",North\n2,Fine,South\n'],
  ])('finds %j even when other candidate delimiters occur inside cells', async (delimiter, text) => {
    const t = await readText(text);
    expect(t.assumed.delimiter).toBe(delimiter);
    expect(t.columns).toEqual(['id', 'answer', 'region']);
    expect(t.rows.every((r) => r.length === 3)).toBe(true);
    expect(t.format).toBe(delimiter === '\t' ? 'tsv' : 'csv');
  });

  it('honours a spreadsheet "sep=" first line', async () => {
    const t = await readText('sep=;\r\nid;answer\r\n1;"a, b"\r\n');
    expect(t.assumed.delimiter).toBe(';');
    expect(t.columns).toEqual(['id', 'answer']);
    expect(t.rows).toEqual([['1', 'a, b']]);
  });

  it('reads a file of unknown extension as delimited text unless its first line is JSON', async () => {
    const t = await readText('{id},answer\n1,fine\n', 'export.txt');
    expect(t.format).toBe('csv');
    expect(t.columns).toEqual(['{id}', 'answer']);
  });

  it('reads a one-column file as one column', async () => {
    const t = await readText('answer\nGood service\nToo slow\n');
    expect(t.columns).toEqual(['answer']);
    expect(t.rows).toEqual([['Good service'], ['Too slow']]);
  });

  it('accepts LF and lone CR line endings', async () => {
    expect((await readText('a,b\n1,2\n3,4')).rows).toEqual([['1', '2'], ['3', '4']]);
    expect((await readText('a,b\r1,2\r3,4\r')).rows).toEqual([['1', '2'], ['3', '4']]);
  });

  it('keeps a stray quote inside an unquoted field as text', async () => {
    const t = await readText('id,answer\n1,He said "no" twice\n');
    expect(t.rows).toEqual([['1', 'He said "no" twice']]);
  });

  it('drops trailing empty cells left by a trailing delimiter', async () => {
    const t = await readText('id,answer\n1,ok,\n2,fine,,\n');
    expect(t.rows).toEqual([['1', 'ok'], ['2', 'fine']]);
  });
});

describe('delimited input errors', () => {
  it('names the data row and the cell counts of a ragged row', async () => {
    const err = await inputError(readText('id,answer,region\n1,fine,North\n2,too short\n3,ok,South\n', 'wave2.csv'));
    expect(err.message).toContain('wave2.csv');
    expect(err.message).toContain('data row 2 has 2 cells but the header has 3');
    expect(err.row).toBe(2);
    expect(err.column).toBe('region');
  });

  it('refuses a row with extra non-empty cells', async () => {
    const err = await inputError(readText('id,answer\n1,fine\n2,good,extra\n'));
    expect(err.message).toContain('data row 2 has 3 cells but the header has 2');
  });

  it('refuses an empty file, a blank file and a header-only file', async () => {
    expect((await inputError(readText(''))).message).toContain('empty');
    expect((await inputError(readText('\n\n  \n'))).message).toContain('blank');
    expect((await inputError(readText('id,answer\n'))).message).toContain('no data rows');
  });

  it('names an unclosed quote', async () => {
    const err = await inputError(readText('id,answer\n1,"never closed\n2,ok\n'));
    expect(err.message).toMatch(/quoted cell is never closed/);
  });

  it('names empty header cells column_N', async () => {
    const t = await readText('id,,answer\n1,x,y\n');
    expect(t.columns).toEqual(['id', 'column_2', 'answer']);
  });

  it('refuses a file over maxBytes and says the limit', async () => {
    const err = await inputError(readText('id,answer\n1,' + 'x'.repeat(2000) + '\n', 'big.csv', { maxBytes: 1024 }));
    expect(err.message).toContain('over the limit of 1 KB');
  });

  it('refuses more rows than maxRows', async () => {
    const text = 'id,answer\n' + Array.from({ length: 11 }, (_, i) => `${i},a`).join('\n');
    const err = await inputError(readText(text, 'many.csv', { maxRows: 10 }));
    expect(err.message).toContain('more than 10 data rows');
    await expect(readText(text, 'many.csv', { maxRows: 11 })).resolves.toBeDefined();
  });
});
