// Polylingual linking ("Polylingual Topic Models", Mimno, Wallach, Naradowsky, Smith &
// McCallum, EMNLP 2009, §5–6): only link groups tie topic k in one language to topic k in the
// other. Invented two-language data with known topics: with 10% of answers linked, the fitted
// topics must be the same topic in both languages; with no links the pairing is arbitrary.
import { describe, expect, it } from 'vitest';
import { fitModel } from '../../src/model/fit.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import { cosine, drawCorpus, row } from './synthetic.js';

const K = 8;
const V = 48;

/** Topic k uses words 6k … 6k+5 of each language (the languages share no word ids' meaning). */
function languagePhi(shift: number): Float64Array[] {
  return Array.from({ length: K }, (_, k) => Float64Array.from({ length: V }, (_, w) => (Math.floor(((w + shift) % V) / 6) === k ? 0.16 : 0.04 / 42)));
}

async function alignedShare(linkedShare: number, seed: number): Promise<number> {
  const rng = Xoshiro128.fromSeed(seed);
  const phi = [languagePhi(0), languagePhi(21)];
  const groups = Array.from({ length: 1600 }, (_, g) => ({
    alpha: new Float64Array(K).fill(0.2),
    docs: g < 1600 * linkedShare ? [{ language: 0, length: 20 }, { language: 1, length: 20 }] : [{ language: g % 2, length: 20 }],
  }));
  const data = drawCorpus(rng, phi, groups, [V, V]);
  const fit = await fitModel(data.built.corpus, null, { K, sweeps: 200, burnIn: 150, sampleEvery: 5, seed: 3 });
  // For each fitted topic, the true topic it is closest to, in each language.
  let aligned = 0;
  for (let k = 0; k < K; k++) {
    const best = [0, 1].map((l) => {
      const sims = phi[l].map((t) => cosine(t, row(fit.phi[l], k, V)));
      return sims.indexOf(Math.max(...sims));
    });
    if (best[0] === best[1]) aligned++;
  }
  return aligned / K;
}

describe('polylingual linking (invented data)', () => {
  it('with 10% of answers linked, at least 90% of topics are the same topic in both languages', async () => {
    const share = await alignedShare(0.1, 2009);
    expect(share, `aligned share ${share}`).toBeGreaterThanOrEqual(0.9);
  });

  it('without links, alignment is about chance (the links do the work)', async () => {
    const share = await alignedShare(0, 2009);
    // Chance for a random pairing of 8 topics is 1/8; allow sampling noise up to 3/8.
    expect(share, `aligned share ${share}`).toBeLessThanOrEqual(3 / 8);
  });
});
