// Invented synthetic data for the contrast tests: Dirichlet document mixtures around known
// group means, from the model's own gamma sampler (Marsaglia & Tsang, ACM TOMS 2000).
import { sampleGamma as gamma } from '../../src/model/random-variates.js';
import { Xoshiro128 } from '../../src/model/rng.js';

/** One Dirichlet(alpha) draw written into out[offset .. offset+K). */
export function dirichletInto(rng: Xoshiro128, alpha: ArrayLike<number>, out: Float64Array, offset: number): void {
  let sum = 0;
  for (let k = 0; k < alpha.length; k++) {
    const g = gamma(rng, alpha[k]);
    out[offset + k] = g;
    sum += g;
  }
  for (let k = 0; k < alpha.length; k++) out[offset + k] /= sum;
}
