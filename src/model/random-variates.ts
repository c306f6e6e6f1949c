// Random variates used to initialize and to simulate: standard normal, gamma, Dirichlet.
//
// Method: normal by the polar Box–Muller method (Marsaglia & Bray, SIAM Review 1964);
// gamma by Marsaglia & Tsang, "A simple method for generating gamma variables", ACM TOMS 26
// (2000), with the boost G(a) = G(a + 1) · U^{1/a} for shape a < 1 (same paper, §6);
// Dirichlet as normalized independent gammas (Devroye, Non-Uniform Random Variate Generation,
// 1986, ch. XI).
import type { Rng } from './types.js';

export function sampleNormal(rng: Rng): number {
  for (;;) {
    const u = 2 * rng.nextDouble() - 1;
    const v = 2 * rng.nextDouble() - 1;
    const s = u * u + v * v;
    if (s > 0 && s < 1) return u * Math.sqrt((-2 * Math.log(s)) / s);
  }
}

export function sampleGamma(rng: Rng, shape: number): number {
  if (!(shape > 0)) throw new Error(`Gamma shape must be positive (got ${shape}).`);
  if (shape < 1) {
    const u = rng.nextDouble();
    return sampleGamma(rng, shape + 1) * Math.pow(u === 0 ? Number.MIN_VALUE : u, 1 / shape);
  }
  const d = shape - 1 / 3;
  const c = 1 / Math.sqrt(9 * d);
  for (;;) {
    let x: number;
    let v: number;
    do {
      x = sampleNormal(rng);
      v = 1 + c * x;
    } while (v <= 0);
    v = v * v * v;
    const u = rng.nextDouble();
    if (u < 1 - 0.0331 * x * x * x * x) return d * v;
    if (Math.log(u) < 0.5 * x * x + d * (1 - v + Math.log(v))) return d * v;
  }
}

/** A draw from Dir(alpha) into out (length of alpha). */
export function sampleDirichlet(rng: Rng, alpha: ArrayLike<number>, out = new Float64Array(alpha.length)): Float64Array {
  let s = 0;
  for (let i = 0; i < alpha.length; i++) s += out[i] = sampleGamma(rng, alpha[i]);
  if (s === 0) {
    // Every gamma underflowed (tiny shapes): put all mass on one uniformly chosen coordinate.
    out.fill(0);
    out[rng.nextInt(alpha.length)] = 1;
    return out;
  }
  for (let i = 0; i < alpha.length; i++) out[i] /= s;
  return out;
}

/** Index drawn from unnormalized non-negative weights. */
export function sampleDiscrete(rng: Rng, weights: ArrayLike<number>, total?: number): number {
  let t = total;
  if (t === undefined) {
    t = 0;
    for (let i = 0; i < weights.length; i++) t += weights[i];
  }
  let u = rng.nextDouble() * t;
  for (let i = 0; i < weights.length - 1; i++) {
    u -= weights[i];
    if (u < 0) return i;
  }
  return weights.length - 1;
}
