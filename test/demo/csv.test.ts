// The CSV follows RFC 4180 ("Common Format and MIME Type for Comma-Separated Values (CSV)
// Files", IETF 2005, section 2): read back with an independent parser it gives the rows again.
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { DEMO_CSV_COLUMNS, demoCsv, generateDemo } from '../../demo/index.js';
import { csvField } from '../../demo/csv.js';

describe('demo CSV encoding', () => {
  it('quotes commas, quotes and line breaks and doubles inner quotes (RFC 4180 §2 rules 5–7)', () => {
    expect(csvField('plain')).toBe('plain');
    expect(csvField('a, b')).toBe('"a, b"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('one\n\ntwo')).toBe('"one\n\ntwo"');
  });

  it('reads back to the same rows with csv-parse, including multi-line answers', () => {
    const { rows } = generateDemo({ answers: 4000, seed: 20251 });
    expect(rows.some((r) => r.answer.includes('\n'))).toBe(true);
    expect(rows.some((r) => r.answer.includes(','))).toBe(true);
    const records: string[][] = parse(demoCsv(rows), { bom: true, relax_column_count: false });
    expect(records[0]).toEqual([...DEMO_CSV_COLUMNS]);
    expect(records.length).toBe(rows.length + 1);
    expect(records.slice(1)).toEqual(rows.map((r) => DEMO_CSV_COLUMNS.map((c) => String(r[c]))));
  });
});
