// One entry point for every input format: bytes + the file's name → Table, or an InputError a
// researcher can act on. The file name picks the format (with the file's first bytes as a
// check) and appears in messages; it is never used as a path.
//
// Row numbers in messages and in InputError.row count data rows from 1 (the header row is not
// counted), so "data row 3" is the third answer in the file.

import { InputError, type Table, type TableFormat } from '../types.js';
import { decodeText } from './decode-text.js';
import { withEncodingNotes } from './encoding-notes.js';
import { readDelimited } from './read-delimited.js';
import { readJsonl } from './read-jsonl.js';
import { readSav } from './read-sav.js';
import { readXlsx } from './read-xlsx.js';
import { checkCells, checkHeader, clip } from './input-limits.js';
import { formatBytes } from './zip-guard.js';

export interface ReadTableOptions {
  /** XLSX: the sheet to read (default: the first). */
  sheet?: string;
  /** Refuse files larger than this many bytes (default 100 MB). */
  maxBytes?: number;
  /** Refuse files with more data rows than this (default 2,000,000). */
  maxRows?: number;
  /** XLSX: refuse workbooks that would unpack to more than this many bytes (default 200 MB). */
  maxUnpackedBytes?: number;
}

/** Defaults; common practice for a lab server with a few GB of memory. */
export const READ_TABLE_DEFAULTS = {
  maxBytes: 100 * 1024 * 1024,
  maxRows: 2_000_000,
  maxUnpackedBytes: 200 * 1024 * 1024,
} as const;

type Kind = TableFormat | 'text';

export async function readTable(bytes: Uint8Array, fileName: string, options: ReadTableOptions = {}): Promise<Table> {
  const maxBytes = options.maxBytes ?? READ_TABLE_DEFAULTS.maxBytes;
  const maxRows = options.maxRows ?? READ_TABLE_DEFAULTS.maxRows;
  const maxUnpackedBytes = options.maxUnpackedBytes ?? READ_TABLE_DEFAULTS.maxUnpackedBytes;
  if (bytes.byteLength > maxBytes) {
    throw new InputError(
      `${fileName}: the file is ${formatBytes(bytes.byteLength)}, over the limit of ${formatBytes(maxBytes)} ` +
        'for one import. Split it into several files and import each.',
      fileName,
    );
  }
  if (bytes.byteLength === 0) throw new InputError(`${fileName}: the file is empty (0 bytes).`, fileName);
  const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  try {
    return await readByKind(buf, fileName, pickKind(buf, fileName), options.sheet, maxRows, maxUnpackedBytes);
  } catch (err) {
    if (err instanceof InputError) throw err;
    // A library failing on hostile or damaged input is still the file's fault, not a crash.
    throw new InputError(
      `${fileName}: the file could not be read (${clip(String((err as Error)?.message ?? err), 200)}).`,
      fileName,
    );
  }
}

async function readByKind(
  buf: Buffer,
  fileName: string,
  kind: Kind,
  sheet: string | undefined,
  maxRows: number,
  maxUnpackedBytes: number,
): Promise<Table> {
  if (kind === 'xlsx') {
    const r = await readXlsx(buf, fileName, sheet, { maxRows, maxUnpackedBytes });
    return withEncodingNotes({
      fileName,
      format: 'xlsx',
      columns: r.columns,
      rows: r.rows,
      assumed: { encoding: 'UTF-8', encodingConfidence: 1, sheet: r.sheet, sheets: r.sheets },
    });
  }
  if (kind === 'sav') {
    const r = await readSav(buf, fileName, maxRows);
    // The other readers check as they read; an SPSS file's variables are bounded the same way.
    checkHeader(r.columns, fileName);
    checkCells(r.rows, r.columns, fileName);
    return withEncodingNotes({
      fileName,
      format: 'sav',
      columns: r.columns,
      rows: r.rows,
      assumed: { encoding: r.encoding, encodingConfidence: r.encodingConfidence },
      labelledColumns: r.labelledColumns,
    });
  }
  const decoded = decodeText(buf, fileName);
  if (decoded.text.trim() === '') throw new InputError(`${fileName}: the file is blank (no text).`, fileName);
  const assumed = { encoding: decoded.encoding, encodingConfidence: decoded.confidence };
  const isJson = kind === 'jsonl' || (kind === 'text' && looksLikeJson(decoded.text));
  if (isJson) {
    const r = readJsonl(decoded.text, fileName, maxRows);
    return withEncodingNotes({ fileName, format: 'jsonl', columns: r.columns, rows: r.rows, assumed }, decoded);
  }
  const r = readDelimited(decoded.text, fileName, kind === 'tsv' ? '\t' : ',', maxRows);
  const table: Table = {
    fileName,
    format: r.delimiter === '\t' ? 'tsv' : 'csv',
    columns: r.columns,
    rows: r.rows,
    assumed: { ...assumed, delimiter: r.delimiter },
  };
  return withEncodingNotes(table, decoded);
}

/** A file of unknown kind is JSON when it starts with "[" or its first line is a JSON object. */
function looksLikeJson(text: string): boolean {
  const start = text.trimStart();
  if (start.startsWith('[')) return true;
  if (!start.startsWith('{')) return false;
  try {
    const first: unknown = JSON.parse(start.split(/\r\n|\n|\r/, 1)[0]);
    return first !== null && typeof first === 'object';
  } catch {
    return false;
  }
}

/** The format from the file's first bytes where they are decisive, else from its extension. */
function pickKind(buf: Buffer, fileName: string): Kind {
  const ext = /\.([a-z0-9]+)$/i.exec(fileName)?.[1]?.toLowerCase() ?? '';
  const head = buf.subarray(0, 4).toString('latin1');
  if (head === 'PK\u0003\u0004') return 'xlsx';
  if (head === '$FL2' || head === '$FL3') return 'sav';
  if (buf.length >= 4 && buf.readUInt32BE(0) === 0xd0cf11e0) {
    throw new InputError(
      `${fileName}: this is an old-style Excel (.xls) or other legacy Office file. Save it as .xlsx ` +
        'or CSV UTF-8 and import that.',
      fileName,
    );
  }
  if (ext === 'xlsx' || ext === 'xlsm') {
    throw new InputError(`${fileName}: the file is named .${ext} but is not an XLSX workbook (zip).`, fileName);
  }
  if (ext === 'sav' || ext === 'zsav') {
    throw new InputError(`${fileName}: the file is named .${ext} but is not an SPSS system file.`, fileName);
  }
  if (ext === 'xls') {
    throw new InputError(`${fileName}: old-style Excel (.xls) files cannot be read. Save it as .xlsx or CSV.`, fileName);
  }
  if (ext === 'por') {
    throw new InputError(`${fileName}: SPSS portable files (.por) cannot be read. Save it as .sav.`, fileName);
  }
  if (ext === 'jsonl' || ext === 'ndjson' || ext === 'json') return 'jsonl';
  if (ext === 'tsv' || ext === 'tab') return 'tsv';
  if (ext === 'csv') return 'csv';
  return 'text';
}
