import { describe, expect, it } from 'vitest';
import { removeInvisibles } from '../../../src/text/tokens/invisible.js';
import { isNonAnswer, tokenize } from '../../../src/text/tokens/index.js';
import { languageWords } from '../../../src/text/language/features.js';

const words = (text: string, language: string): string[] => tokenize(text, language).map((t) => t.normal);
const hex = (text: string): string[] => Array.from(text, (c) => (c.codePointAt(0) as number).toString(16));

// Outside check: the characters below are Default_Ignorable_Code_Point in Unicode's
// DerivedCoreProperties.txt (Unicode 15.1): U+00AD, U+061C, U+200B–U+200F, U+202A–U+202E,
// U+2060–U+206F, U+FEFF.
const FORMAT_CHARACTERS: readonly [string, string][] = [
  ['U+FEFF ZERO WIDTH NO-BREAK SPACE (byte-order mark)', '\uFEFF'],
  ['U+00AD SOFT HYPHEN', '\u00AD'],
  ['U+200C ZERO WIDTH NON-JOINER', '\u200C'],
  ['U+200D ZERO WIDTH JOINER', '\u200D'],
  ['U+200E LEFT-TO-RIGHT MARK', '\u200E'],
  ['U+200F RIGHT-TO-LEFT MARK', '\u200F'],
  ['U+202A LEFT-TO-RIGHT EMBEDDING', '\u202A'],
  ['U+202B RIGHT-TO-LEFT EMBEDDING', '\u202B'],
  ['U+202C POP DIRECTIONAL FORMATTING', '\u202C'],
  ['U+202D LEFT-TO-RIGHT OVERRIDE', '\u202D'],
  ['U+202E RIGHT-TO-LEFT OVERRIDE', '\u202E'],
  ['U+2060 WORD JOINER', '\u2060'],
  ['U+2066 LEFT-TO-RIGHT ISOLATE', '\u2066'],
  ['U+2069 POP DIRECTIONAL ISOLATE', '\u2069'],
  ['U+061C ARABIC LETTER MARK', '\u061C'],
];

describe('invisible format characters (Unicode DerivedCoreProperties.txt, Default_Ignorable_Code_Point)', () => {
  it('keeps U+FEFF out of Japanese words cut by Intl.Segmenter: 東京\\uFEFF大学 → 東京, 大学', () => {
    expect(words('東京\uFEFF大学', 'ja')).toEqual(['東京', '大学']);
    expect(words('东京\uFEFF大学', 'zh')).toEqual(words('东京大学', 'zh'));
  });

  it.each(FORMAT_CHARACTERS)('%s inside a word: the same word as without it (ja, th, de)', (_name, ch) => {
    expect(words(`東京${ch}大学に行きます`, 'ja')).toEqual(words('東京大学に行きます', 'ja'));
    expect(words(`สวัส${ch}ดีครับ`, 'th')).toEqual(words('สวัสดีครับ', 'th'));
    expect(words(`Ver${ch}waltung ist gut`, 'de')).toEqual(['verwaltung', 'ist', 'gut']);
  });

  it('treats U+200B ZERO WIDTH SPACE as a word break (UAX #29 §4.1.1: not Format)', () => {
    expect(words('parking\u200Bspaces', 'en')).toEqual(['parking', 'spaces']);
    expect(removeInvisibles('a\u200Bb')).toBe('a b');
  });

  it('removes bidi controls around a word (U+202B … U+202C, U+2067 … U+2069)', () => {
    expect(words('\u202Bparking\u202C \u2067hours\u2069', 'en')).toEqual(['parking', 'hours']);
    expect(words('\u200Fمرحبا\u200F', 'ar')).toEqual(['مرحبا']);
  });

  it('keeps ZWNJ inside a Persian word and ZWJ inside a Devanagari conjunct (Unicode Standard §23.2)', () => {
    expect(words('می\u200Cخواهم کتاب', 'fa')).toEqual(['می\u200Cخواهم', 'کتاب']);
    expect(words('क्\u200Dष', 'hi')).toEqual(['क्\u200Dष']);
  });

  it('drops ZWNJ and ZWJ between Latin letters', () => {
    expect(words('ab\u200Ccd ef\u200Dgh', 'en')).toEqual(['abcd', 'efgh']);
  });

  it('keeps emoji ZWJ sequences, variation selectors and tag sequences whole (UTS #51)', () => {
    const family = '\u{1F468}\u200D\u{1F469}\u200D\u{1F467}';
    const heart = '\u2764\uFE0F';
    const flag = '\u{1F3F4}\u{E0067}\u{E0062}\u{E0073}\u{E0063}\u{E0074}\u{E007F}';
    expect(removeInvisibles(`${family} ${heart} ${flag}`)).toBe(`${family} ${heart} ${flag}`);
    const emoji = tokenize(`${family} ${heart} ${flag}`, 'en', { keepEmoji: true }).map((t) => t.surface);
    expect(emoji.map(hex)).toEqual([family, heart, flag].map(hex));
  });

  it('recomposes a letter and its accent once the character between them is gone (UAX #15)', () => {
    expect(words('cafe\u00AD\u0301', 'fr')).toEqual(['café']);
  });

  it('leaves text without any unchanged (same string)', () => {
    const text = 'Öffnungszeiten 東京 مرحبا';
    expect(removeInvisibles(text)).toBe(text);
  });

  it('keeps words whole for language identification too', () => {
    expect(languageWords('Ver\u00ADwaltung \uFEFFgut')).toEqual(['verwaltung', 'gut']);
  });

  it('does not hide a non-answer: "\\uFEFFnothing", "no\\u00ADthing" (en)', () => {
    expect(isNonAnswer('\uFEFFnothing', 'en')).toBe(true);
    expect(isNonAnswer('no\u00ADthing', 'en')).toBe(true);
    expect(isNonAnswer('特に\u2060なし', 'ja')).toBe(true);
  });
});
