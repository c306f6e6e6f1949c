// Invented synthetic data for the contrast tests: Dirichlet document mixtures around known
// group means. Gamma draws by Marsaglia & Tsang, "A simple method for generating gamma
// variables", ACM TOMS 2000 (with the shape < 1 boost of §6).
import { Xoshiro128 } from '../../src/model/rng.js';

export function normal(rng: Xoshiro128): number {
  // Box–Muller (Box & Muller, Annals of Mathematical Statistics 1958).
  const u = 1 - rng.nextDouble();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.nextDouble());
}

export function gamma(rng: Xoshiro128, shape: number): number {
  if (shape < 1) return gamma(rng, shape + 1) * Math.pow(1 - rng.nextDouble(), 1 / shape);
  const d = shape - 1 / 3;
  const c = 1 / Math.sqrt(9 * d);
  for (;;) {
    let x: number;
    let v: number;
    do {
      x = normal(rng);
      v = 1 + c * x;
    } while (v <= 0);
    v = v * v * v;
    const u = 1 - rng.nextDouble();
    if (Math.log(u) < 0.5 * x * x + d - d * v + d * Math.log(v)) return d * v;
  }
}

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
