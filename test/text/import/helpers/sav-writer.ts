// Test-only writer of small SPSS system files (.sav), so tests can make the files they read.
//
// Follows the published layout in the GNU PSPP manual, appendix "System File Format": file
// header record (176 bytes), variable records (type 2, with continuation records for strings
// wider than 8 bytes), value label records (types 3 and 4), machine info records 7.3 and 7.4,
// long variable names (7.13), character encoding (7.20), dictionary termination (999), then the
// data, either uncompressed or with the simple bytecode compression (bias 100). Only what the
// tests need: numeric and string (≤ 255 bytes) variables, value labels, discrete missing values.

import iconv from 'iconv-lite';

export interface SavVariable {
  /** Long name (written through record 7.13). */
  name: string;
  type: 'numeric' | 'string';
  /** String width in bytes (1..255). */
  width?: number;
  label?: string;
  valueLabels?: { value: number | string; label: string }[];
  /** Discrete user-missing values (numeric only, at most 3). */
  missing?: number[];
  /** Print format type code (5 = F, 20 = DATE, 22 = DATETIME); default F8.2 / A. */
  format?: number;
}

export interface SavWriteOptions {
  compressed?: boolean;
  /** Character encoding named in record 7.20 and used for all text (default UTF-8). */
  encoding?: string;
  /** Leave out record 7.20 (older files). */
  omitEncodingRecord?: boolean;
}

const SYSMIS = -Number.MAX_VALUE;
const BIAS = 100;

class Out {
  private chunks: Buffer[] = [];
  int(n: number): void {
    const b = Buffer.alloc(4);
    b.writeInt32LE(n);
    this.chunks.push(b);
  }
  double(n: number): void {
    const b = Buffer.alloc(8);
    b.writeDoubleLE(n);
    this.chunks.push(b);
  }
  bytes(b: Buffer): void {
    this.chunks.push(b);
  }
  padded(b: Buffer, len: number, fill = 0x20): void {
    const out = Buffer.alloc(len, fill);
    b.copy(out, 0, 0, Math.min(len, b.length));
    this.chunks.push(out);
  }
  done(): Buffer {
    return Buffer.concat(this.chunks);
  }
}

const segmentsOf = (v: SavVariable) => (v.type === 'numeric' ? 1 : Math.ceil((v.width ?? 8) / 8));

export function writeSav(vars: SavVariable[], rows: (number | string | null)[][], options: SavWriteOptions = {}): Buffer {
  const encoding = options.encoding ?? 'UTF-8';
  const enc = (s: string) => iconv.encode(s, encoding);
  const out = new Out();
  const caseSize = vars.reduce((s, v) => s + segmentsOf(v), 0);

  // File header record.
  out.padded(Buffer.from('$FL2', 'latin1'), 4);
  out.padded(Buffer.from('@(#) SPSS DATA FILE - themata test writer', 'latin1'), 60);
  out.int(2); // layout code
  out.int(caseSize);
  out.int(options.compressed ? 1 : 0);
  out.int(0); // weight index
  out.int(rows.length);
  out.double(BIAS);
  out.padded(Buffer.from('01 Jan 24', 'latin1'), 9);
  out.padded(Buffer.from('12:00:00', 'latin1'), 8);
  out.padded(Buffer.alloc(0), 64);
  out.padded(Buffer.alloc(0), 3, 0);

  // Variable records; remember each variable's 1-based position among the records.
  const shortNames = vars.map((_, i) => `V${i + 1}`);
  const position: number[] = [];
  let next = 1;
  vars.forEach((v, i) => {
    position.push(next);
    const width = v.type === 'string' ? (v.width ?? 8) : 0;
    const fmt = v.type === 'string' ? (1 << 16) | (width << 8) : ((v.format ?? 5) << 16) | (8 << 8) | 2;
    out.int(2);
    out.int(width);
    out.int(v.label ? 1 : 0);
    out.int(v.missing?.length ?? 0);
    out.int(fmt);
    out.int(fmt);
    out.padded(Buffer.from(shortNames[i], 'latin1'), 8);
    if (v.label) {
      const label = enc(v.label);
      out.int(label.length);
      out.padded(label, Math.ceil(label.length / 4) * 4);
    }
    for (const m of v.missing ?? []) out.double(m);
    for (let s = 1; s < segmentsOf(v); s++) {
      out.int(2);
      out.int(-1);
      out.int(0);
      out.int(0);
      out.int(0);
      out.int(0);
      out.padded(Buffer.alloc(0), 8);
    }
    next += segmentsOf(v);
  });

  // Value label records (3) each followed by the variable index record (4).
  vars.forEach((v, i) => {
    if (!v.valueLabels?.length) return;
    out.int(3);
    out.int(v.valueLabels.length);
    for (const { value, label } of v.valueLabels) {
      if (typeof value === 'number') out.double(value);
      else out.padded(enc(value), 8);
      const l = enc(label).subarray(0, 120);
      const b = Buffer.alloc(Math.ceil((l.length + 1) / 8) * 8, 0x20);
      b[0] = l.length;
      l.copy(b, 1);
      out.bytes(b);
    }
    out.int(4);
    out.int(1);
    out.int(position[i]);
  });

  // 7.3 machine integer info: version 1.0.0, machine -1, IEEE 754, compression, little-endian, codepage.
  out.int(7);
  out.int(3);
  out.int(4);
  out.int(8);
  for (const n of [1, 0, 0, -1, 1, options.compressed ? 1 : 0, 2, encoding === 'UTF-8' ? 65001 : 1252]) out.int(n);
  // 7.4 machine floating-point info: SYSMIS, HIGHEST, LOWEST.
  out.int(7);
  out.int(4);
  out.int(8);
  out.int(3);
  out.double(SYSMIS);
  out.double(Number.MAX_VALUE);
  // LOWEST is the double just above −DBL_MAX: bits FFEFFFFF FFFFFFFE.
  out.bytes(Buffer.from([0xfe, 0xff, 0xff, 0xff, 0xff, 0xff, 0xef, 0xff]));
  // 7.13 long variable names.
  const longNames = enc(vars.map((v, i) => `${shortNames[i]}=${v.name}`).join('\t'));
  out.int(7);
  out.int(13);
  out.int(1);
  out.int(longNames.length);
  out.bytes(longNames);
  if (!options.omitEncodingRecord) {
    const name = Buffer.from(encoding, 'latin1');
    out.int(7);
    out.int(20);
    out.int(1);
    out.int(name.length);
    out.bytes(name);
  }
  out.int(999);
  out.int(0);

  // Data: a list of 8-byte elements per case.
  const elements: (number | Buffer)[] = [];
  for (const row of rows) {
    vars.forEach((v, i) => {
      const value = row[i];
      if (v.type === 'numeric') elements.push(value === null ? SYSMIS : Number(value));
      else {
        const seg = segmentsOf(v);
        const b = Buffer.alloc(seg * 8, 0x20);
        enc(String(value ?? '')).copy(b, 0, 0, v.width ?? 8);
        for (let s = 0; s < seg; s++) elements.push(b.subarray(s * 8, s * 8 + 8));
      }
    });
  }
  if (!options.compressed) {
    for (const e of elements) {
      if (typeof e === 'number') out.double(e);
      else out.bytes(e);
    }
    return out.done();
  }
  // Bytecode compression: blocks of 8 command bytes, each followed by the raw 8-byte values of
  // its 253 codes. 1..251 = value − bias, 253 = raw, 254 = eight spaces, 255 = system-missing.
  let commands: number[] = [];
  let raw: Buffer[] = [];
  const flush = () => {
    while (commands.length < 8) commands.push(0);
    out.bytes(Buffer.from(commands));
    for (const r of raw) out.bytes(r);
    commands = [];
    raw = [];
  };
  for (const e of elements) {
    if (typeof e === 'number') {
      if (e === SYSMIS) commands.push(255);
      else if (Number.isInteger(e) && e >= 1 - BIAS && e <= 251 - BIAS) commands.push(e + BIAS);
      else {
        const b = Buffer.alloc(8);
        b.writeDoubleLE(e);
        commands.push(253);
        raw.push(b);
      }
    } else if (e.every((x) => x === 0x20)) commands.push(254);
    else {
      commands.push(253);
      raw.push(Buffer.from(e));
    }
    if (commands.length === 8) flush();
  }
  if (commands.length > 0) flush();
  return out.done();
}
