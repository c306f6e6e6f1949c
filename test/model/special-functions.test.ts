import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { digamma, logGamma, trigamma } from '../../src/model/special-functions.js';
import { Xoshiro128 } from '../../src/model/rng.js';

const require = createRequire(import.meta.url);
const stdlibGammaln = require('@stdlib/math-base-special-gammaln') as (x: number) => number;
const stdlibDigamma = require('@stdlib/math-base-special-digamma') as (x: number) => number;

function relErr(got: number, expected: number): number {
  return Math.abs(got - expected) / Math.abs(expected);
}

// Values typed from the printed tables of Abramowitz & Stegun, Handbook of Mathematical
// Functions (NBS AMS 55, 1964): Table 6.1 gives Γ(x) and ψ(x) for 1 ≤ x ≤ 2 to 15 digits;
// Table 6.3 gives ψ(n) for integer n. Γ(1.5) = √π/2 is also exact. Each value was typed by hand
// and cross-checked against the @stdlib values below (a typing slip at ψ(1.7) was caught that way).
const TABLE_6_1: [x: number, gamma: number, psi: number][] = [
  [1.0, 1.0, -0.577215664901533],
  [1.1, 0.951350769866873, -0.423754940411077],
  [1.2, 0.918168742399761, -0.289039896592188],
  [1.3, 0.897470696306277, -0.169190888866800],
  [1.4, 0.887263817503075, -0.061384544585116],
  [1.5, 0.886226925452758, 0.036489973978576],
  [1.6, 0.893515349287690, 0.126047452773476],
  [1.7, 0.908638732853290, 0.208547874873494],
  [1.8, 0.931383770980243, 0.284991433293862],
  [1.9, 0.961765831907388, 0.356184161164060],
  [2.0, 1.0, 0.422784335098467],
];
const TABLE_6_3: [n: number, psi: number][] = [
  [3, 0.922784335098467],
  [10, 2.251752589066721],
  [100, 4.600161852738087],
];

describe('logGamma and digamma against Abramowitz & Stegun (1964)', () => {
  it.each(TABLE_6_1)('x = %f matches Table 6.1 (Γ and ψ to 15 digits)', (x, gamma, psi) => {
    const lg = Math.log(gamma);
    // The table's last digit is rounded: 1e-15 absolute in Γ and ψ.
    expect(Math.abs(logGamma(x) - lg), `logGamma(${x}) = ${logGamma(x)}, expected ${lg}`).toBeLessThan(2e-15);
    expect(Math.abs(digamma(x) - psi), `digamma(${x}) = ${digamma(x)}, expected ${psi}`).toBeLessThan(1e-15);
  });
  it.each(TABLE_6_3)('ψ(%i) matches Table 6.3', (n, psi) => {
    expect(relErr(digamma(n), psi)).toBeLessThan(1e-14);
  });
  it('logGamma(n) is ln((n−1)!) (A&S Table 6.2) and +∞ at the poles', () => {
    let f = 1;
    for (let n = 1; n <= 30; n++) {
      expect(relErr(logGamma(n + 1), Math.log((f *= n))) || 0).toBeLessThan(1e-14);
    }
    expect(logGamma(0)).toBe(Infinity);
    expect(logGamma(-3)).toBe(Infinity);
    expect(digamma(-2)).toBeNaN();
  });
});

describe('logGamma, digamma and trigamma against @stdlib at seeded random points', () => {
  const rng = Xoshiro128.fromSeed(1964);
  // Positive arguments log-uniform over 1e-4 … 1e7, plus dense coverage of (0, 12] and of the
  // roots of lnΓ (1, 2) and ψ (1.4616…), where relative error is hardest.
  const points: number[] = [];
  for (let i = 0; i < 600; i++) points.push(Math.exp(Math.log(1e-4) + rng.nextDouble() * Math.log(1e11)));
  for (let i = 0; i < 300; i++) points.push(rng.nextDouble() * 12);
  for (let i = 0; i < 150; i++) points.push([1, 2, 1.4616321449683622][i % 3] + (rng.nextDouble() - 0.5) * 1e-3);
  // Negative arguments at least 0.05 from a pole.
  const negatives: number[] = [];
  while (negatives.length < 200) {
    const x = -rng.nextDouble() * 30;
    if (Math.abs(x - Math.round(x)) > 0.05) negatives.push(x);
  }
  const TOL = 1e-12;

  function check(name: string, f: (x: number) => number, ref: (x: number) => number, xs: number[]): number {
    let worst = 0;
    for (const x of xs) {
      const got = f(x);
      const expected = ref(x);
      const err = expected === 0 ? Math.abs(got) : relErr(got, expected);
      worst = Math.max(worst, err);
      if (!(err <= TOL)) expect.fail(`${name}(${x}): got ${got}, expected ${expected}, relative error ${err}, tolerance ${TOL}`);
    }
    return worst;
  }

  it('logGamma is within 1e-12 relative of stdlib gammaln', () => {
    check('logGamma', logGamma, stdlibGammaln, points);
  });
  it('logGamma of negative non-integers is within 1e-12 of stdlib gammaln (ln|Γ|, reflection)', () => {
    // Away from the roots of ln|Γ| too: compare where |ln|Γ|| > 0.01.
    check('logGamma', logGamma, stdlibGammaln, negatives.filter((x) => Math.abs(stdlibGammaln(x)) > 0.01));
  });
  it('digamma is within 1e-12 relative of stdlib digamma', () => {
    check('digamma', digamma, stdlibDigamma, [...points, ...negatives.filter((x) => Math.abs(stdlibDigamma(x)) > 0.01)]);
  });
  it('trigamma matches central differences of stdlib digamma (1e-6 relative)', () => {
    for (const x of points.filter((p) => p > 0.05 && p < 1e4)) {
      const h = 1e-5 * x;
      const fd = (stdlibDigamma(x + h) - stdlibDigamma(x - h)) / (2 * h);
      const got = trigamma(x);
      expect(relErr(got, fd), `trigamma(${x}) = ${got}, finite difference ${fd}`).toBeLessThan(1e-6);
    }
  });
});
