// The bars example of Griffiths & Steyvers, "Finding scientific topics", PNAS 101 (2004),
// §"A graphical example" and Fig. 1: a 25-word vocabulary drawn as a 5×5 image, 10 topics that
// are its 5 horizontal and 5 vertical bars (uniform over the bar's 5 pixels), 2,000 documents
// of 100 words with θ ~ Dir(α = 1). The sampler must recover every bar.
import { describe, expect, it } from 'vitest';
import { fitModel } from '../../src/model/fit.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import { drawCorpus, matchTopics } from './synthetic.js';

describe('bars example (Griffiths & Steyvers, PNAS 2004)', () => {
  it('recovers all ten bars (matched cosine ≥ 0.95)', async () => {
    const bars: Float64Array[] = [];
    for (let r = 0; r < 5; r++) bars.push(Float64Array.from({ length: 25 }, (_, w) => (Math.floor(w / 5) === r ? 0.2 : 0)));
    for (let c = 0; c < 5; c++) bars.push(Float64Array.from({ length: 25 }, (_, w) => (w % 5 === c ? 0.2 : 0)));
    const rng = Xoshiro128.fromSeed(2004);
    const groups = Array.from({ length: 2000 }, () => ({ alpha: new Float64Array(10).fill(1), docs: [{ language: 0, length: 100 }] }));
    const data = drawCorpus(rng, [bars], groups, [25]);
    const fit = await fitModel(data.built.corpus, null, { K: 10, sweeps: 150, burnIn: 100, sampleEvery: 5, seed: 7, initialBeta: 0.1, initialAlpha: 1 });
    const { cos } = matchTopics(bars, fit.phi[0], 25);
    for (let i = 0; i < 10; i++) expect(cos[i], `bar ${i}: matched cosine ${cos[i].toFixed(4)}`).toBeGreaterThanOrEqual(0.95);
    // The likelihood rises from the random start.
    expect(fit.logLikelihoodTrace[149]).toBeGreaterThan(fit.logLikelihoodTrace[0]);
  });
});
