import { describe, expect, it } from 'vitest';
import { fromIso6393, knownLanguageSubtags, normalizeLanguageTag, toIso6393 } from '../../src/text/language-tags.js';

describe('normalizeLanguageTag', () => {
  // ISO 639-1 two-letter codes (ISO 639-1:2002 code list).
  it.each([
    ['en', 'en'],
    ['ES', 'es'],
    [' de ', 'de'],
    ['zh', 'zh'],
  ])('accepts the ISO 639-1 code %j', (tag, expected) => expect(normalizeLanguageTag(tag)).toBe(expected));

  // ISO 639-3 and ISO 639-2/B codes (SIL ISO 639-3 code tables: eng, spa, fra/fre, deu/ger, cmn, zho, jpn).
  it.each([
    ['eng', 'en'],
    ['spa', 'es'],
    ['fra', 'fr'],
    ['fre', 'fr'],
    ['deu', 'de'],
    ['ger', 'de'],
    ['cmn', 'zh'],
    ['zho', 'zh'],
    ['chi', 'zh'],
    ['jpn', 'ja'],
    ['arb', 'ar'],
    ['ara', 'ar'],
    ['nld', 'nl'],
    ['dut', 'nl'],
  ])('accepts the ISO 639-2/3 code %j', (tag, expected) => expect(normalizeLanguageTag(tag)).toBe(expected));

  // BCP 47 tags with script and region subtags (RFC 5646 (2009), section 2.1 examples).
  it.each([
    ['en-GB', 'en'],
    ['zh-Hant-TW', 'zh'],
    ['zh-Hans', 'zh'],
    ['pt-BR', 'pt'],
    ['sr-Latn-RS', 'sr'],
    ['es-419', 'es'],
    ['pt_BR', 'pt'],
    ['de_DE.UTF-8', 'de'],
  ])('reduces the BCP 47 tag %j to its primary language subtag', (tag, expected) =>
    expect(normalizeLanguageTag(tag)).toBe(expected),
  );

  it.each([
    ['English', 'en'],
    ['SPANISH', 'es'],
    ['german', 'de'],
    ['Chinese (Simplified)', 'zh'],
    ['Mandarin', 'zh'],
    ['Español', 'es'],
    ['Deutsch', 'de'],
    ['français', 'fr'],
    ['中文', 'zh'],
    ['Norwegian Bokmål', 'nb'],
  ])('accepts the language name %j', (tag, expected) => expect(normalizeLanguageTag(tag)).toBe(expected));

  it.each([['iw', 'he'], ['in', 'id'], ['no', 'nb'], ['tl', 'fil']])(
    'maps the deprecated or macrolanguage code %j to %j (IANA subtag registry Preferred-Value)',
    (tag, expected) => expect(normalizeLanguageTag(tag)).toBe(expected),
  );

  it.each(['', '  ', 'und', 'mul', 'xx', 'qqq', 'Klingonish', '12', 'e', 'en GB x', 'yes'])(
    'returns null for %j, which is not a known language',
    (tag) => expect(normalizeLanguageTag(tag)).toBeNull(),
  );
});

describe('toIso6393', () => {
  // franc 6.2.0 reports individual-language codes (node_modules/franc/data.js): cmn, arb, pes, zlm, swh.
  it.each([
    ['en', 'eng'],
    ['es', 'spa'],
    ['zh', 'cmn'],
    ['ar', 'arb'],
    ['fa', 'pes'],
    ['ms', 'zlm'],
    ['sw', 'swh'],
    ['de-AT', 'deu'],
    ['French', 'fra'],
    ['fil', 'tgl'],
  ])('gives the detector code for %j', (tag, expected) => expect(toIso6393(tag)).toBe(expected));

  it('returns null for an unknown subtag', () => expect(toIso6393('xx')).toBeNull());

  it('round-trips every known subtag through fromIso6393', () => {
    const known = knownLanguageSubtags();
    expect(known.length).toBeGreaterThanOrEqual(40);
    for (const subtag of known) expect(fromIso6393(toIso6393(subtag)!)).toBe(subtag);
  });
});
