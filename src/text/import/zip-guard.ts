// Refuse spreadsheet "zip bombs" before a zip library inflates anything.
//
// An XLSX file is a zip archive (ECMA-376 Part 2, Open Packaging Conventions). Its central
// directory lists every member with its uncompressed size, so the total unpacked size is known
// without inflating: "APPNOTE.TXT — .ZIP File Format Specification", PKWARE, version 6.3.10
// (2022), section 4.3.12 (central directory file header) and 4.3.16 (end of central directory
// record). Worksheets also declare their used range in a <dimension ref="A1:K5000"/> element
// near their start (ECMA-376 Part 1, section 18.3.1.35); reading a few kilobytes of each sheet
// tells how many rows it claims without unpacking the rest.

import { inflateRawSync, constants } from 'node:zlib';
import { InputError } from '../types.js';

const EOCD_SIGNATURE = 0x06054b50;
const CENTRAL_SIGNATURE = 0x02014b50;
const LOCAL_SIGNATURE = 0x04034b50;
const ZIP32_MAX = 0xffffffff;

export interface ZipEntry {
  readonly name: string;
  readonly method: number;
  readonly compressedSize: number;
  readonly uncompressedSize: number;
  readonly localHeaderOffset: number;
}

/** The archive's central directory; throws InputError if it cannot be found or is malformed. */
export function readZipDirectory(buf: Buffer, fileName: string): ZipEntry[] {
  const notZip = () =>
    new InputError(`${fileName}: the file is not a readable XLSX workbook (its zip structure is damaged).`, fileName);
  // The end record is 22 bytes plus a comment of at most 65,535 bytes (APPNOTE 4.3.16).
  const stop = Math.max(0, buf.length - 22 - 65_535);
  let eocd = -1;
  for (let i = buf.length - 22; i >= stop; i--) {
    if (buf.readUInt32LE(i) === EOCD_SIGNATURE) {
      eocd = i;
      break;
    }
  }
  if (eocd < 0) throw notZip();
  const count = buf.readUInt16LE(eocd + 10);
  const dirSize = buf.readUInt32LE(eocd + 12);
  const dirOffset = buf.readUInt32LE(eocd + 16);
  if (count === 0xffff || dirOffset === ZIP32_MAX) {
    throw new InputError(
      `${fileName}: the workbook is a ZIP64 archive (over 4 GB or 65,535 parts), far beyond what ` +
        'one import can hold. Export the answers as CSV instead.',
      fileName,
    );
  }
  if (dirOffset + dirSize > buf.length) throw notZip();
  const entries: ZipEntry[] = [];
  let p = dirOffset;
  for (let n = 0; n < count; n++) {
    if (p + 46 > buf.length || buf.readUInt32LE(p) !== CENTRAL_SIGNATURE) throw notZip();
    const method = buf.readUInt16LE(p + 10);
    const compressedSize = buf.readUInt32LE(p + 20);
    const uncompressedSize = buf.readUInt32LE(p + 24);
    const nameLength = buf.readUInt16LE(p + 28);
    const extraLength = buf.readUInt16LE(p + 30);
    const commentLength = buf.readUInt16LE(p + 32);
    const localHeaderOffset = buf.readUInt32LE(p + 42);
    if (p + 46 + nameLength > buf.length) throw notZip();
    const name = buf.toString('utf8', p + 46, p + 46 + nameLength);
    entries.push({ name, method, compressedSize, uncompressedSize, localHeaderOffset });
    p += 46 + nameLength + extraLength + commentLength;
  }
  return entries;
}

/** Refuse the workbook when it would unpack to more than `maxUnpackedBytes` or claims too many rows. */
export function guardZip(buf: Buffer, fileName: string, maxUnpackedBytes: number, maxRows: number): void {
  const entries = readZipDirectory(buf, fileName);
  let total = 0;
  for (const e of entries) {
    if (e.uncompressedSize === ZIP32_MAX || e.compressedSize === ZIP32_MAX) total = Infinity;
    else total += e.uncompressedSize;
  }
  if (total > maxUnpackedBytes) {
    throw new InputError(
      `${fileName}: the workbook would unpack to ${formatBytes(total)}, more than the limit of ` +
        `${formatBytes(maxUnpackedBytes)}. Export the sheet you need as CSV and import that instead.`,
      fileName,
    );
  }
  // The sizes are only claims: inflate each member with its claimed size as a hard cap, so a
  // member that unpacks to more than it declares cannot reach the zip library.
  for (const e of entries) checkClaimedSize(buf, e, fileName);
  for (const e of entries) {
    if (!/^xl\/worksheets\/[^/]+\.xml$/i.test(e.name)) continue;
    const rows = declaredRows(buf, e);
    if (rows !== null && rows - 1 > maxRows) {
      throw new InputError(
        `${fileName}: a worksheet (${e.name}) declares ${rows.toLocaleString('en')} rows, more than ` +
          `the limit of ${maxRows.toLocaleString('en')} for one import. Split the data into several files.`,
        fileName,
      );
    }
  }
}

function checkClaimedSize(buf: Buffer, e: ZipEntry, fileName: string): void {
  if (e.method !== 8) return; // stored members are as large as they are; others fail in the library
  const start = dataStart(buf, e);
  if (start === null || start + e.compressedSize > buf.length) return; // the library will report damage
  try {
    inflateRawSync(buf.subarray(start, start + e.compressedSize), { maxOutputLength: Math.max(1, e.uncompressedSize) });
  } catch (err) {
    if ((err as { code?: string }).code === 'ERR_BUFFER_TOO_LARGE' || err instanceof RangeError) {
      throw new InputError(
        `${fileName}: a part of the workbook (${e.name}) unpacks to more than the size it declares; ` +
          'the file is damaged or built to exhaust memory, so it was not opened.',
        fileName,
      );
    }
    // Other inflate errors are damage the spreadsheet library reports in its own words.
  }
}

function dataStart(buf: Buffer, e: ZipEntry): number | null {
  const h = e.localHeaderOffset;
  if (h + 30 > buf.length || buf.readUInt32LE(h) !== LOCAL_SIGNATURE) return null;
  return h + 30 + buf.readUInt16LE(h + 26) + buf.readUInt16LE(h + 28);
}

/** Rows claimed by a worksheet's <dimension ref> (last row number), or null when absent or unreadable. */
function declaredRows(buf: Buffer, e: ZipEntry): number | null {
  const start = dataStart(buf, e);
  if (start === null) return null;
  const head = buf.subarray(start, Math.min(buf.length, start + Math.min(e.compressedSize, 4096)));
  let xml: string;
  try {
    if (e.method === 0) xml = head.toString('utf8');
    else if (e.method === 8) {
      // A partial deflate stream: flush what can be decoded instead of failing at its end.
      // 4 KB of deflate input yields at most ~4 MB (deflate's ratio is bounded near 1032:1).
      xml = inflateRawSync(head, { finishFlush: constants.Z_SYNC_FLUSH }).subarray(0, 65_536).toString('utf8');
    } else return null;
  } catch {
    return null;
  }
  const m = /<(?:\w+:)?dimension\s+ref="[A-Z]*\d*(?::[A-Z]*(\d+))?"/.exec(xml);
  if (!m) return null;
  const last = m[1] ?? /ref="[A-Z]*(\d+)/.exec(m[0])?.[1];
  return last === undefined ? null : Number(last);
}

export function formatBytes(n: number): string {
  if (!Number.isFinite(n)) return 'more than 4 GB';
  if (n >= 1 << 20) return `${(n / (1 << 20)).toFixed(n >= 10 << 20 ? 0 : 1)} MB`;
  if (n >= 1024) return `${(n / 1024).toFixed(0)} KB`;
  return `${n} bytes`;
}
