// SPSS system file (.sav) → header + rows, read with sav-reader (CommonJS, loaded by createRequire).
//
// Layout: GNU PSPP manual, appendix "System File Format" (records 1, 2, 3/4, 7.13, 7.20, 999 and
// the bytecode-compressed data). sav-reader reads the dictionary (variables, long names, very
// long strings, value labels); the cases are decoded by sav-data.ts. What we add:
// - Text decoding. sav-reader decodes every 8-byte data chunk as UTF-8 on its own, which breaks
//   multi-byte characters that straddle a chunk boundary. We make its string reader return raw
//   bytes (one char per byte, latin1) and decode whole strings in the file's declared character
//   encoding (record 7.20) with iconv-lite.
// - Speed. sav-reader's case reader awaits a promise chain per 8-byte value (≈ 400 µs per case
//   measured on this machine); sav-data.ts decodes cases synchronously (≈ 20 µs per case).
// - Missing values. System-missing arrives as −DBL_MAX (−1.797…e308) in uncompressed files and as
//   null in compressed ones; both become '' (missing). User-missing codes become '' unless they
//   carry a value label, which is kept (e.g. "Don't know" is an answer worth analysing).
// Value labels replace the codes they label; those columns are listed in `labelledColumns`.

import { createRequire } from 'node:module';
import iconv from 'iconv-lite';
import { InputError } from '../types.js';
import { uniqueColumnNames } from './column-names.js';
import { readSavCases, type SavElementPlan } from './sav-data.js';
import { spssNumberText } from './spss-values.js';

const require = createRequire(import.meta.url);

interface SavVar {
  name: string;
  type: number; // 0 numeric, 1 string
  label: string | null;
  missing: unknown;
  printFormat: { type: number; typestr?: string; nbdec: number };
  __nb_string_contin_recs?: number;
  __child_string_sysvars?: SavVar[];
}
/** The byte source sav-reader's CommandReader reads from (its AsyncChunkReader's interface). */
interface ByteSource {
  read(len: number): Promise<Buffer>;
  peek(len: number): Promise<Buffer>;
  isAtEnd(): boolean;
  getPosition(): number;
  close(): Promise<void>;
}

/**
 * The whole file is already in memory, so the dictionary is read from it directly (sav-reader's
 * own source wraps the buffer in a stream and waits for stream events), and the position where
 * the dictionary ends is where sav-data.ts starts decoding cases.
 */
class MemorySource implements ByteSource {
  private pos = 0;
  constructor(private readonly buf: Buffer) {}
  async read(len: number): Promise<Buffer> {
    const out = this.buf.subarray(this.pos, this.pos + len);
    this.pos += len;
    return out;
  }
  async peek(len: number): Promise<Buffer> {
    return this.buf.subarray(this.pos, this.pos + len);
  }
  isAtEnd(): boolean {
    return this.pos >= this.buf.length;
  }
  getPosition(): number {
    return this.pos;
  }
  async close(): Promise<void> {}
}

interface SavReaderLike {
  reader: {
    reader: ByteSource;
    readString: (len: number, trimEnd?: boolean) => Promise<string>;
    readBytes: (len: number) => Promise<Buffer>;
  };
  meta: {
    header: { encoding?: string; n_cases?: number; compression?: { bias: number } };
    sysvars: SavVar[];
    valueLabels: { appliesToNames: string[]; entries: { val: number | string; label: string }[] }[];
  };
  open(): Promise<void>;
}

export interface SavResult {
  readonly columns: string[];
  readonly rows: string[][];
  readonly encoding: string;
  /** 1 when the file names its encoding, 0.5 when it was inferred from the strings. */
  readonly encodingConfidence: number;
  readonly labelledColumns: string[];
}

export async function readSav(buf: Buffer, fileName: string, maxRows: number): Promise<SavResult> {
  const magic = buf.subarray(0, 4).toString('latin1');
  if (magic === '$FL3') {
    throw new InputError(
      `${fileName}: this is a compressed SPSS file (.zsav, ZLIB compression), which Themata cannot ` +
        'read. In SPSS, save it again as an uncompressed or standard-compressed .sav file.',
      fileName,
    );
  }
  if (magic !== '$FL2') {
    throw new InputError(`${fileName}: the file is not an SPSS system file (.sav).`, fileName);
  }
  const { SavBufferReader } = require('sav-reader') as { SavBufferReader: new (b: Buffer) => SavReaderLike };
  const sav = new SavBufferReader(buf);
  const inner = new MemorySource(buf);
  sav.reader.reader = inner;
  // Raw bytes as a latin1 string; refuse lengths past the end instead of buffering forever.
  sav.reader.readString = async (len: number, trimEnd = false) => {
    if (len < 1) return '';
    if (len > buf.length) throw new Error(`string of ${len} bytes runs past the end of the file`);
    const bytes = await inner.read(len);
    if (bytes.length !== len) throw new Error('the file ends in the middle of a string');
    const s = bytes.toString('latin1');
    return trimEnd ? s.trimEnd() : s;
  };
  const readBytes = sav.reader.readBytes.bind(sav.reader);
  sav.reader.readBytes = async (len: number) => {
    if (len < 0 || len > buf.length) throw new Error(`a record of ${len} bytes runs past the end of the file`);
    return readBytes(len);
  };

  const damaged = (err: unknown) =>
    new InputError(
      `${fileName}: the SPSS file is damaged or uses a layout Themata cannot read ` +
        `(${(err as Error)?.message ?? String(err)}). Open it in SPSS or PSPP and save it again as .sav.`,
      fileName,
    );
  try {
    await sav.open();
  } catch (err) {
    throw damaged(err);
  }
  const { header, sysvars, valueLabels } = sav.meta;
  if (sysvars.length === 0) throw new InputError(`${fileName}: the SPSS file has no variables.`, fileName);
  const decode = makeDecoder(header.encoding);

  const labelsByVar = new Map<string, Map<string, string>>();
  for (const set of valueLabels ?? []) {
    for (const name of set.appliesToNames ?? []) {
      const map = labelsByVar.get(name) ?? new Map<string, string>();
      for (const e of set.entries) map.set(valueKey(e.val), decode(e.label).trim());
      labelsByVar.set(name, map);
    }
  }

  const expected = typeof header.n_cases === 'number' && header.n_cases >= 0 ? header.n_cases : Infinity;
  const tooMany = () =>
    new InputError(
      `${fileName}: the file has more than ${maxRows.toLocaleString('en')} cases, the limit for one ` +
        'import. Split it into several files.',
      fileName,
      maxRows + 1,
    );
  if (Number.isFinite(expected) && expected > maxRows) throw tooMany();
  const plan: SavElementPlan = {
    variables: sysvars.map((v) =>
      v.type === 0
        ? { kind: 'numeric' as const }
        : { kind: 'string' as const, segments: [v, ...(v.__child_string_sysvars ?? [])].map((sv) => 1 + (sv.__nb_string_contin_recs ?? 0)) },
    ),
  };
  const rows: string[][] = [];
  const labels = sysvars.map((v) => labelsByVar.get(v.name));
  try {
    readSavCases(buf, inner.getPosition(), plan, header.compression ?? null, Math.min(expected, maxRows + 1), (cells) => {
      if (rows.length >= maxRows) throw tooMany();
      rows.push(cells.map((cell, i) => cellText(sysvars[i], cell, labels[i], decode)));
    });
  } catch (err) {
    if (err instanceof InputError) throw err;
    throw damaged(err);
  }
  if (rows.length === 0) {
    throw new InputError(`${fileName}: the SPSS file defines variables but holds no cases.`, fileName);
  }
  if (Number.isFinite(expected) && rows.length < expected) {
    throw new InputError(
      `${fileName}: the SPSS file ends after ${rows.length} of its ${expected} cases; it is truncated. ` +
        'Copy or export it again.',
      fileName,
    );
  }
  const names = sysvars.map((v) => decode(v.name));
  const columns = uniqueColumnNames(names).columns;
  const labelledColumns = columns.filter((_, i) => labelsByVar.has(sysvars[i].name));
  return { columns, rows, encoding: decode.encoding, encodingConfidence: decode.declared ? 1 : 0.5, labelledColumns };
}

interface Decoder {
  (latin1: string): string;
  /** The encoding to report: the declared one, else what the strings turned out to be. */
  readonly encoding: string;
  readonly declared: boolean;
}

/**
 * Decode raw-byte strings in the file's encoding (record 7.20). Files written before SPSS 16
 * may lack that record: then each string is UTF-8 if it is valid UTF-8, else windows-1252
 * (the code page of most such files; common practice).
 */
function makeDecoder(declaredName: string | undefined): Decoder {
  const name = declaredName?.trim();
  const known = name && iconv.encodingExists(name) ? name : undefined;
  const strict = new TextDecoder('utf-8', { fatal: true });
  let legacy = false;
  const fn = (latin1: string) => {
    const bytes = Buffer.from(latin1, 'latin1');
    if (known) return iconv.decode(bytes, known);
    try {
      return strict.decode(bytes);
    } catch {
      legacy = true;
      return iconv.decode(bytes, 'windows-1252');
    }
  };
  return Object.defineProperties(fn, {
    encoding: { get: () => known ?? (legacy ? 'windows-1252' : 'UTF-8') },
    declared: { value: known !== undefined },
  }) as Decoder;
}

function valueKey(v: number | string): string {
  return typeof v === 'number' ? `n:${v}` : `s:${String(v).trimEnd()}`;
}

function cellText(
  v: SavVar,
  value: unknown,
  labels: Map<string, string> | undefined,
  decode: Decoder,
): string {
  if (value === null || value === undefined) return '';
  if (v.type === 1) {
    const raw = String(value).trimEnd();
    const label = labels?.get(`s:${raw}`);
    return label ?? decode(raw).trim();
  }
  const n = Number(value);
  if (!Number.isFinite(n) || n <= -1.79e308) return ''; // system-missing (−DBL_MAX)
  const label = labels?.get(`n:${n}`);
  if (label !== undefined) return label;
  if (isUserMissing(n, v.missing)) return '';
  return spssNumberText(n, v.printFormat?.type ?? 5);
}

function isUserMissing(n: number, missing: unknown): boolean {
  if (missing === null || missing === undefined) return false;
  if (typeof missing === 'number') return n === missing;
  if (Array.isArray(missing)) return missing.includes(n);
  if (typeof missing === 'object') {
    const m = missing as { min?: number; max?: number; value?: number };
    if (typeof m.min === 'number' && typeof m.max === 'number' && n >= m.min && n <= m.max) return true;
    if (typeof m.value === 'number' && n === m.value) return true;
  }
  return false;
}
