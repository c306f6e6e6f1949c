// Suggested labels: words ranked by relevance (Sievert & Shirley, ACL workshop 2014), the label
// in the first language with the other languages' words beside it, and labels that tell themes apart.
import { describe, expect, it } from 'vitest';
import { relevance, relevantWords, suggestThemeLabels } from '../../src/eval/index.js';

// K = 2, one word ("park") common to both themes, two distinctive words each.
const en = ['park', 'swings', 'fence', 'toilets', 'smell'];
const phiEn = Float64Array.from([
  0.4, 0.35, 0.2, 0.025, 0.025, // theme 0
  0.4, 0.025, 0.025, 0.35, 0.2, // theme 1
]);
const es = ['parque', 'columpios', 'baños'];
const phiEs = Float64Array.from([
  0.5, 0.45, 0.05, // theme 0
  0.5, 0.05, 0.45, // theme 1
]);

describe('relevance', () => {
  it('is λ·log φ + (1 − λ)·log(φ / p), and −∞ for a word the theme never uses', () => {
    expect(relevance(0.35, 0.1875, 0.6)).toBeCloseTo(0.6 * Math.log(0.35) + 0.4 * Math.log(0.35 / 0.1875), 12);
    expect(relevance(0, 0.1, 0.6)).toBe(-Infinity);
  });

  it('moves from probability order (λ = 1) to lift order (λ = 0), with the paper’s λ = 0.6 between', () => {
    // p_w with equal theme weights: park .4, swings .1875, fence .1125.
    expect(relevantWords(phiEn, 2, 0, [1, 1], 1, 3)).toEqual([0, 1, 2]); // park, swings, fence
    expect(relevantWords(phiEn, 2, 0, [1, 1], 0, 3)).toEqual([1, 2, 0]); // swings (lift 1.87), fence (1.78), park (1)
    // λ = 0.6: swings −0.380, park −0.550, fence −0.736.
    expect(relevantWords(phiEn, 2, 0, [1, 1], 0.6, 3)).toEqual([1, 0, 2]);
  });

  it('uses the themes’ weights in the language for a word’s overall probability', () => {
    // With theme 1 holding almost all the text, "swings" is rare overall: its lift in theme 0 grows.
    const lifted = relevantWords(phiEn, 2, 0, [0.01, 0.99], 0.6, 2);
    expect(lifted[0]).toBe(1);
    expect(relevantWords(phiEn, 2, 1, [0.01, 0.99], 0.6, 1)).toEqual([0]); // in the big theme "park" leads
  });
});

describe('suggested labels', () => {
  it('labels each theme in the first language and lists every language’s distinctive words, first language first', () => {
    const s = suggestThemeLabels({ K: 2, languages: ['es', 'en'], phi: [phiEs, phiEn], words: [es, en], themeWeights: [[1, 1], [1, 1]], primary: 1, wordsPerLanguage: 3 });
    expect(s.map((x) => x.label)).toEqual(['swings, park, fence', 'toilets, park, smell']);
    expect(s[0].words.map((w) => w.language)).toEqual(['en', 'es']);
    expect(s[0].words[1].words).toEqual(['columpios', 'parque', 'baños']);
    expect(s[1].words[1].words[0]).toBe('baños');
  });

  it('never gives two themes the same label', () => {
    const twin = Float64Array.from([...phiEn.subarray(0, 5), ...phiEn.subarray(0, 5), ...phiEn.subarray(5, 10)]);
    const s = suggestThemeLabels({ K: 3, languages: ['en'], phi: [twin], words: [en], themeWeights: [[1, 1, 1]], primary: 0, wordsPerLabel: 2 });
    const labels = s.map((x) => x.label);
    expect(new Set(labels).size).toBe(3);
    expect(labels[0]).toBe('swings, park');
    expect(labels[1].startsWith('swings, park')).toBe(true);
    expect(labels[1]).not.toBe(labels[0]);
  });

  it('falls back to the theme number when a language has no words', () => {
    const s = suggestThemeLabels({ K: 2, languages: ['en'], phi: [new Float64Array(0)], words: [[]], themeWeights: [[1, 1]], primary: 0 });
    expect(s.map((x) => x.label)).toEqual(['Theme 1', 'Theme 2']);
  });
});
