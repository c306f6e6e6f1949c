// Per-theme alignment across languages: agreement of the dominant theme between the two texts
// of a matched pair, against chance, with the Wilson rule deciding "aligned" (issue 12).
import { describe, expect, it } from 'vitest';
import { themeAlignment, wilsonLower, wordThemeMixture, type MatchedPair } from '../../src/eval/index.js';

const K = 4;
function peaked(k: number, strength = 0.7): Float64Array {
  const m = new Float64Array(K).fill((1 - strength) / (K - 1));
  m[k] = strength;
  return m;
}

describe('Wilson lower bound', () => {
  it('matches the score interval worked by hand for 8 of 10 (0.490 to 0.943)', () => {
    // (p + z²/2n ∓ z·√(p(1−p)/n + z²/4n²)) / (1 + z²/n) with p = 0.8, n = 10, z = 1.96:
    // (0.99208 ∓ 0.31361) / 1.38416 = 0.4902 … 0.9433.
    expect(wilsonLower(8, 10)).toBeCloseTo(0.4902, 4);
    expect(wilsonLower(0, 10)).toBeCloseTo(0, 12);
    expect(Number.isNaN(wilsonLower(0, 0))).toBe(true);
  });
});

describe('theme alignment', () => {
  it('finds every theme aligned when translations share their dominant theme', () => {
    const pairs: MatchedPair[] = Array.from({ length: 40 }, (_, i) => ({ languageA: 1, languageB: 0, mixtureA: peaked(i % K), mixtureB: peaked(i % K, 0.6) }));
    const r = themeAlignment(K, ['en', 'es'], pairs);
    expect(r.languagePairs).toEqual([{ languageA: 'en', languageB: 'es', pairs: 40, agreement: 1, chance: 0.25 }]);
    for (const c of r.cells) {
      expect(c.involving).toBe(10);
      expect(c.agreeing).toBe(10);
      // p_a = p_b = 1/4: chance = (1/16)/(1/2 − 1/16) = 1/7.
      expect(c.chance).toBeCloseTo(1 / 7, 12);
      expect(c.correlation).toBeCloseTo(1, 12);
      expect(c.status).toBe('aligned');
    }
    expect(r.themes.map((t) => t.status)).toEqual(['aligned', 'aligned', 'aligned', 'aligned']);
  });

  it('flags the theme whose translations land elsewhere, and only that one', () => {
    // Theme 3's English answers have Spanish partners led by themes 0, 1, 2 in turn.
    const pairs: MatchedPair[] = Array.from({ length: 48 }, (_, i) => {
      const k = i % K;
      return { languageA: 0, languageB: 1, mixtureA: peaked(k), mixtureB: peaked(k === 3 ? Math.floor(i / K) % 3 : k) };
    });
    const r = themeAlignment(K, ['en', 'es'], pairs);
    const byTheme = r.themes.map((t) => t.status);
    expect(byTheme).toEqual(['aligned', 'aligned', 'aligned', 'not aligned']);
    const c3 = r.cells.find((c) => c.theme === 3)!;
    expect(c3.agreeing).toBe(0);
    expect(c3.involving).toBe(12);
  });

  it('says "too few pairs" rather than judging on a handful', () => {
    const pairs: MatchedPair[] = [0, 1, 2].map((k) => ({ languageA: 0, languageB: 1, mixtureA: peaked(k), mixtureB: peaked(k) }));
    const r = themeAlignment(K, ['en', 'es'], pairs, { minPairs: 5 });
    expect(r.themes.every((t) => t.status === 'too few pairs')).toBe(true);
    expect(r.cells.find((c) => c.theme === 3)!.involving).toBe(0);
  });

  it('agrees with chance when partners are paired at random (simulation)', () => {
    // Independent dominant themes: the mean agreement over many shuffles tends to the formula.
    let seed = 7;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    const pairs: MatchedPair[] = Array.from({ length: 4000 }, () => ({ languageA: 0, languageB: 1, mixtureA: peaked(Math.floor(rand() * K)), mixtureB: peaked(rand() < 0.5 ? 0 : Math.floor(rand() * K)) }));
    const r = themeAlignment(K, ['en', 'es'], pairs);
    for (const c of r.cells) expect(Math.abs(c.agreement - c.chance)).toBeLessThan(0.03);
    expect(Math.abs(r.languagePairs[0].agreement - r.languagePairs[0].chance)).toBeLessThan(0.02);
    expect(r.themes.every((t) => t.status === 'not aligned')).toBe(true);
  });
});

describe('theme mixture of a few words', () => {
  it('averages p(k | w) ∝ π_k φ_kw over known words and skips unknown ones', () => {
    // K = 2, V = 2: φ_0 = [0.8, 0.2], φ_1 = [0.2, 0.8].
    const phi = Float64Array.from([0.8, 0.2, 0.2, 0.8]);
    const m = wordThemeMixture(phi, 2, [0, -1, 5], [1, 1])!;
    expect(Array.from(m)).toEqual([0.8, 0.2].map((x) => expect.closeTo(x, 12)));
    const weighted = wordThemeMixture(phi, 2, [0, 1], [1, 3])!;
    // word 0: (0.8, 0.6)/1.4; word 1: (0.2, 2.4)/2.6; mean of the two.
    expect(weighted[0]).toBeCloseTo((0.8 / 1.4 + 0.2 / 2.6) / 2, 12);
    expect(wordThemeMixture(phi, 2, [-1], [1, 1])).toBeNull();
  });
});
