// Invisible format characters: byte-order marks left inside a cell (U+FEFF), zero-width spaces,
// soft hyphens, bidirectional controls (U+202A–U+202E, U+2066–U+2069, U+200E/U+200F, U+061C),
// word joiners, variation selectors… They are Default_Ignorable_Code_Point in Unicode's
// DerivedCoreProperties.txt ("should be ignored in rendering unless explicitly supported"), so a
// word written with one is the same word written without it. Left in, they glue themselves to
// words ("東京\uFEFF" from Intl.Segmenter) or cut words apart ("Ver\u00ADwaltung").
//
// What is kept, because a script or an emoji needs it (The Unicode Standard 15.0, §23.2 "Layout
// Controls", and Unicode Technical Standard #51 "Unicode Emoji", §1.4 and §2.3):
// - ZWNJ U+200C and ZWJ U+200D between two characters of a script that uses them to choose
//   letter shapes: Arabic script (Persian "می‌خواهم", Urdu), Syriac, the Indic scripts (half forms
//   and explicit virama) and Sinhala, Mongolian. Elsewhere they are dropped.
// - ZWJ inside an emoji ZWJ sequence, variation selectors after an emoji, and tag characters
//   inside an emoji tag sequence (subdivision flags), so that emoji stay whole when kept.
// U+200B ZERO WIDTH SPACE is a word break (it is not "Format" for word boundaries, Unicode
// Standard Annex #29 "Unicode Text Segmentation", §4.1.1 Table 3), so it becomes a space.

const DEFAULT_IGNORABLE = /\p{Default_Ignorable_Code_Point}/u;
const DEFAULT_IGNORABLE_ALL = /\p{Default_Ignorable_Code_Point}/gu;
const JOINING_SCRIPT =
  /[\p{Script_Extensions=Arabic}\p{Script_Extensions=Syriac}\p{Script_Extensions=Devanagari}\p{Script_Extensions=Bengali}\p{Script_Extensions=Gurmukhi}\p{Script_Extensions=Gujarati}\p{Script_Extensions=Oriya}\p{Script_Extensions=Tamil}\p{Script_Extensions=Telugu}\p{Script_Extensions=Kannada}\p{Script_Extensions=Malayalam}\p{Script_Extensions=Sinhala}\p{Script_Extensions=Mongolian}]/u;
const JOINING_LETTER = /[\p{L}\p{M}]/u;
const PICTOGRAPH = /\p{Extended_Pictographic}/u;
const EMOJI_BEFORE_JOINER = /[\p{Extended_Pictographic}\p{Emoji_Modifier}\uFE0F\u{E007F}]/u;
const EMOJI_BASE = /[\p{Emoji}\p{Emoji_Modifier}]/u;
const ZWNJ = 0x200c;
const ZWJ = 0x200d;
const ZWSP = 0x200b;
const BLACK_FLAG = 0x1f3f4;

function isVariationSelector(cp: number): boolean {
  return (cp >= 0xfe00 && cp <= 0xfe0f) || (cp >= 0xe0100 && cp <= 0xe01ef);
}

function isTag(cp: number): boolean {
  return cp >= 0xe0020 && cp <= 0xe007f;
}

/** The code point that ends just before `offset` (surrogate pairs read whole). */
function before(text: string, offset: number): string {
  if (offset === 0) return '';
  const low = text.charCodeAt(offset - 1);
  if (low >= 0xdc00 && low <= 0xdfff && offset >= 2) return text.slice(offset - 2, offset);
  return text[offset - 1];
}

/** The code point that starts at `offset`. */
function at(text: string, offset: number): string {
  const cp = text.codePointAt(offset);
  return cp === undefined ? '' : String.fromCodePoint(cp);
}

function keeps(cp: number, text: string, offset: number, width: number): boolean {
  const prev = before(text, offset);
  if (prev === '') return false;
  if (cp === ZWNJ || cp === ZWJ) {
    const next = at(text, offset + width);
    if (JOINING_SCRIPT.test(prev) && JOINING_LETTER.test(prev) && JOINING_SCRIPT.test(next) && JOINING_LETTER.test(next)) return true;
    return cp === ZWJ && EMOJI_BEFORE_JOINER.test(prev) && PICTOGRAPH.test(next);
  }
  if (isVariationSelector(cp)) return EMOJI_BASE.test(prev);
  if (isTag(cp)) {
    const p = prev.codePointAt(0) as number;
    return p === BLACK_FLAG || isTag(p);
  }
  return false;
}

/**
 * Drops default-ignorable code points (DerivedCoreProperties.txt) that no script or emoji needs
 * at their place, and turns U+200B ZERO WIDTH SPACE into a space. Text without any is returned
 * as it is.
 */
export function removeInvisibles(text: string): string {
  if (!DEFAULT_IGNORABLE.test(text)) return text;
  return text.replace(DEFAULT_IGNORABLE_ALL, (match: string, offset: number, whole: string) => {
    const cp = match.codePointAt(0) as number;
    if (cp === ZWSP) return ' ';
    return keeps(cp, whole, offset, match.length) ? match : '';
  });
}
