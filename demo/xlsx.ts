// The demo as an XLSX workbook (exceljs 4.4.0), byte-for-byte reproducible. exceljs stamps the
// workbook's created/modified dates with the clock and its zip library stamps every entry with
// the current time, so both are fixed here: the workbook dates by property, the zip entry times by
// rewriting the DOS date/time fields of the archive afterwards (layout per PKWARE APPNOTE.TXT
// 6.3, sections 4.3.7, 4.3.12 and 4.3.16).
import ExcelJS from 'exceljs';
import { DEMO_CSV_COLUMNS } from './csv.js';
import type { DemoRow } from './types.js';

/** The date written into the workbook and its zip entries: 2026-01-01 00:00 UTC. */
export const FIXED_DATE = new Date(Date.UTC(2026, 0, 1));
const DOS_DATE = ((2026 - 1980) << 9) | (1 << 5) | 1;
const DOS_TIME = 0;

export async function demoXlsx(rows: readonly DemoRow[]): Promise<Uint8Array> {
  const workbook = new ExcelJS.Workbook();
  workbook.creator = 'Themata demo generator';
  workbook.lastModifiedBy = 'Themata demo generator';
  workbook.created = FIXED_DATE;
  workbook.modified = FIXED_DATE;
  const sheet = workbook.addWorksheet('answers');
  sheet.addRow([...DEMO_CSV_COLUMNS]);
  for (const r of rows) {
    sheet.addRow([r.answer_id, r.answer, r.questionnaire_language, r.link_key, r.branch_region, r.channel, r.age_band, r.wave, r.weight]);
  }
  const buffer = await workbook.xlsx.writeBuffer();
  return fixZipTimes(new Uint8Array(buffer as ArrayBuffer));
}

/** Sets every entry's modification time in a zip archive to FIXED_DATE (in place; returns it). */
export function fixZipTimes(zip: Uint8Array): Uint8Array {
  const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
  let eocd = -1;
  for (let i = zip.length - 22; i >= 0; i--) {
    if (view.getUint32(i, true) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) throw new Error('XLSX writer produced no zip end record.');
  const entries = view.getUint16(eocd + 10, true);
  let p = view.getUint32(eocd + 16, true);
  for (let e = 0; e < entries; e++) {
    if (view.getUint32(p, true) !== 0x02014b50) throw new Error('XLSX writer produced an unreadable zip directory.');
    view.setUint16(p + 12, DOS_TIME, true);
    view.setUint16(p + 14, DOS_DATE, true);
    const local = view.getUint32(p + 42, true);
    if (view.getUint32(local, true) !== 0x04034b50) throw new Error('XLSX writer produced an unreadable zip entry.');
    view.setUint16(local + 10, DOS_TIME, true);
    view.setUint16(local + 12, DOS_DATE, true);
    p += 46 + view.getUint16(p + 28, true) + view.getUint16(p + 30, true) + view.getUint16(p + 32, true);
  }
  return zip;
}
