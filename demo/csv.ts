// CSV encoding of the demo rows: UTF-8 with a byte-order mark, fields per RFC 4180
// ("Common Format and MIME Type for Comma-Separated Values (CSV) Files", IETF 2005): CRLF line
// ends; a field with a comma, double quote, CR or LF is quoted and its quotes doubled.
import type { DemoRow } from './types.js';

export const DEMO_CSV_COLUMNS = [
  'answer_id', 'answer', 'questionnaire_language', 'link_key', 'branch_region', 'channel', 'age_band', 'wave', 'weight',
] as const satisfies readonly (keyof DemoRow)[];

export const UTF8_BOM = '\uFEFF';
const NEEDS_QUOTES = /[",\r\n]/;

export function csvField(value: string | number): string {
  const s = String(value);
  return NEEDS_QUOTES.test(s) ? `"${s.replaceAll('"', '""')}"` : s;
}

export function csvHeader(): string {
  return DEMO_CSV_COLUMNS.join(',') + '\r\n';
}

export function csvLine(row: DemoRow): string {
  return (
    csvField(row.answer_id) + ',' + csvField(row.answer) + ',' + row.questionnaire_language + ',' + row.link_key + ',' +
    csvField(row.branch_region) + ',' + row.channel + ',' + row.age_band + ',' + row.wave + ',' + String(row.weight) + '\r\n'
  );
}

/** The whole file as text (prepend nothing: the BOM is included). */
export function demoCsv(rows: readonly DemoRow[]): string {
  const parts = [UTF8_BOM, csvHeader()];
  for (const row of rows) parts.push(csvLine(row));
  return parts.join('');
}
