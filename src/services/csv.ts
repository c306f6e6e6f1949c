// Writing CSV files people open in spreadsheets: RFC 4180 quoting ("Common Format and MIME Type
// for Comma-Separated Values (CSV) Files", 2005, §2), CRLF line ends, UTF-8 with a byte-order
// mark so spreadsheet programs pick the right encoding, and a guard against formula injection:
// a cell that starts with =, +, -, @, tab or carriage return is prefixed with a single quote
// (OWASP, "CSV Injection", common practice) so it is shown as text and never evaluated.

const FORMULA_START = /^[=+\-@\t\r]/;

export type CsvCell = string | number | boolean | null | undefined;

/** Make one cell safe against formula injection (numbers are written as they are). */
export function guardCell(value: CsvCell): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  const text = String(value);
  return FORMULA_START.test(text) ? `'${text}` : text;
}

function quote(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** CSV text (no BOM) from a header and rows. */
export function toCsv(header: readonly string[], rows: Iterable<readonly CsvCell[]>): string {
  const lines = [header.map((h) => quote(guardCell(h))).join(',')];
  for (const row of rows) lines.push(row.map((c) => quote(guardCell(c))).join(','));
  return lines.join('\r\n') + '\r\n';
}

const BOM = new Uint8Array([0xef, 0xbb, 0xbf]);

/** UTF-8 bytes with a byte-order mark. */
export function csvBytes(header: readonly string[], rows: Iterable<readonly CsvCell[]>): Uint8Array {
  const body = new TextEncoder().encode(toCsv(header, rows));
  const out = new Uint8Array(BOM.length + body.length);
  out.set(BOM, 0);
  out.set(body, BOM.length);
  return out;
}

/** Round a share for a file: 6 decimals is below any visible difference (common practice). */
export function round6(x: number): number {
  return Math.round(x * 1e6) / 1e6;
}
