// XLSX workbook → header + rows of one sheet, read with exceljs after the zip guard.
//
// The first non-empty row of the sheet is the header. Cells become the text a person sees:
// rich text is joined, formulas give their cached result, dates become ISO 8601 dates
// ("Date and time format", ISO 8601-1:2019), numbers are shown with 15 significant digits as
// spreadsheet programs display them (IEEE 754 binary64 holds 15–17; 15 avoids 0.30000000000000004),
// error values (#N/A, #DIV/0!) become missing. Cells to the right of the header get generated
// column names (`column_N`), as empty header cells do (column-names.ts).

import type ExcelJSModule from 'exceljs';
import { InputError } from '../types.js';
import { uniqueColumnNames } from './column-names.js';
import { checkCell, checkColumnCount, checkHeader, clip, INPUT_LIMITS, listNames, type InputLimits } from './input-limits.js';
import { guardZip } from './zip-guard.js';

export interface XlsxResult {
  readonly columns: string[];
  readonly rows: string[][];
  readonly sheet: string;
  readonly sheets: string[];
}

export interface XlsxLimits {
  readonly maxRows: number;
  readonly maxUnpackedBytes: number;
}

export async function readXlsx(
  buf: Buffer,
  fileName: string,
  sheetName: string | undefined,
  limits: XlsxLimits,
  input: InputLimits = INPUT_LIMITS,
): Promise<XlsxResult> {
  guardZip(buf, fileName, limits.maxUnpackedBytes, limits.maxRows);
  // Loaded on first use: exceljs takes about a second to load, and most imports are CSV.
  const ExcelJS = ((await import('exceljs')) as unknown as { default: typeof ExcelJSModule }).default;
  const workbook = new ExcelJS.Workbook();
  try {
    // exceljs's typings predate Node's generic Buffer<ArrayBufferLike>.
    await workbook.xlsx.load(buf as unknown as ArrayBuffer);
  } catch (err) {
    throw new InputError(
      `${fileName}: the file could not be read as an XLSX workbook (${clip(String((err as Error)?.message ?? err), 200)}). ` +
        'Open it in a spreadsheet program, save it as .xlsx (or CSV UTF-8) and import it again.',
      fileName,
    );
  }
  const sheets = workbook.worksheets.map((ws) => ws.name);
  if (sheets.length === 0) throw new InputError(`${fileName}: the workbook has no worksheets.`, fileName);
  const worksheet =
    sheetName === undefined ? workbook.worksheets[0] : workbook.worksheets.find((ws) => ws.name === sheetName);
  if (worksheet === undefined) {
    throw new InputError(
      `${fileName}: there is no sheet named "${sheetName}". The sheets are: ${listNames(sheets)}.`,
      fileName,
    );
  }
  const name = worksheet.name;
  const last = worksheet.rowCount;
  if (last - 1 > limits.maxRows) {
    throw new InputError(
      `${fileName}: sheet "${name}" has ${last.toLocaleString('en')} rows, more than the limit of ` +
        `${limits.maxRows.toLocaleString('en')} for one import. Split the data into several files.`,
      fileName,
    );
  }
  // The sheet's used range is known before any row is read: refuse a sheet too wide to map.
  checkColumnCount(worksheet.columnCount, fileName, `sheet "${name}"`, input);
  const raw: string[][] = [];
  let width = 0;
  let headerRow = 0;
  for (let r = 1; r <= last; r++) {
    const cells: string[] = [];
    worksheet.getRow(r).eachCell({ includeEmpty: false }, (cell, col) => {
      const text = cellText(cell.value);
      if (text.length > input.maxCellChars) checkCell(text, fileName, headerRow ? r - headerRow : r, raw[headerRow - 1]?.[col - 1] ?? `column ${col}`, input);
      if (text !== '') {
        while (cells.length < col - 1) cells.push('');
        cells[col - 1] = text;
      }
    });
    raw.push(cells);
    if (headerRow === 0 && cells.length > 0) headerRow = r;
    if (cells.length > width) width = cells.length;
  }
  const headerIndex = raw.findIndex((cells) => cells.length > 0);
  if (headerIndex < 0) {
    throw new InputError(`${fileName}: sheet "${name}" is empty.`, fileName);
  }
  let end = raw.length;
  while (end > headerIndex + 1 && raw[end - 1].length === 0) end--;
  const header = pad(raw[headerIndex], width);
  checkHeader(header, fileName, input);
  const rows = raw.slice(headerIndex + 1, end).map((cells) => pad(cells, width));
  if (rows.length === 0) {
    throw new InputError(`${fileName}: sheet "${name}" has a header row but no data rows.`, fileName);
  }
  return { columns: uniqueColumnNames(header).columns, rows, sheet: name, sheets };
}

function pad(cells: string[], width: number): string[] {
  const out = cells.slice();
  while (out.length < width) out.push('');
  for (let i = 0; i < out.length; i++) if (out[i] === undefined) out[i] = '';
  return out;
}

/** The text a spreadsheet shows for a cell value (exceljs CellValue). */
export function cellText(value: unknown): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'string') return value;
  if (typeof value === 'number') return Number.isFinite(value) ? String(Number(value.toPrecision(15))) : '';
  if (typeof value === 'boolean') return value ? 'TRUE' : 'FALSE';
  if (value instanceof Date) return isoDate(value);
  if (typeof value === 'object') {
    const v = value as Record<string, unknown>;
    if (Array.isArray(v.richText)) {
      return v.richText.map((part) => (typeof part?.text === 'string' ? part.text : '')).join('');
    }
    if ('formula' in v || 'sharedFormula' in v) return cellText(v.result);
    if ('error' in v) return '';
    if (typeof v.text === 'string') return v.text; // hyperlink: {text, hyperlink}
    if (v.text !== undefined) return cellText(v.text);
  }
  return '';
}

function isoDate(d: Date): string {
  if (Number.isNaN(d.getTime())) return '';
  const iso = d.toISOString(); // exceljs gives spreadsheet dates as UTC instants
  if (iso.endsWith('T00:00:00.000Z')) return iso.slice(0, 10);
  return iso.slice(0, 19).replace('T', ' ');
}
