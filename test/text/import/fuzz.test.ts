import fc from 'fast-check';
import iconv from 'iconv-lite';
import { describe, expect, it } from 'vitest';
import { mapColumns, readTable } from '../../../src/text/import/index.js';
import { InputError, type ColumnMapping, type Table } from '../../../src/text/types.js';
import ExcelJS from 'exceljs';
import { writeSav } from './helpers/sav-writer.js';

// Property-based tests (fast-check 4): whatever the bytes, reading gives either a well-formed
// Table or an InputError — never another exception, never a ragged table.

async function outcome(bytes: Uint8Array, name: string): Promise<Table | InputError> {
  try {
    return await readTable(bytes, name, { maxRows: 10_000 });
  } catch (err) {
    if (err instanceof InputError) return err;
    throw err; // anything else fails the property
  }
}

function expectWellFormed(t: Table | InputError): void {
  if (t instanceof InputError) {
    expect(t.message.length).toBeGreaterThan(0);
    return;
  }
  expect(t.columns.length).toBeGreaterThan(0);
  expect(new Set(t.columns).size).toBe(t.columns.length);
  expect(t.rows.length).toBeGreaterThan(0);
  for (const row of t.rows) {
    expect(row).toHaveLength(t.columns.length);
    for (const cell of row) expect(typeof cell).toBe('string');
  }
}

const NAMES = ['a.csv', 'a.tsv', 'a.jsonl', 'a.json', 'a.txt', 'a.xlsx', 'a.sav', 'noext'];
const MAGIC = [[], [0x50, 0x4b, 0x03, 0x04], [0x24, 0x46, 0x4c, 0x32], [0xef, 0xbb, 0xbf], [0xff, 0xfe], [0x7b]];

describe('importer fuzzing', () => {
  it('random bytes give a Table or an InputError', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...MAGIC),
        fc.uint8Array({ maxLength: 600 }),
        fc.constantFrom(...NAMES),
        async (magic, body, name) => {
          expectWellFormed(await outcome(new Uint8Array([...magic, ...body]), name));
        },
      ),
      { numRuns: 300 },
    );
  });

  it('random text in random encodings gives a Table or an InputError', async () => {
    const encodings = ['utf8', 'windows-1252', 'iso-8859-2', 'koi8-r', 'windows-1251', 'shift_jis', 'gb18030', 'big5', 'utf16le', 'utf16be'];
    const char = fc.constantFrom(...'ab ,;\t|"\n\r{}[]:éßü€中文日本Жж☃0123456789'.split(''));
    await fc.assert(
      fc.asyncProperty(fc.string({ unit: char, maxLength: 300 }), fc.constantFrom(...encodings), fc.constantFrom(...NAMES), async (text, enc, name) => {
        expectWellFormed(await outcome(iconv.encode(text, enc), name));
      }),
      { numRuns: 200 },
    );
  });

  it('damaged XLSX and SAV files (bytes changed or cut) give a Table or an InputError', async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('S');
    ws.addRow(['id', 'answer']);
    for (let i = 0; i < 5; i++) ws.addRow([i, `answer ${i} — ünïcödé`]);
    const xlsx = Buffer.from(await wb.xlsx.writeBuffer());
    const savs = [false, true].map((compressed) =>
      writeSav(
        [
          { name: 'id', type: 'numeric' },
          { name: 'q', type: 'numeric', valueLabels: [{ value: 1, label: 'yes' }] },
          { name: 'answer', type: 'string', width: 20 },
        ],
        [[1, 1, 'hello wörld'], [2, null, 'ok'], [3, 2.5, '']],
        { compressed },
      ),
    );
    const damage = fc.record({
      file: fc.constantFrom(xlsx, ...savs),
      edits: fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), { maxLength: 6 }),
      cut: fc.option(fc.nat()),
    });
    await fc.assert(
      fc.asyncProperty(damage, async ({ file, edits, cut }) => {
        const bytes = Buffer.from(file);
        for (const [at, value] of edits) bytes[4 + (at % (bytes.length - 4))] = value;
        const input = cut === null ? bytes : bytes.subarray(0, 4 + (cut % (bytes.length - 4)));
        expectWellFormed(await outcome(input, file === xlsx ? 'd.xlsx' : 'd.sav'));
      }),
      { numRuns: 200 },
    );
  });

  // RFC 4180 (2005) section 2 as a generator: any table written with quoting where needed (and
  // sometimes where not), any delimiter, CRLF or LF, with or without a final line break, in
  // UTF-8 (with or without BOM) or UTF-16 with BOM, reads back exactly.
  it('random CSV shapes round-trip exactly', async () => {
    const cellChar = fc.constantFrom(...'ab xyZ09éß€中☃,;\t|"\n\r'.split(''));
    const shape = fc.integer({ min: 2, max: 5 }).chain((width) =>
      fc.record({
        header: fc
          .uniqueArray(fc.integer({ min: 0, max: 999 }), { minLength: width, maxLength: width })
          .map((ns) => ns.map((n) => `q${n}_${'abc'[n % 3]}`)),
        rows: fc.array(fc.array(fc.string({ unit: cellChar, maxLength: 12 }), { minLength: width, maxLength: width }), {
          minLength: 1,
          maxLength: 8,
        }),
        delimiter: fc.constantFrom(',', ';', '\t', '|'),
        newline: fc.constantFrom('\r\n', '\n'),
        finalNewline: fc.boolean(),
        quoteAll: fc.boolean(),
        encoding: fc.constantFrom('utf8', 'utf8-bom', 'utf16le-bom', 'utf16be-bom'),
      }),
    );
    await fc.assert(
      fc.asyncProperty(shape, async (s) => {
        const quote = (cell: string) =>
          s.quoteAll || /[,;\t|"\r\n]/.test(cell) ? `"${cell.replace(/"/g, '""')}"` : cell;
        const lines = [s.header, ...s.rows].map((r) => r.map(quote).join(s.delimiter));
        const text = lines.join(s.newline) + (s.finalNewline ? s.newline : '');
        const bytes =
          s.encoding === 'utf8'
            ? iconv.encode(text, 'utf8')
            : s.encoding === 'utf8-bom'
              ? iconv.encode(text, 'utf8', { addBOM: true })
              : iconv.encode(text, s.encoding === 'utf16le-bom' ? 'utf-16le' : 'utf-16be', { addBOM: true });
        const t = await readTable(bytes, 'shape.csv');
        expect(t.assumed.delimiter).toBe(s.delimiter);
        expect(t.columns).toEqual(s.header);
        expect(t.rows).toEqual(s.rows);
      }),
      { numRuns: 200 },
    );
  });

  it('random JSON Lines round-trip: columns are the union of keys in first-seen order', async () => {
    const key = fc.constantFrom('id', 'answer', 'lang', 'ünï', '中', 'a b', '"q"');
    const value = fc.oneof(fc.string({ maxLength: 10 }), fc.integer(), fc.boolean(), fc.constant(null));
    await fc.assert(
      fc.asyncProperty(fc.array(fc.dictionary(key, value, { minKeys: 1 }), { minLength: 1, maxLength: 6 }), fc.constantFrom('\n', '\r\n'), async (objects, nl) => {
        const t = await readTable(iconv.encode(objects.map((o) => JSON.stringify(o)).join(nl), 'utf8'), 'r.jsonl');
        const columns = [...new Set(objects.flatMap((o) => Object.keys(o)))];
        expect(t.columns).toEqual(columns);
        expect(t.rows).toEqual(objects.map((o) => columns.map((c) => (o[c] === null || o[c] === undefined ? '' : String(o[c])))));
      }),
      { numRuns: 150 },
    );
  });

  it('random mappings over random tables give documents or an InputError', () => {
    const cell = fc.oneof(fc.constantFrom('', ' ', 'en', 'fr-CA', 'Spanish', 'xx', '0', '-1', '2.5', '1,5', 'NaN', 'abc', 'x'), fc.string({ maxLength: 6 }));
    const arb = fc.integer({ min: 1, max: 4 }).chain((width) =>
      fc.record({
        rows: fc.array(fc.array(cell, { minLength: width, maxLength: width }), { minLength: 1, maxLength: 6 }),
        columns: fc.constant(Array.from({ length: width }, (_, i) => `c${i}`)),
        picks: fc.array(fc.integer({ min: 0, max: width }), { minLength: 6, maxLength: 6 }),
        numeric: fc.boolean(),
      }),
    );
    fc.assert(
      fc.property(arb, ({ rows, columns, picks, numeric }) => {
        const col = (i: number) => (i < columns.length ? columns[i] : 'missing');
        const table: Table = { fileName: 'f.csv', format: 'csv', columns, rows, assumed: { encoding: 'UTF-8' } };
        const mapping: ColumnMapping = {
          text: [col(picks[0])],
          ...(picks[1] % 2 ? { id: col(picks[1]) } : {}),
          ...(picks[2] % 2 ? { language: col(picks[2]) } : {}),
          ...(picks[3] % 2 ? { link: col(picks[3]) } : {}),
          ...(picks[4] % 2 ? { weight: col(picks[4]) } : {}),
          covariates: [{ column: col(picks[5]), type: numeric ? 'numeric' : 'categorical' }],
        };
        try {
          const docs = mapColumns(table, mapping, { languages: ['en', 'es', 'fr'] });
          for (const d of docs) {
            expect(d.text.trim()).not.toBe('');
            expect(d.weight > 0 && Number.isFinite(d.weight)).toBe(true);
          }
        } catch (err) {
          if (!(err instanceof InputError)) throw err;
        }
      }),
      { numRuns: 500 },
    );
  });
});
