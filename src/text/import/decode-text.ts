// Bytes of a text file → a JS string, with the encoding that was assumed and how sure we are.
//
// Order: a byte-order mark decides (Unicode Standard 15.0, section 3.10 / 23.8); else bytes that
// are valid UTF-8 are UTF-8 (a legacy single-byte text with any byte ≥ 0x80 is almost never
// valid UTF-8 by accident — "UTF-8, a transformation format of ISO 10646", RFC 3629 (2003),
// section 10); else the pattern of zero bytes of BOM-less UTF-16; else the statistical guess of
// chardet (ICU's charset detectors). ISO-8859-1 is read as windows-1252, as browsers do (WHATWG
// Encoding Standard, section 4.2 "Names and labels"), which only differs in 0x80–0x9F, where
// ISO-8859-1 has unprintable control characters.
//
// A file that is not valid UTF-8 as a whole may still hold whole lines of UTF-8 beside lines in
// a legacy single-byte encoding (an answer pasted in from another program): then each line is
// read in its own encoding (decode-lines.ts) and the reader says which lines were which.

import chardet from 'chardet';
import iconv from 'iconv-lite';
import { InputError } from '../types.js';
import { checkMojibake } from './mojibake.js';
import { bytesOfLines, decodeByLine, lineNumbers, looksLikeLegacyWords, scanLines, type LineScan } from './decode-lines.js';

export interface DecodedText {
  readonly text: string;
  readonly encoding: string;
  /** 0..1; 1 for a byte-order mark or valid UTF-8. */
  readonly confidence: number;
  /** Set when lines were read in different encodings: which lines (1-based) in which. */
  readonly byLine?: { readonly legacyEncoding: string; readonly utf8Lines: number[]; readonly legacyLines: number[] };
  /** A UTF-8 file with some invalid bytes: the lines (1-based) where U+FFFD replaced them. */
  readonly damagedLines?: number[];
}

const utf8Strict = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
/** Decodes a Uint16Array of code units: its bytes are in the platform's byte order. */
const codeUnits = new TextDecoder(new Uint8Array(Uint16Array.of(1).buffer)[0] === 1 ? 'utf-16le' : 'utf-16be', { ignoreBOM: true });

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

/** Legacy encodings with one byte per character: only these are mixed line by line with UTF-8. */
const SINGLE_BYTE = new Set(Object.values(LEGACY_NAMES).filter((n) => /^(windows-125\d|ISO-8859-\d+|KOI8-R)$/.test(n)));

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
  const scan = scanLines(buf);
  // Legacy single-byte text almost never forms valid multi-byte UTF-8 sequences (RFC 3629,
  // section 10), so many valid sequences and a few bad bytes mean a damaged UTF-8 file, which
  // is better read as UTF-8 with U+FFFD at the bad bytes than as mojibake (common practice).
  const damaged = scan.sequences >= 3 && scan.invalid <= Math.max(1, 0.02 * scan.sequences);
  if (scan.kinds.includes('utf8') && scan.kinds.includes('legacy')) {
    const mixed = decodeMixed(buf, scan, damaged, fileName);
    if (mixed !== null) return mixed;
  }
  if (damaged) {
    const text = new TextDecoder('utf-8', { ignoreBOM: true }).decode(buf);
    const decoded = checked(text, 'UTF-8', Math.max(0.5, 1 - scan.invalid / scan.sequences), fileName);
    return { ...decoded, damagedLines: lineNumbers(scan, 'legacy') };
  }
  const guess = guessLegacy(buf);
  if (guess === null) {
    throw new InputError(
      `${fileName}: the text is not valid UTF-8 and its encoding could not be recognised. ` +
        'Save the file as "CSV UTF-8" (or UTF-8 text) and import it again.',
      fileName,
    );
  }
  return checked(decodeLegacy(buf, guess.name), guess.name, guess.confidence, fileName);
}

/**
 * Lines in UTF-8 beside lines in one legacy single-byte encoding (decode-lines.ts): each line is
 * read in its own encoding. The legacy lines' encoding is guessed from those lines alone, so the
 * UTF-8 lines do not blur the guess. Null when the file is better read as one encoding.
 */
function decodeMixed(buf: Buffer, scan: LineScan, damaged: boolean, fileName: string): DecodedText | null {
  const legacyBytes = Buffer.from(bytesOfLines(buf, scan, 'legacy'));
  const guess = guessLegacy(legacyBytes);
  if (guess === null || !SINGLE_BYTE.has(guess.name)) return null;
  if (damaged && !looksLikeLegacyWords(decodeLegacy(legacyBytes, guess.name))) return null;
  const text = decodeByLine(buf, scan, (bytes) => decodeLegacy(bytes, guess.name));
  const decoded = checked(text, `${guess.name}, UTF-8 in some lines`, guess.confidence, fileName);
  return { ...decoded, byLine: { legacyEncoding: guess.name, utf8Lines: lineNumbers(scan, 'utf8'), legacyLines: lineNumbers(scan, 'legacy') } };
}

/**
 * windows-1252 as the WHATWG Encoding Standard's index reads it: the five unassigned bytes 0x81,
 * 0x8D, 0x8F, 0x90 and 0x9D become U+0081…U+009D instead of U+FFFD, so a UTF-8 answer misread in
 * such a file keeps every byte and can be repaired (encoding-notes.ts). iconv-lite gives the
 * assigned characters; other legacy encodings go through iconv-lite as they are.
 */
const WINDOWS_1252 = Uint16Array.from({ length: 256 }, (_, b) => {
  const c = iconv.decode(Buffer.from([b]), 'windows-1252').charCodeAt(0);
  return c === 0xfffd ? b : c;
});

function decodeLegacy(bytes: Uint8Array, name: string): string {
  if (name !== 'windows-1252') return iconv.decode(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), name);
  // Code units through the UTF-16 decoder, in chunks so a large file needs no second copy.
  const parts: string[] = [];
  const chunk = new Uint16Array(Math.max(1, Math.min(bytes.length, 1 << 16)));
  for (let start = 0; start < bytes.length; start += chunk.length) {
    const n = Math.min(chunk.length, bytes.length - start);
    for (let i = 0; i < n; i++) chunk[i] = WINDOWS_1252[bytes[start + i]];
    parts.push(codeUnits.decode(chunk.subarray(0, n)));
  }
  return parts.join('');
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
  // Misread UTF-8 (mojibake.ts) holds U+0080–U+009F too, e.g. "す" as "ã\u0081™"; it is repaired
  // after parsing, so its characters are not garbage. Counted again only on this rare path.
  if (text.length > 0 && bad > 0.02 * text.length && bad > 2) bad = badCharacters(text.replace(/[^\x00-\x7f]+/g, (run) => checkMojibake(run).fixed ?? run));
  if (text.length > 0 && bad > 0.02 * text.length && bad > 2) {
    throw new InputError(
      `${fileName}: read as ${encoding}, the text is full of control or unreadable characters ` +
        `(${bad} of ${text.length}). Is it really a text file? Save it as UTF-8 and import it again.`,
      fileName,
    );
  }
  return { text, encoding, confidence };
}

function badCharacters(text: string): number {
  let bad = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if ((c < 0x20 && c !== 9 && c !== 10 && c !== 13) || (c >= 0x7f && c <= 0x9f) || c === 0xfffd) bad++;
  }
  return bad;
}
