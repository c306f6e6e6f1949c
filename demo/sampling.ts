// Random draws the generator needs, on top of the shared seeded RNG.
import type { Rng } from '../src/model/types.js';

/** Index drawn from unnormalised probabilities. */
export function pick(rng: Rng, probs: readonly number[]): number {
  let total = 0;
  for (const p of probs) total += p;
  let u = rng.nextDouble() * total;
  for (let i = 0; i < probs.length - 1; i++) {
    u -= probs[i];
    if (u < 0) return i;
  }
  return probs.length - 1;
}

export function choose<T>(rng: Rng, items: readonly T[]): T {
  return items[rng.nextInt(items.length)];
}

/** Standard normal by the Box–Muller transform (Box & Muller, Ann. Math. Stat. 1958). */
export function normal(rng: Rng): number {
  const u = 1 - rng.nextDouble();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng.nextDouble());
}

/**
 * log of a Gamma(shape, 1) draw. Method: Marsaglia & Tsang, "A simple method for generating gamma
 * variables", ACM TOMS 2000; for shape < 1 their boost G(a) = G(a+1)·U^(1/a), kept in log space so
 * tiny shapes (α ≈ 0.1) never underflow to zero.
 */
export function logGamma(rng: Rng, shape: number): number {
  if (shape < 1) return logGamma(rng, shape + 1) + Math.log(1 - rng.nextDouble()) / shape;
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
    if (Math.log(u) < 0.5 * x * x + d - d * v + d * Math.log(v)) return Math.log(d * v);
  }
}

/** θ ~ Dirichlet(alpha), normalised from gamma draws (log-sum-exp for stability). */
export function dirichlet(rng: Rng, alpha: readonly number[]): number[] {
  const k = alpha.length;
  const out = new Array<number>(k);
  let max = -Infinity;
  for (let i = 0; i < k; i++) {
    out[i] = logGamma(rng, alpha[i]);
    if (out[i] > max) max = out[i];
  }
  let sum = 0;
  for (let i = 0; i < k; i++) sum += out[i] = Math.exp(out[i] - max);
  for (let i = 0; i < k; i++) out[i] /= sum;
  return out;
}
