import { describe, expect, it } from 'vitest';
import { betaHistogram, optimizeBeta } from '../../src/model/beta-optimizer.js';
import { sampleDirichlet, sampleDiscrete } from '../../src/model/random-variates.js';
import { Xoshiro128 } from '../../src/model/rng.js';

/** K multinomial count vectors over V words, each from its own φ_k ~ Dir(β) (synthetic). */
function simulate(beta: number, V: number, K: number, perTopic: number, seed: number) {
  const rng = Xoshiro128.fromSeed(seed);
  const nkw = new Int32Array(V * K); // row = word, K columns, as in the sampler
  const totals = new Int32Array(K);
  const alpha = new Float64Array(V).fill(beta);
  for (let k = 0; k < K; k++) {
    const phi = sampleDirichlet(rng, alpha);
    for (let t = 0; t < perTopic; t++) nkw[sampleDiscrete(rng, phi, 1) * K + k]++;
    totals[k] = perTopic;
  }
  return { nkw, totals };
}

describe("Minka's fixed point for a symmetric β", () => {
  // Minka (2000), "Estimating a Dirichlet distribution": the fixed point converges to the
  // maximum-likelihood Pólya parameter; with enough data it recovers the true one.
  it.each([0.01, 0.1, 0.5])('recovers β = %f from simulated counts within 5%%', (truth) => {
    const V = 400;
    const K = 40;
    const { nkw, totals } = simulate(truth, V, K, 3000, 2000 + Math.round(truth * 1000));
    const h = betaHistogram(nkw, 0, V * K, totals, V);
    const est = optimizeBeta(h, 1);
    expect(Math.abs(est - truth) / truth, `estimated ${est}, truth ${truth}`).toBeLessThan(0.05);
  });

  it('increases the Pólya log-likelihood at every step', () => {
    const V = 100;
    const K = 10;
    const { nkw, totals } = simulate(0.2, V, K, 500, 7);
    const h = betaHistogram(nkw, 0, V * K, totals, V);
    const logLik = (b: number) => {
      let s = 0;
      for (let i = 0; i < h.exceed.length; i++) s += h.exceed[i] * Math.log(b + i);
      for (let k = 0; k < K; k++) for (let i = 0; i < totals[k]; i++) s -= Math.log(V * b + i);
      return s;
    };
    let b = 5;
    let prev = logLik(b);
    for (let it = 0; it < 20; it++) {
      b = optimizeBeta(h, b, { maxIterations: 1 });
      const cur = logLik(b);
      expect(cur).toBeGreaterThanOrEqual(prev - 1e-9);
      prev = cur;
    }
  });
});
