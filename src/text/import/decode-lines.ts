// A text file whose lines are in different encodings: most lines in a legacy single-byte
// encoding (e.g. windows-1252 from a spreadsheet export) and some pasted in as UTF-8 (e.g. a
// Japanese answer). Read as one encoding, one of the two turns into mojibake; read line by line,
// both come out right.
//
// A line counts as UTF-8 when it holds at least one multi-byte sequence and no byte that is
// invalid UTF-8: legacy single-byte text almost never forms such sequences by accident ("UTF-8,
// a transformation format of ISO 10646", RFC 3629 (2003), section 10). Legacy multi-byte
// encodings (Shift_JIS, EUC, GB18030, Big5) can, so lines are only mixed with single-byte ones.

/** Byte range of one line, its terminator included. */
export interface LineRange {
  readonly start: number;
  readonly end: number;
}

export type LineKind = 'ascii' | 'utf8' | 'legacy';

export interface LineScan {
  readonly lines: LineRange[];
  readonly kinds: LineKind[];
  /** Valid multi-byte UTF-8 sequences and invalid bytes over the whole file. */
  readonly sequences: number;
  readonly invalid: number;
}

/** Split at LF, CRLF or a lone CR, the same line breaks the readers accept. */
export function splitLines(buf: Uint8Array): LineRange[] {
  const lines: LineRange[] = [];
  let start = 0;
  for (let i = 0; i < buf.length; i++) {
    const b = buf[i];
    if (b === 0x0a || b === 0x0d) {
      if (b === 0x0d && buf[i + 1] === 0x0a) i++;
      lines.push({ start, end: i + 1 });
      start = i + 1;
    }
  }
  if (start < buf.length) lines.push({ start, end: buf.length });
  return lines;
}

/** Each line's kind plus the file's UTF-8 sequence counts (RFC 3629, section 4). */
export function scanLines(buf: Uint8Array): LineScan {
  const lines = splitLines(buf);
  const kinds: LineKind[] = [];
  let sequences = 0;
  let invalid = 0;
  for (const { start, end } of lines) {
    let seq = 0;
    let bad = 0;
    let i = start;
    while (i < end) {
      const b = buf[i];
      if (b < 0x80) {
        i++;
        continue;
      }
      const len = b >= 0xc2 && b <= 0xdf ? 2 : b >= 0xe0 && b <= 0xef ? 3 : b >= 0xf0 && b <= 0xf4 ? 4 : 0;
      let ok = len > 0 && i + len <= end && validSecondByte(b, buf[i + 1]);
      for (let k = 1; ok && k < len; k++) ok = (buf[i + k] & 0xc0) === 0x80;
      if (ok) {
        seq++;
        i += len;
      } else {
        bad++;
        i++;
      }
    }
    sequences += seq;
    invalid += bad;
    kinds.push(bad > 0 ? 'legacy' : seq > 0 ? 'utf8' : 'ascii');
  }
  return { lines, kinds, sequences, invalid };
}

/** RFC 3629 section 4: no overlong forms (E0 A0.., F0 90..), no surrogates (ED ..9F), ≤ U+10FFFF. */
function validSecondByte(lead: number, second: number): boolean {
  if (lead === 0xe0) return second >= 0xa0;
  if (lead === 0xed) return second <= 0x9f;
  if (lead === 0xf0) return second >= 0x90;
  if (lead === 0xf4) return second <= 0x8f;
  return true;
}

/** The bytes of the given lines, joined (for guessing the legacy lines' encoding on their own). */
export function bytesOfLines(buf: Uint8Array, scan: LineScan, kind: LineKind): Uint8Array {
  const parts = scan.lines.filter((_, i) => scan.kinds[i] === kind);
  const out = new Uint8Array(parts.reduce((n, r) => n + r.end - r.start, 0));
  let at = 0;
  for (const r of parts) {
    out.set(buf.subarray(r.start, r.end), at);
    at += r.end - r.start;
  }
  return out;
}

/** Decode each line by its kind: UTF-8 lines as UTF-8, the others with `legacy`. */
export function decodeByLine(buf: Uint8Array, scan: LineScan, legacy: (bytes: Uint8Array) => string): string {
  const utf8 = new TextDecoder('utf-8', { ignoreBOM: true });
  const parts: string[] = [];
  // Consecutive lines read the same way are decoded in one call; ASCII lines read the same in
  // both, so they join whichever run they are in.
  let start = 0;
  let asLegacy = false;
  const flush = (end: number) => {
    if (end > start) parts.push(asLegacy ? legacy(buf.subarray(start, end)) : utf8.decode(buf.subarray(start, end)));
    start = end;
  };
  for (let i = 0; i < scan.lines.length; i++) {
    const kind = scan.kinds[i];
    if (kind === 'ascii' || (kind === 'legacy') === asLegacy) continue;
    flush(scan.lines[i].start);
    asLegacy = kind === 'legacy';
  }
  flush(buf.length);
  return parts.join('');
}

/** 1-based numbers of the lines of one kind. */
export function lineNumbers(scan: LineScan, kind: LineKind): number[] {
  const out: number[] = [];
  scan.kinds.forEach((k, i) => {
    if (k === kind) out.push(i + 1);
  });
  return out;
}

/**
 * In a file that is mostly UTF-8, a line with a few invalid bytes is more often damaged UTF-8
 * (a cut multi-byte character, a stray byte) than a line in another encoding. It reads as a
 * legacy line when every character above ASCII that the legacy reading gives is a letter next
 * to another letter, as in "Müller" or "été" (common practice).
 */
export function looksLikeLegacyWords(text: string): boolean {
  const chars = Array.from(text);
  let high = 0;
  for (let i = 0; i < chars.length; i++) {
    if ((chars[i].codePointAt(0) as number) < 0x80) continue;
    high++;
    const letter = /\p{L}/u;
    if (!letter.test(chars[i])) return false;
    if (!letter.test(chars[i - 1] ?? '') && !letter.test(chars[i + 1] ?? '')) return false;
  }
  return high > 0;
}
