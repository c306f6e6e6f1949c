// What the reader noticed about a file's encoding, in words a researcher can act on, naming the
// data rows: lines read in different encodings, UTF-8 with damaged bytes, and mojibake (UTF-8
// read as windows-1252), which is repaired in the cells when re-decoding clearly fixes it.
// Shown before import (the mapping page) and after it (CLI output, Data page).
import type { EncodingNote, Table } from '../types.js';
import type { DecodedText } from './decode-text.js';
import { fixMojibake, mayHoldMojibake } from './mojibake.js';

/** Rows named in a message; the rest are counted (common practice for readable messages). */
const ROWS_NAMED = 10;

/** The table with its encoding notes (lines → data rows), mojibake repaired in its cells. */
export function withEncodingNotes(table: Table, decoded?: DecodedText): Table {
  const notes: EncodingNote[] = [];
  const rowOf = decoded && (decoded.byLine || decoded.damagedLines) ? lineToRow(decoded.text, table) : null;
  const rows = (lines: number[]) => [...new Set(lines.map((l) => rowOf?.(l) ?? -1).filter((r) => r >= 0))].sort((a, b) => a - b);
  if (decoded?.byLine) {
    const { utf8Lines, legacyLines, legacyEncoding } = decoded.byLine;
    const where = rows(utf8Lines);
    notes.push({
      kind: 'mixed-lines',
      rows: where,
      message:
        `This file mixes encodings: ${plural(utf8Lines.length, 'line')} read as UTF-8, ${plural(legacyLines.length, 'line')} with accented letters or symbols as ${legacyEncoding} ` +
        `(UTF-8 in ${where.length > 0 ? describeRows(where) : `line ${describeList(utf8Lines)}`}). Each line was read in its own encoding; ` +
        'check those answers, and save the file as UTF-8 next time.',
    });
  }
  if (decoded?.damagedLines && decoded.damagedLines.length > 0) {
    const where = rows(decoded.damagedLines);
    notes.push({
      kind: 'damaged-utf8',
      rows: where,
      message:
        `${plural(decoded.damagedLines.length, 'line')} of this UTF-8 file ${decoded.damagedLines.length === 1 ? 'has' : 'have'} bytes that are not valid UTF-8 ` +
        `(${where.length > 0 ? describeRows(where) : `line ${describeList(decoded.damagedLines)}`}); they show as "\ufffd". ` +
        'Re-save the file as UTF-8 from the program that made it if those answers matter.',
    });
  }
  notes.push(...repairMojibake(table, decoded?.encoding ?? table.assumed.encoding));
  if (notes.length === 0) return table;
  return { ...table, assumed: { ...table.assumed, encodingNotes: notes } };
}

/**
 * Re-decode cells (and column names) that are UTF-8 read as windows-1252 (mojibake.ts). One
 * misread character alone can be a coincidence of real text ("é€€" is also 退 misread), so a cell
 * counts only with a pattern real text never spells ("Ã©", "â€™", "ã‚"), or two misread
 * characters, or when the file holds at least three in repairable cells (common practice).
 * Such a cell is repaired when it re-decodes cleanly, else its row is reported.
 */
function repairMojibake(table: Table, encoding: string): EncodingNote[] {
  const found: { cells: string[]; c: number; row: number; sequences: number; strong: number; fixed: string | null }[] = [];
  const visit = (cells: string[], row: number) => {
    for (let c = 0; c < cells.length; c++) {
      if (!mayHoldMojibake(cells[c])) continue;
      const { sequences, strong, fixed } = fixMojibake(cells[c]);
      if (sequences > 0) found.push({ cells, c, row, sequences, strong, fixed });
    }
  };
  visit(table.columns, 0);
  table.rows.forEach((cells, r) => visit(cells, r + 1));
  const repairable = found.reduce((n, f) => n + (f.fixed === null ? 0 : f.sequences), 0);

  const fixedRows = new Set<number>();
  const leftRows = new Set<number>();
  let fixedCells = 0;
  let leftCells = 0;
  const example = { before: '', after: '' };
  for (const { cells, c, row, sequences, strong, fixed } of found) {
    if (strong === 0 && sequences < 2 && (fixed === null || repairable < 3)) continue;
    // A repaired column name must not collide with another one.
    if (fixed === null || (row === 0 && cells.includes(fixed))) {
      leftCells++;
      leftRows.add(row);
      continue;
    }
    if (example.before === '') Object.assign(example, { before: cells[c], after: fixed });
    cells[c] = fixed;
    fixedCells++;
    fixedRows.add(row);
  }

  const cause =
    encoding === 'UTF-8'
      ? 'text that was converted to UTF-8 twice (UTF-8 read as windows-1252, then saved as UTF-8 again)'
      : `UTF-8 text inside a file read as ${encoding}`;
  const notes: EncodingNote[] = [];
  if (fixedCells > 0) {
    notes.push({
      kind: 'mojibake-fixed',
      rows: [...fixedRows].sort((a, b) => a - b),
      message:
        `${plural(fixedCells, 'cell')} held ${cause}, such as "${clip(example.before)}" for "${clip(example.after)}" (${describeRows([...fixedRows].sort((a, b) => a - b))}); ` +
        're-decoding as UTF-8 fixes them, so they were read that way. The original file is kept unchanged.',
    });
  }
  if (leftCells > 0) {
    const where = [...leftRows].sort((a, b) => a - b);
    notes.push({
      kind: 'mojibake',
      rows: where,
      message:
        `${plural(leftCells, 'cell')} look like UTF-8 read as windows-1252 (letters such as "Ã©", "Ã¤", "ã‚" or "â€™") in ${describeRows(where)}, ` +
        'and could not be repaired safely. Their encoding is probably UTF-8: save the file as UTF-8 ("CSV UTF-8") from the program that made it and import it again.',
    });
  }
  return notes;
}

/**
 * Data row (1-based; 0 = header) of each 1-based line of the decoded text, or null when the
 * format does not keep one record per line (a JSON array, a spreadsheet).
 */
function lineToRow(text: string, table: Table): ((line: number) => number | null) | null {
  if (table.format === 'jsonl') {
    if (text.trimStart().startsWith('[')) return null;
    const map: number[] = [];
    let row = 0;
    for (const line of text.split(/\r\n|\n|\r/)) map.push(line.trim() === '' ? -1 : ++row);
    return (line) => (map[line - 1] ?? -1) >= 0 ? map[line - 1] : null;
  }
  if (table.format !== 'csv' && table.format !== 'tsv') return null;
  const map = delimitedLineRecords(text, table.assumed.delimiter ?? ',');
  return (line) => (map[line - 1] ?? -1) >= 0 ? map[line - 1] : null;
}

/**
 * Record index (0 = header) in which each line starts, -1 for skipped lines: blank lines between
 * records and a leading "sep=;" line. Quoted fields may span lines ("Common Format and MIME Type
 * for CSV Files", RFC 4180 (2005), section 2); a quote opens a field only at its start, as in
 * read-delimited.ts.
 */
export function delimitedLineRecords(text: string, delimiter: string): number[] {
  const map: number[] = [];
  let record = -1;
  let inQuotes = false;
  let fieldStart = true;
  let lineStart = true;
  let i = 0;
  const hint = /^sep=[,;\t|](\r\n|\n|\r)/.exec(text);
  if (hint) {
    map.push(-1);
    i = hint[0].length;
  }
  for (; i < text.length; i++) {
    const ch = text[i];
    const newline = ch === '\n' || ch === '\r';
    if (lineStart) {
      if (inQuotes) map.push(record);
      else if (newline) map.push(-1);
      else map.push(++record);
      lineStart = false;
    }
    if (inQuotes) {
      if (ch === '"') {
        if (text[i + 1] === '"') i++;
        else inQuotes = false;
      } else if (newline) {
        if (ch === '\r' && text[i + 1] === '\n') i++;
        lineStart = true;
      }
      continue;
    }
    if (newline) {
      if (ch === '\r' && text[i + 1] === '\n') i++;
      lineStart = true;
      fieldStart = true;
    } else if (ch === delimiter) fieldStart = true;
    else {
      if (ch === '"' && fieldStart) inQuotes = true;
      fieldStart = false;
    }
  }
  return map;
}

function describeRows(rows: number[]): string {
  const header = rows[0] === 0;
  const data = header ? rows.slice(1) : rows;
  const parts: string[] = [];
  if (header) parts.push('the header row');
  if (data.length > 0) parts.push(`data ${data.length === 1 ? 'row' : 'rows'} ${describeList(data)}`);
  return parts.join(' and ');
}

function describeList(values: number[]): string {
  const named = values.slice(0, ROWS_NAMED).join(', ');
  return values.length > ROWS_NAMED ? `${named} and ${values.length - ROWS_NAMED} more` : named;
}

function plural(n: number, word: string): string {
  return `${n.toLocaleString('en')} ${word}${n === 1 ? '' : 's'}`;
}

function clip(s: string): string {
  return s.length > 40 ? `${s.slice(0, 39)}…` : s;
}
