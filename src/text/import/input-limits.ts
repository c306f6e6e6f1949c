// Bounds on what one uploaded file may hold, so that no file can make a page, a message or the
// server's memory grow without limit (issue 14: a 1.9 MB header of 200,000 columns made a
// 127 MB page; one 10 MB cell took 780 MB to import). Each check runs as early as the reader
// allows (the header before the rows, a cell as soon as it is read) and fails with an
// InputError that names the file, the row or column, and the limit.
//
// The values are common practice for survey data, far above what a questionnaire holds: the
// widest exports seen in practice (one column per item and code) have a few hundred columns;
// the longest open answers (organisations' consultation responses) run to a few pages.

import { InputError } from '../types.js';

export interface InputLimits {
  /** Columns in one file. */
  readonly maxColumns: number;
  /** Characters in one cell of any column. */
  readonly maxCellChars: number;
  /** Characters in one column name (header cell). */
  readonly maxColumnNameChars: number;
  /** Characters in one answer (a cell of a text column). */
  readonly maxAnswerChars: number;
  /** Characters in one row of a delimited file (stops a quote that is never closed early). */
  readonly maxRowChars: number;
}

export const INPUT_LIMITS: InputLimits = {
  maxColumns: 1_000,
  maxCellChars: 100_000,
  maxColumnNameChars: 200,
  maxAnswerChars: 50_000,
  maxRowChars: 1_000_000,
};

/** Characters of a value quoted in a message: enough to recognise it (common practice). */
export const QUOTED_CHARS = 60;

/** Names listed in one message before the rest are counted (common practice). */
export const LISTED_NAMES = 12;

const fmt = (n: number) => n.toLocaleString('en');

/** A value from a file, shortened for a message or a page: "first 59 characters…". */
export function clip(text: string, max = QUOTED_CHARS): string {
  return text.length > max ? `${text.slice(0, max - 1)}…` : text;
}

/** '"a", "b", "c" … and 1,234 more': a bounded list of names from a file, each clipped. */
export function listNames(names: readonly string[], max = LISTED_NAMES): string {
  const shown = names.slice(0, max).map((n) => `"${clip(n)}"`).join(', ');
  return names.length > max ? `${shown} … and ${fmt(names.length - max)} more` : shown;
}

/** Refuse a file with more columns than the limit (checked on the header, before the rows). */
export function checkColumnCount(count: number, fileName: string, where = 'the header', limits: InputLimits = INPUT_LIMITS): void {
  if (count <= limits.maxColumns) return;
  throw new InputError(
    `${fileName}: ${where} has ${fmt(count)} columns, over the limit of ${fmt(limits.maxColumns)} columns for one import. ` +
      'Keep only the columns the study needs (the answers, id, language, groups, weight) and import that file.',
    fileName,
  );
}

/** Refuse a header with too many columns or a column name over the length limit. */
export function checkHeader(header: readonly string[], fileName: string, limits: InputLimits = INPUT_LIMITS): void {
  checkColumnCount(header.length, fileName, 'the header', limits);
  for (let j = 0; j < header.length; j++) {
    if (header[j].length > limits.maxColumnNameChars) {
      throw new InputError(
        `${fileName}: the name of column ${j + 1} ("${clip(header[j])}") is ${fmt(header[j].length)} characters long, over the limit of ` +
          `${fmt(limits.maxColumnNameChars)} for a column name. Check that the first row is the header, or shorten the name.`,
        fileName,
      );
    }
  }
}

/** Refuse a cell over the length limit; `row` counts data rows from 1. */
export function checkCell(cell: string, fileName: string, row: number, column: string, limits: InputLimits = INPUT_LIMITS): void {
  if (cell.length <= limits.maxCellChars) return;
  throw new InputError(
    `${fileName}: data row ${fmt(row)}, column "${clip(column)}" holds ${fmt(cell.length)} characters, over the limit of ` +
      `${fmt(limits.maxCellChars)} for one cell. Check the row for a quote that is not closed, or split the text.`,
    fileName,
    row,
    column,
  );
}

/** Check every cell of parsed rows against the cell limit (rows are data rows, header excluded). */
export function checkCells(rows: readonly (readonly string[])[], columns: readonly string[], fileName: string, limits: InputLimits = INPUT_LIMITS): void {
  const max = limits.maxCellChars;
  for (let r = 0; r < rows.length; r++) {
    const row = rows[r];
    for (let j = 0; j < row.length; j++) if (row[j].length > max) checkCell(row[j], fileName, r + 1, columns[j] ?? `column ${j + 1}`, limits);
  }
}
