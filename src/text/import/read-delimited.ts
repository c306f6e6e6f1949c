// Delimited text (CSV, TSV, semicolon, pipe) → header + rows, parsed by csv-parse.
//
// Quoting follows "Common Format and MIME Type for CSV Files", RFC 4180 (2005), section 2:
// records end in CRLF (LF and CR alone are accepted too), fields may be enclosed in double
// quotes, and enclosed fields may hold delimiters, line breaks and doubled quotes. A quote in
// the middle of an unquoted field is kept as a literal character (csv-parse `relax_quotes`),
// because hand-made survey exports often contain `He said "no"` without quoting.

import { parse } from 'csv-parse/sync';
import { InputError } from '../types.js';
import { uniqueColumnNames } from './column-names.js';
import { checkCell, checkColumnCount, checkHeader, clip, INPUT_LIMITS, type InputLimits } from './input-limits.js';
import { sniffDelimiter, type Delimiter } from './sniff-delimiter.js';

export interface DelimitedResult {
  readonly columns: string[];
  readonly rows: string[][];
  readonly delimiter: Delimiter;
}

const DELIMITER_NAMES: Readonly<Record<Delimiter, string>> = {
  ',': 'comma',
  '\t': 'tab',
  ';': 'semicolon',
  '|': 'pipe',
};

export function describeDelimiter(d: Delimiter): string {
  return DELIMITER_NAMES[d];
}

interface CsvParseError extends Error {
  code?: string;
  lines?: number;
}

export function readDelimited(
  text: string,
  fileName: string,
  preferred: Delimiter,
  maxRows: number,
  limits: InputLimits = INPUT_LIMITS,
): DelimitedResult {
  // Spreadsheet programs write and honour a first line "sep=;" naming the delimiter.
  const hint = /^sep=([,;\t|])(\r\n|\n|\r)/.exec(text);
  if (hint) text = text.slice(hint[0].length);
  const delimiter = hint ? (hint[1] as Delimiter) : sniffDelimiter(text, preferred);
  // The header's width is counted before anything is parsed, so a file of 200,000 columns is
  // refused in one pass over its first line.
  const first = firstRecordWidth(text, delimiter, limits.maxRowChars);
  checkColumnCount(first.width, fileName, first.complete ? 'the header' : `the header (in its first ${limits.maxRowChars.toLocaleString('en')} characters)`, limits);
  let records: string[][];
  let header: string[] | null = null;
  let dataRow = 0;
  try {
    records = parse(text, {
      // Each record is checked as soon as it is read: the header's names, every cell's length,
      // and extra empty cells dropped at once (a row of 100,000 trailing commas costs nothing).
      on_record: (record: string[]) => {
        if (header === null) {
          checkHeader(record, fileName, limits);
          header = record;
          return record;
        }
        dataRow++;
        let row = record;
        if (row.length > header.length && row.length > limits.maxColumns) {
          let end = row.length;
          while (end > header.length && row[end - 1].trim() === '') end--;
          row = row.slice(0, end);
          checkColumnCount(row.length, fileName, `data row ${dataRow.toLocaleString('en')}`, limits);
        }
        for (let j = 0; j < row.length; j++) if (row[j].length > limits.maxCellChars) checkCell(row[j], fileName, dataRow, header[j] ?? `column ${j + 1}`, limits);
        return row;
      },
      max_record_size: limits.maxRowChars,
      delimiter,
      quote: '"',
      escape: '"',
      relax_quotes: true,
      relax_column_count: true,
      skip_empty_lines: true,
      // Stop early: one header plus one record past the limit is enough to refuse the file.
      to: maxRows + 2,
    }) as string[][];
  } catch (err) {
    if (err instanceof InputError) throw err;
    throw csvError(err as CsvParseError, fileName, limits);
  }
  if (records.length === 0) {
    throw new InputError(`${fileName}: the file has no rows (it is empty or blank).`, fileName);
  }
  const { columns } = uniqueColumnNames(records[0]);
  const rows = records.slice(1);
  if (rows.length === 0) {
    throw new InputError(
      `${fileName}: the file has a header row (${columns.length} columns) but no data rows.`,
      fileName,
    );
  }
  if (rows.length > maxRows) {
    throw new InputError(
      `${fileName}: the file has more than ${maxRows.toLocaleString('en')} data rows, the limit ` +
        'for one import. Split it into several files and import each.',
      fileName,
      maxRows + 1,
    );
  }
  const width = columns.length;
  for (let r = 0; r < rows.length; r++) {
    const row = rows[r];
    if (row.length === width) continue;
    // Trailing empty cells (a trailing delimiter, common in spreadsheet exports) are harmless.
    if (row.length > width && row.slice(width).every((cell) => cell.trim() === '')) {
      rows[r] = row.slice(0, width);
      continue;
    }
    throw new InputError(
      `${fileName}: data row ${r + 1} has ${row.length} cell${row.length === 1 ? '' : 's'} but the ` +
        `header has ${width} (${describeDelimiter(delimiter)}-separated). Check that row for a ` +
        'missing or extra delimiter, or a quote that is not closed.',
      fileName,
      r + 1,
      row.length > width ? undefined : columns[row.length],
    );
  }
  return { columns, rows, delimiter };
}

function csvError(err: CsvParseError, fileName: string, limits: InputLimits): InputError {
  const line = typeof err.lines === 'number' ? err.lines : undefined;
  const where = line === undefined ? '' : ` near line ${line}`;
  if (err.code === 'CSV_MAX_RECORD_SIZE') {
    return new InputError(
      `${fileName}: a row${where} holds more than ${limits.maxRowChars.toLocaleString('en')} characters, the limit for one row ` +
        `(and ${limits.maxCellChars.toLocaleString('en')} for one cell). Usually a double quote (") opens a cell and is never ` +
        'closed, so the rest of the file is read as one cell: add the missing quote.',
      fileName,
    );
  }
  if (err.code === 'CSV_QUOTE_NOT_CLOSED') {
    return new InputError(
      `${fileName}: a quoted cell is never closed${where}: a double quote (") opens it but no ` +
        'closing quote follows before the end of the file. Add the missing quote.',
      fileName,
    );
  }
  if (err.code === 'CSV_INVALID_CLOSING_QUOTE') {
    return new InputError(
      `${fileName}: text follows a closing double quote${where}. Inside a quoted cell, write a ` +
        'quote as two quotes ("").',
      fileName,
    );
  }
  return new InputError(`${fileName}: the file could not be read as delimited text${where} (${clip(String(err.message), 200)}).`, fileName);
}

/**
 * Cells in the first record (RFC 4180 quoting: delimiters and line breaks inside quotes do not
 * count), looking at no more than `maxChars` characters.
 */
export function firstRecordWidth(text: string, delimiter: string, maxChars: number): { width: number; complete: boolean } {
  const end = Math.min(text.length, maxChars);
  const d = delimiter.charCodeAt(0);
  let i = 0;
  // Blank lines before the header are skipped by the parser too.
  while (i < end && /\s/.test(text[i])) i++;
  let width = 1;
  let fieldStart = true;
  for (; i < end; i++) {
    const ch = text.charCodeAt(i);
    if (fieldStart && ch === 34) {
      // Quoted field (it may hold delimiters and line breaks); "" is a literal quote. A quote
      // inside an unquoted field is literal (relax_quotes, as the parser reads it).
      for (i++; i < end; i++) {
        if (text.charCodeAt(i) === 34) {
          if (text.charCodeAt(i + 1) === 34) i++;
          else break;
        }
      }
      fieldStart = false;
    } else if (ch === d) {
      width++;
      fieldStart = true;
    } else if (ch === 10 || ch === 13) return { width, complete: true };
    else fieldStart = false;
  }
  return { width, complete: end === text.length };
}
