import { describe, expect, it } from 'vitest';
import { Xoshiro128 } from '../../src/model/rng.js';
import { dominantTheme, themeWords } from '../../src/services/run-model.js';

describe('theme words', () => {
  it('match a full sort by probability (ties: lower word id first) and report exclusivity', () => {
    const rng = Xoshiro128.fromSeed(4);
    const K = 3;
    const V = 200;
    const phi = new Float64Array(K * V);
    for (let i = 0; i < phi.length; i++) phi[i] = Math.round(rng.nextDouble() * 50) / 1000; // many ties
    const stems = Array.from({ length: V }, (_, w) => `s${w}`);
    const model = { K, languages: ['en'], phi: [phi], vocabularies: [{ stems, surfaces: stems.map((s) => `${s}!`) }] };
    for (let k = 0; k < K; k++) {
      const expected = Array.from({ length: V }, (_, w) => w).sort((a, b) => phi[k * V + b] - phi[k * V + a] || a - b).slice(0, 15);
      const got = themeWords(model, k, 'en', 15);
      expect(got.map((w) => w.wordId)).toEqual(expected);
      const w0 = got[0].wordId;
      expect(got[0].exclusivity).toBeCloseTo(phi[k * V + w0] / (phi[w0] + phi[V + w0] + phi[2 * V + w0]), 12);
      expect(got[0]).toMatchObject({ rank: 1, word: `s${w0}!`, stem: `s${w0}` });
    }
    expect(themeWords(model, 0, 'fr', 5)).toEqual([]);
    expect(themeWords(model, 0, 'en', 0)).toEqual([]);
    expect(themeWords(model, 0, 'en', 1000)).toHaveLength(V);
    expect(dominantTheme([0.2, 0.5, 0.5, 0.1])).toBe(1);
  });
});
