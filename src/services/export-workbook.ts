// The export's tables as one spreadsheet workbook (XLSX, Office Open XML, ECMA-376), one sheet
// per table. Written with exceljs's streaming writer (exceljs 4.4.0, MIT, "Streaming I/O"):
// each row is committed and compressed as it is added, so memory holds the compressed workbook
// and one row, not a cell object per value. The cells follow the CSV files' rules (csv.ts):
// text that starts with =, +, -, @, tab or CR is prefixed with a quote so no spreadsheet program
// can evaluate it (OWASP, "CSV Injection", common practice), numbers stay numbers.
import { once } from 'node:events';
import { PassThrough, type Writable } from 'node:stream';
import type ExcelJSModule from 'exceljs';
import { guardCell, type CsvCell } from './csv.js';
import type { ExportedFile, ExportTables } from './export-run.js';

export const WORKBOOK_FILE = 'theme-tables.xlsx';
export const WORKBOOK_MEDIA_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';

/** Rows of one worksheet, header included (ECMA-376 / Excel's limit of 1,048,576 rows). */
export const SHEET_ROWS = 1_048_576;

/** Rows written between checks that the zip has taken the rows before them (common practice). */
const YIELD_ROWS = 500;

/**
 * Wait until the zip has taken the sheet's committed rows. In exceljs 4.4.0 a streaming sheet
 * writes into a buffer that pipes into the zip's entry stream (a readable-stream PassThrough of
 * archiver) without waiting for it (lib/utils/stream-buf.js, `_pipe`), so a fast loop would
 * hold the whole sheet's XML in memory; waiting for that entry stream's 'drain' keeps memory to
 * a few buffers. When the internals are not as expected, a turn of the event loop is all that is
 * given; the wait for 'drain' is capped so an unexpected stream can slow a workbook, never stop it.
 */
async function drained(ws: unknown): Promise<void> {
  const sink = (ws as { stream?: { pipes?: (Writable & { _writableState?: { needDrain?: boolean } })[] } }).stream?.pipes?.[0];
  if (sink?._writableState?.needDrain) {
    let timer: NodeJS.Timeout | undefined;
    await Promise.race([once(sink, 'drain'), new Promise<void>((resolve) => (timer = setTimeout(resolve, DRAIN_WAIT_MS)))]);
    clearTimeout(timer);
  } else await new Promise<void>((resolve) => setImmediate(resolve));
}

/** Longest wait for the zip to take rows (common practice). */
const DRAIN_WAIT_MS = 1_000;

export interface WorkbookTable {
  /** Sheet name: at most 31 characters, none of : \ / ? * [ ] (Excel's rules). */
  readonly sheet: string;
  readonly header: readonly string[];
  readonly rows: Iterable<readonly CsvCell[]>;
}

/** A cell as the workbook stores it: numbers as numbers, everything else as guarded text. */
export function workbookCell(value: CsvCell): string | number | null {
  if (value === null || value === undefined || value === '') return null;
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  return guardCell(value);
}

/** A name Excel accepts for a sheet. */
export function sheetName(name: string): string {
  return name.replace(/[:\\/?*[\]]/g, ' ').trim().slice(0, 31) || 'Sheet';
}

/**
 * Workbook bytes for tables. A table longer than a sheet continues on "name (2)", "name (3)"…
 * with the header repeated, so no row is lost.
 */
export async function tablesWorkbook(tables: readonly WorkbookTable[], sheetRows = SHEET_ROWS): Promise<Uint8Array> {
  // Loaded on first use, as in read-xlsx.ts: exceljs takes about a second to load.
  const ExcelJS = ((await import('exceljs')) as unknown as { default: typeof ExcelJSModule }).default;
  const stream = new PassThrough();
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  const finished = new Promise<void>((resolve, reject) => {
    stream.on('end', resolve);
    stream.on('error', reject);
  });
  // Inline strings (no shared-string table kept in memory) and no styles: plain data sheets.
  const wb = new ExcelJS.stream.xlsx.WorkbookWriter({ stream, useSharedStrings: false, useStyles: false });
  wb.creator = 'Themata';
  const used = new Set<string>();
  const uniqueSheet = (base: string): string => {
    let name = sheetName(base);
    for (let i = 2; used.has(name.toLowerCase()); i++) name = `${sheetName(base).slice(0, 26)} (${i})`;
    used.add(name.toLowerCase());
    return name;
  };
  for (const t of tables) {
    const header = t.header.map(workbookCell);
    let ws = wb.addWorksheet(uniqueSheet(t.sheet));
    ws.addRow(header).commit();
    let rowsInSheet = 1;
    let part = 1;
    for (const row of t.rows) {
      if (rowsInSheet === sheetRows) {
        ws.commit();
        ws = wb.addWorksheet(uniqueSheet(`${t.sheet.slice(0, 24)} (${++part})`));
        ws.addRow(header).commit();
        rowsInSheet = 1;
      }
      ws.addRow(row.map(workbookCell)).commit();
      rowsInSheet++;
      if (rowsInSheet % YIELD_ROWS === 0) await drained(ws);
    }
    ws.commit();
  }
  await wb.commit();
  await finished;
  const bytes = Buffer.concat(chunks);
  return new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

/** The export's tables as the workbook file. */
export async function exportWorkbook(t: ExportTables): Promise<ExportedFile> {
  const bytes = await tablesWorkbook([
    { sheet: 'themes', ...t.themes },
    { sheet: 'answers by theme', ...t.answers },
    { sheet: 'theme words', ...t.words },
    { sheet: 'shares by group', ...t.shares },
  ]);
  return { name: WORKBOOK_FILE, mediaType: WORKBOOK_MEDIA_TYPE, bytes };
}
