// Seeded pseudo-random numbers with a saveable state.
//
// Method: xoshiro128** 1.1 (Blackman & Vigna, "Scrambled linear pseudorandom number
// generators", ACM TOMS 2021). 128-bit state in four uint32 words, period 2^128 − 1,
// passes BigCrush; fast in JavaScript because it needs only 32-bit integer operations.
// Seeding expands one 32-bit seed (plus a stream number, for one stream per worker thread)
// with SplitMix32 (common practice, after Steele, Lea & Flood, "Fast splittable pseudorandom
// number generators", OOPSLA 2014) so that nearby seeds give unrelated states.
//
// State layout (what a checkpoint saves): Uint32Array [version, s0, s1, s2, s3].
import type { Rng } from './types.js';

export const RNG_STATE_VERSION = 1;

function splitMix32(seed: number): () => number {
  let x = seed >>> 0;
  return () => {
    x = (x + 0x9e3779b9) >>> 0;
    let z = x;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
}

export class Xoshiro128 implements Rng {
  private readonly s = new Uint32Array(4);

  private constructor() {}

  /** A generator for `seed`; `stream` gives independent generators for worker threads. */
  static fromSeed(seed: number, stream = 0): Xoshiro128 {
    const rng = new Xoshiro128();
    const mix = splitMix32((seed ^ Math.imul(stream + 1, 0x632be5ab)) >>> 0);
    for (let i = 0; i < 4; i++) rng.s[i] = mix();
    if ((rng.s[0] | rng.s[1] | rng.s[2] | rng.s[3]) === 0) rng.s[0] = 1;
    return rng;
  }

  /** Restore a state saved by saveState(); refuses another schema version. */
  static fromState(state: Uint32Array): Xoshiro128 {
    if (state.length !== 5 || state[0] !== RNG_STATE_VERSION) {
      throw new Error(`Random-number state has version ${state[0]} and length ${state.length}; expected version ${RNG_STATE_VERSION}, length 5.`);
    }
    const rng = new Xoshiro128();
    rng.s.set(state.subarray(1));
    return rng;
  }

  saveState(): Uint32Array {
    const out = new Uint32Array(5);
    out[0] = RNG_STATE_VERSION;
    out.set(this.s, 1);
    return out;
  }

  /** Next raw 32-bit output. */
  nextUint32(): number {
    const s = this.s;
    const result = Math.imul(rotl(Math.imul(s[1], 5), 7), 9) >>> 0;
    const t = s[1] << 9;
    s[2] ^= s[0];
    s[3] ^= s[1];
    s[1] ^= s[2];
    s[0] ^= s[3];
    s[2] ^= t;
    s[3] = rotl(s[3], 11);
    return result;
  }

  /** Uniform in [0, 1) with 53 random bits (two outputs). */
  nextDouble(): number {
    const hi = this.nextUint32() >>> 5; // 27 bits
    const lo = this.nextUint32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** Uniform integer in [0, n); n ≤ 2^32. Bias below 2^-21 for n < 2^11, common practice. */
  nextInt(n: number): number {
    return Math.floor(this.nextDouble() * n);
  }
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}
