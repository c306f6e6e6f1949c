import { describe, expect, it } from 'vitest';
import { minimizeLbfgs } from '../../src/model/lbfgs.js';

describe('L-BFGS', () => {
  // Rosenbrock's function f = 100(x₂ − x₁²)² + (1 − x₁)², minimum at (1, 1), standard start
  // (−1.2, 1): Nocedal & Wright, Numerical Optimization, 2nd ed. 2006, eq. 2.22 and Exercise 3.1.
  it('reaches (1, 1) on the Rosenbrock function from (−1.2, 1)', () => {
    const result = minimizeLbfgs(
      (x, g) => {
        const a = x[1] - x[0] * x[0];
        const b = 1 - x[0];
        g[0] = -400 * x[0] * a - 2 * b;
        g[1] = 200 * a;
        return 100 * a * a + b * b;
      },
      Float64Array.of(-1.2, 1),
      { maxIterations: 500, gradientTolerance: 1e-10, functionTolerance: 0 },
    );
    expect(result.converged, result.reason).toBe(true);
    expect(Math.abs(result.x[0] - 1), `x₁ = ${result.x[0]}`).toBeLessThan(1e-6);
    expect(Math.abs(result.x[1] - 1), `x₂ = ${result.x[1]}`).toBeLessThan(1e-6);
  });

  it('minimizes a 50-dimensional ill-conditioned quadratic to its known minimum', () => {
    const n = 50;
    const target = Float64Array.from({ length: n }, (_, i) => Math.sin(i));
    const scale = Float64Array.from({ length: n }, (_, i) => 10 ** ((3 * i) / (n - 1)));
    const result = minimizeLbfgs(
      (x, g) => {
        let f = 0;
        for (let i = 0; i < n; i++) {
          const d = x[i] - target[i];
          f += 0.5 * scale[i] * d * d;
          g[i] = scale[i] * d;
        }
        return f;
      },
      new Float64Array(n),
      { maxIterations: 1000, gradientTolerance: 1e-9, functionTolerance: 0 },
    );
    for (let i = 0; i < n; i++) expect(Math.abs(result.x[i] - target[i])).toBeLessThan(1e-7);
  });
});
