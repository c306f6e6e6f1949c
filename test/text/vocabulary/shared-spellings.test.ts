import { describe, expect, it } from 'vitest';
import { foldSpelling, sharedSpellings } from '../../../src/text/vocabulary/shared-spellings.js';

describe('sharedSpellings', () => {
  it('links words spelled the same (case and diacritics folded) in two or more languages', () => {
    const surfaces = [
      ['wifi', 'taxi', 'café', 'library'], // en
      ['WiFi', 'taxi', 'biblioteca'], // es
      ['cafe', 'Taxi', 'bibliothek'], // de
    ];
    const counts = [Int32Array.of(6, 4, 3, 9), Int32Array.of(2, 10, 9), Int32Array.of(8, 5, 9)];
    const links = sharedSpellings(surfaces, counts);
    expect(links.map((l) => l.spelling)).toEqual(['cafe', 'taxi', 'wifi']);
    const taxi = links.find((l) => l.spelling === 'taxi')!;
    expect(taxi.members).toEqual([{ language: 0, word: 1 }, { language: 1, word: 1 }, { language: 2, word: 1 }]);
    // Half the rarest count: min(4, 10, 5) = 4 → 2 groups.
    expect(taxi.repeats).toBe(2);
    expect(links.find((l) => l.spelling === 'wifi')!.repeats).toBe(1);
  });

  it('leaves out rare words, short words and words of one language only', () => {
    const surfaces = [['ok', 'hotel', 'museum'], ['ok', 'hotel', 'museo']];
    const counts = [Int32Array.of(50, 1, 5), Int32Array.of(50, 7, 5)];
    expect(sharedSpellings(surfaces, counts)).toEqual([]);
    expect(sharedSpellings(surfaces, counts, { minCount: 1, minCharacters: 2 }).map((l) => l.spelling)).toEqual(['hotel', 'ok']);
  });

  it('keeps one word per language when two surfaces fold together', () => {
    const links = sharedSpellings([['Éclair', 'eclair'], ['eclair']], [Int32Array.of(3, 7), Int32Array.of(4)]);
    expect(links).toEqual([{ spelling: 'eclair', members: [{ language: 0, word: 1 }, { language: 1, word: 0 }], repeats: 2 }]);
  });

  it('folds diacritics and width (Unicode NFKD)', () => {
    expect(foldSpelling('Ｃａｆé')).toBe('cafe');
    expect(foldSpelling('Müsli')).toBe('musli');
  });
});
