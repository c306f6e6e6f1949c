// Mojibake: UTF-8 bytes that were read as windows-1252 (or Latin-1), so "é" shows as "Ã©",
// "ä" as "Ã¤", "’" as "â€™" and Japanese "あ" as "ã‚". It comes from a file read with the wrong
// encoding, or from answers converted to UTF-8 twice before they reached Themata.
//
// Recognising it: map each character back to the windows-1252 byte it came from and check that
// the bytes form valid multi-byte UTF-8. Text really written in a single-byte encoding almost
// never does, because UTF-8 needs a lead byte 0xC2–0xF4 followed by exactly the right number of
// continuation bytes 0x80–0xBF ("UTF-8, a transformation format of ISO 10646", RFC 3629 (2003),
// sections 4 and 10). Only UTF-8 misread as windows-1252/Latin-1 is handled: it is by far the
// most frequent case in survey exports (common practice).
import iconv from 'iconv-lite';

/** Code point → the windows-1252 byte (0x80–0xFF) that decodes to it; Latin-1's C1 controls too. */
const BYTE_OF = new Map<number, number>();
for (let b = 0x80; b <= 0xff; b++) {
  const ch = iconv.decode(Buffer.from([b]), 'windows-1252');
  if (ch !== '\ufffd') BYTE_OF.set(ch.codePointAt(0) as number, b);
  // ISO-8859-1 (and the WHATWG reading of windows-1252's five unassigned bytes) gives U+0080–U+009F.
  if (b <= 0x9f && !BYTE_OF.has(b)) BYTE_OF.set(b, b);
}

const CONTINUATION_CHARS = [...BYTE_OF].filter(([, b]) => b >= 0x80 && b <= 0xbf).map(([cp]) => cp);
const escape = (cp: number) => `\\u${cp.toString(16).padStart(4, '0')}`;
/** A lead character (bytes 0xC2–0xF4 are U+00C2–U+00F4 in windows-1252) then a continuation one. */
const SUSPECT = new RegExp(`[\\u00c2-\\u00f4][${CONTINUATION_CHARS.map(escape).join('')}]`, 'u');

const utf8Strict = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });

export interface MojibakeCheck {
  /** Multi-byte UTF-8 sequences found spelled as windows-1252 characters. */
  readonly sequences: number;
  /**
   * Of those, the ones real text practically never spells: "Â" or "Ã" plus a symbol or letter
   * (Latin-1 letters misread, "Ã©" for "é"), "â€"/"â‚" plus one (punctuation, "â€™" for "’"),
   * and "ã€"/"ã‚"/"ãƒ"/"ã\u0081" plus one (kana and CJK punctuation). Common practice.
   */
  readonly strong: number;
  /**
   * The text re-decoded as UTF-8 when that clearly fixes it: every character above ASCII belongs
   * to such a sequence, and each one decodes to a character of a script answers are written in.
   * Otherwise null. (Whether one sequence is evidence enough is the caller's call.)
   */
  readonly fixed: string | null;
}

const NONE: MojibakeCheck = { sequences: 0, strong: 0, fixed: null };

/** Quick test: can `text` hold mojibake at all? (Most cells of a clean file fail it at once.) */
export function mayHoldMojibake(text: string): boolean {
  return SUSPECT.test(text);
}

/** Look for UTF-8 read as windows-1252 in `text`; re-decode it when that clearly fixes it. */
export function checkMojibake(text: string): MojibakeCheck {
  if (!mayHoldMojibake(text)) return NONE;
  let sequences = 0;
  let strong = 0;
  let clean = true;
  let out = '';
  let last = 0;
  let offset = 0;
  const chars = Array.from(text);
  for (let i = 0; i < chars.length; ) {
    const cp = chars[i].codePointAt(0) as number;
    if (cp < 0x80) {
      offset += chars[i].length;
      i++;
      continue;
    }
    // A run of characters above ASCII that all have a windows-1252 byte: a misread UTF-8
    // character is always one such run or part of one (its bytes are all 0x80 or more).
    const start = offset;
    const bytes: number[] = [];
    while (i < chars.length) {
      const c = chars[i].codePointAt(0) as number;
      const b = c < 0x80 ? undefined : BYTE_OF.get(c);
      if (b === undefined) break;
      bytes.push(b);
      offset += chars[i].length;
      i++;
    }
    if (bytes.length === 0) {
      // A character windows-1252 does not have (中, ☃): real text, not a misreading.
      clean = false;
      offset += chars[i].length;
      i++;
      continue;
    }
    const decoded = decodeSequences(bytes);
    sequences += decoded.sequences;
    strong += decoded.strong;
    if (decoded.text === null) {
      clean = false;
      continue;
    }
    out += text.slice(last, start) + decoded.text;
    last = offset;
  }
  if (sequences === 0) return NONE;
  return { sequences, strong, fixed: clean ? out + text.slice(last) : null };
}

/** Repeat the check: text converted twice or more needs more than one re-decoding. */
export function fixMojibake(text: string): MojibakeCheck {
  const first = checkMojibake(text);
  if (first.fixed === null) return first;
  let current = first.fixed;
  for (let round = 1; round < 3; round++) {
    const next = checkMojibake(current);
    if (next.fixed === null) break;
    current = next.fixed;
  }
  return { ...first, fixed: current };
}

/**
 * Bytes of one run → its plausible multi-byte UTF-8 sequences (RFC 3629, section 4 table), and
 * the decoded run when every byte belongs to one (null otherwise).
 */
function decodeSequences(bytes: number[]): { sequences: number; strong: number; text: string | null } {
  let n = 0;
  let strong = 0;
  let whole = true;
  let text = '';
  for (let i = 0; i < bytes.length; ) {
    const b = bytes[i];
    const len = b >= 0xc2 && b <= 0xdf ? 2 : b >= 0xe0 && b <= 0xef ? 3 : b >= 0xf0 && b <= 0xf4 ? 4 : 0;
    let ok = len > 0 && i + len <= bytes.length;
    for (let k = 1; ok && k < len; k++) ok = bytes[i + k] >= 0x80 && bytes[i + k] <= 0xbf;
    const ch = ok ? decodeStrict(bytes.slice(i, i + len)) : null;
    if (ch !== null && plausible(ch.codePointAt(0) as number)) {
      n++;
      if (b === 0xc2 || b === 0xc3 || ((b === 0xe2 || b === 0xe3) && bytes[i + 1] <= 0x83)) strong++;
      text += ch;
      i += len;
    } else {
      whole = false;
      i++;
    }
  }
  return { sequences: n, strong, text: whole ? text : null };
}

function decodeStrict(bytes: number[]): string | null {
  try {
    return utf8Strict.decode(Uint8Array.from(bytes));
  } catch {
    return null;
  }
}

/**
 * Blocks that answers are written in (common practice): Latin-1, Latin Extended and IPA letters
 * (ɛ, ɔ, ə), modifier letters, combining accents, Greek, Cyrillic, Armenian, Hebrew, Arabic; the
 * scripts of South and South-East Asia, Tibetan, Georgian, Ethiopic, Cherokee, Canadian
 * syllabics, Khmer, Mongolian; Vietnamese and Greek extended letters; punctuation and symbols;
 * CJK, kana and Hangul; full-width forms; emoji and rare CJK. A misreading that would give
 * Syriac, Thaana, NKo or a control character (e.g. "ß€" → U+07C0, "ß“" → U+07D3) is real text
 * that only looks like mojibake.
 */
function plausible(cp: number): boolean {
  return (
    (cp >= 0xa0 && cp <= 0x6ff) ||
    (cp >= 0x900 && cp <= 0x1dff) ||
    (cp >= 0x1e00 && cp <= 0x2bff) ||
    (cp >= 0x3000 && cp <= 0x9fff) ||
    (cp >= 0xac00 && cp <= 0xd7a3) ||
    (cp >= 0xff00 && cp <= 0xffef) ||
    (cp >= 0x1f000 && cp <= 0x1faff) ||
    (cp >= 0x20000 && cp <= 0x2ffff)
  );
}
