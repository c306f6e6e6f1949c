// Bytes of a text file → a JS string, with the encoding that was assumed and how sure we are.
//
// Order: a byte-order mark decides (Unicode Standard 15.0, section 3.10 / 23.8); else bytes that
// are valid UTF-8 are UTF-8 (a legacy single-byte text with any byte ≥ 0x80 is almost never
// valid UTF-8 by accident — "UTF-8, a transformation format of ISO 10646", RFC 3629 (2003),
// section 10); else the pattern of zero bytes of BOM-less UTF-16; else the statistical guess of
// chardet (ICU's charset detectors). ISO-8859-1 is read as windows-1252, as browsers do (WHATWG
// Encoding Standard, section 4.2 "Names and labels"), which only differs in 0x80–0x9F, where
// ISO-8859-1 has unprintable control characters.

import chardet from 'chardet';
import iconv from 'iconv-lite';
import { InputError } from '../types.js';

export interface DecodedText {
  readonly text: string;
  readonly encoding: string;
  /** 0..1; 1 for a byte-order mark or valid UTF-8. */
  readonly confidence: number;
}

const utf8Strict = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });

/** chardet candidate names that iconv-lite reads, mapped to the name we report. */
const LEGACY_NAMES: Readonly<Record<string, string>> = {
  'ISO-8859-1': 'windows-1252',
  'ISO-8859-2': 'ISO-8859-2',
  'ISO-8859-5': 'ISO-8859-5',
  'ISO-8859-6': 'ISO-8859-6',
  'ISO-8859-7': 'ISO-8859-7',
  'ISO-8859-8': 'ISO-8859-8',
  'ISO-8859-9': 'ISO-8859-9',
  'windows-1250': 'windows-1250',
  'windows-1251': 'windows-1251',
  'windows-1252': 'windows-1252',
  'windows-1253': 'windows-1253',
  'windows-1254': 'windows-1254',
  'windows-1255': 'windows-1255',
  'windows-1256': 'windows-1256',
  'windows-1257': 'windows-1257',
  'windows-1258': 'windows-1258',
  'KOI8-R': 'KOI8-R',
  Shift_JIS: 'Shift_JIS',
  'EUC-JP': 'EUC-JP',
  'EUC-KR': 'EUC-KR',
  GB18030: 'GB18030',
  Big5: 'Big5',
};

/** Decode `bytes` (a whole text file); throws InputError when no encoding reads it sensibly. */
export function decodeText(bytes: Uint8Array, fileName: string): DecodedText {
  const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (buf.length >= 3 && buf[0] === 0xef && buf[1] === 0xbb && buf[2] === 0xbf) {
    return checked(decodeUtf8(buf.subarray(3), fileName), 'UTF-8', 1, fileName);
  }
  if (buf.length >= 2 && buf[0] === 0xff && buf[1] === 0xfe) {
    return checked(iconv.decode(buf.subarray(2), 'utf-16le'), 'UTF-16LE', 1, fileName);
  }
  if (buf.length >= 2 && buf[0] === 0xfe && buf[1] === 0xff) {
    return checked(iconv.decode(buf.subarray(2), 'utf-16be'), 'UTF-16BE', 1, fileName);
  }
  const utf16 = guessBomlessUtf16(buf);
  if (utf16 !== null) return checked(iconv.decode(buf, utf16.toLowerCase()), utf16, 0.8, fileName);

  try {
    return checked(utf8Strict.decode(buf), 'UTF-8', 1, fileName);
  } catch {
    // Not strictly UTF-8: a few damaged bytes in a UTF-8 file, or a legacy encoding.
  }
  const { sequences, invalid } = scanUtf8(buf);
  // Legacy single-byte text almost never forms valid multi-byte UTF-8 sequences (RFC 3629,
  // section 10), so many valid sequences and a few bad bytes mean a damaged UTF-8 file, which
  // is better read as UTF-8 with U+FFFD at the bad bytes than as mojibake (common practice).
  if (sequences >= 3 && invalid <= Math.max(1, 0.02 * sequences)) {
    const text = new TextDecoder('utf-8', { ignoreBOM: true }).decode(buf);
    return checked(text, 'UTF-8', Math.max(0.5, 1 - invalid / sequences), fileName);
  }
  const guess = guessLegacy(buf);
  if (guess === null) {
    throw new InputError(
      `${fileName}: the text is not valid UTF-8 and its encoding could not be recognised. ` +
        'Save the file as "CSV UTF-8" (or UTF-8 text) and import it again.',
      fileName,
    );
  }
  return checked(iconv.decode(buf, guess.name), guess.name, guess.confidence, fileName);
}

/** Valid multi-byte UTF-8 sequences and bytes that cannot start or continue one (RFC 3629, section 4). */
function scanUtf8(buf: Buffer): { sequences: number; invalid: number } {
  let sequences = 0;
  let invalid = 0;
  let i = 0;
  const n = buf.length;
  while (i < n) {
    const b = buf[i];
    if (b < 0x80) {
      i++;
      continue;
    }
    const len = b >= 0xc2 && b <= 0xdf ? 2 : b >= 0xe0 && b <= 0xef ? 3 : b >= 0xf0 && b <= 0xf4 ? 4 : 0;
    let ok = len > 0 && i + len <= n;
    for (let k = 1; ok && k < len; k++) ok = (buf[i + k] & 0xc0) === 0x80;
    if (ok) {
      sequences++;
      i += len;
    } else {
      invalid++;
      i++;
    }
  }
  return { sequences, invalid };
}

function decodeUtf8(buf: Buffer, fileName: string): string {
  try {
    return utf8Strict.decode(buf);
  } catch {
    throw new InputError(
      `${fileName}: the file starts with a UTF-8 byte-order mark but contains bytes that are not ` +
        'valid UTF-8. Re-save it as UTF-8 and import it again.',
      fileName,
    );
  }
}

/**
 * BOM-less UTF-16: text that is mostly Latin script has a zero in every other byte. Common
 * practice heuristic: at least 40% of the even (or odd) bytes of the first 4 KB are zero and
 * almost none of the others are.
 */
function guessBomlessUtf16(buf: Buffer): 'UTF-16LE' | 'UTF-16BE' | null {
  const n = Math.min(buf.length, 4096) & ~1;
  if (n < 4) return null;
  let evenZero = 0;
  let oddZero = 0;
  for (let i = 0; i < n; i += 2) {
    if (buf[i] === 0) evenZero++;
    if (buf[i + 1] === 0) oddZero++;
  }
  const pairs = n / 2;
  if (oddZero >= 0.4 * pairs && evenZero <= 0.05 * pairs) return 'UTF-16LE';
  if (evenZero >= 0.4 * pairs && oddZero <= 0.05 * pairs) return 'UTF-16BE';
  return null;
}

function guessLegacy(buf: Buffer): { name: string; confidence: number } | null {
  const sample = buf.subarray(0, 1 << 20);
  const candidates = chardet
    .analyse(sample)
    .filter((m) => LEGACY_NAMES[m.name] !== undefined && m.confidence > 0);
  if (candidates.length === 0) return null;
  const best = candidates[0];
  // chardet often ties windows-1252 with another Latin set on short texts; prefer the most
  // common legacy encoding of Western survey exports on a tie (common practice).
  const western = candidates.find(
    (m) => LEGACY_NAMES[m.name] === 'windows-1252' && m.confidence >= best.confidence,
  );
  const chosen = western ?? best;
  return { name: LEGACY_NAMES[chosen.name], confidence: Math.min(1, chosen.confidence / 100) };
}

/**
 * Refuse text that decoded into garbage: NUL characters (a binary file, or UTF-16 we did not
 * recognise) or many control / replacement characters (common practice threshold: 2%).
 */
function checked(text: string, encoding: string, confidence: number, fileName: string): DecodedText {
  let bad = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 0) {
      throw new InputError(
        `${fileName}: the file contains NUL bytes, so it is not a text file in ${encoding}. ` +
          'If it is a spreadsheet or SPSS file, give it its usual extension (.xlsx, .sav); ' +
          'otherwise save it as UTF-8 text.',
        fileName,
      );
    }
    if ((c < 0x20 && c !== 9 && c !== 10 && c !== 13) || (c >= 0x7f && c <= 0x9f) || c === 0xfffd) bad++;
  }
  if (text.length > 0 && bad > 0.02 * text.length && bad > 2) {
    throw new InputError(
      `${fileName}: read as ${encoding}, the text is full of control or unreadable characters ` +
        `(${bad} of ${text.length}). Is it really a text file? Save it as UTF-8 and import it again.`,
      fileName,
    );
  }
  return { text, encoding, confidence };
}
