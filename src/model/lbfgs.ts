// Limited-memory BFGS minimizer.
//
// Method: search direction by the two-loop recursion of Nocedal, "Updating quasi-Newton matrices
// with limited storage", Mathematics of Computation 35 (1980); initial Hessian scaling
// γ = sᵀy / yᵀy and the overall scheme of Liu & Nocedal, "On the limited memory BFGS method for
// large scale optimization", Mathematical Programming 45 (1989); step length by backtracking
// until the Armijo sufficient-decrease condition holds (Nocedal & Wright, Numerical Optimization,
// 2nd ed. 2006, Algorithm 3.1, c₁ = 1e-4). A pair (s, y) is stored only when sᵀy > 0, which keeps
// the implicit Hessian positive definite without a Wolfe curvature search (ibid. §7.2).

export interface LbfgsOptions {
  /** Pairs kept (Liu & Nocedal 1989 recommend 3–7; 8 is common practice). */
  memory?: number;
  maxIterations?: number;
  /** Stop when ‖g‖∞ ≤ gradientTolerance · max(1, ‖x‖∞). */
  gradientTolerance?: number;
  /** Stop when the relative decrease of f over one iteration is below this. */
  functionTolerance?: number;
}

export interface LbfgsResult {
  x: Float64Array;
  f: number;
  iterations: number;
  evaluations: number;
  converged: boolean;
  reason: string;
}

/** f(x) returning the value and writing the gradient into g. */
export type Objective = (x: Float64Array, g: Float64Array) => number;

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

function normInf(a: Float64Array): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]));
  return m;
}

/** Minimizes f from x0 (not modified). */
export function minimizeLbfgs(f: Objective, x0: Float64Array, options: LbfgsOptions = {}): LbfgsResult {
  const m = options.memory ?? 8;
  const maxIt = options.maxIterations ?? 200;
  const gtol = options.gradientTolerance ?? 1e-6;
  const ftol = options.functionTolerance ?? 1e-12;
  const n = x0.length;
  const x = Float64Array.from(x0);
  const g = new Float64Array(n);
  let fx = f(x, g);
  let evaluations = 1;
  if (!Number.isFinite(fx)) return { x, f: fx, iterations: 0, evaluations, converged: false, reason: 'objective not finite at start' };
  const S: Float64Array[] = [];
  const Y: Float64Array[] = [];
  const rho: number[] = [];
  const alphaTmp = new Float64Array(m);
  const d = new Float64Array(n);
  const xNew = new Float64Array(n);
  const gNew = new Float64Array(n);
  for (let it = 0; it < maxIt; it++) {
    if (normInf(g) <= gtol * Math.max(1, normInf(x))) return { x, f: fx, iterations: it, evaluations, converged: true, reason: 'gradient' };
    // Two-loop recursion: d = −H g.
    for (let i = 0; i < n; i++) d[i] = -g[i];
    for (let j = S.length - 1; j >= 0; j--) {
      alphaTmp[j] = rho[j] * dot(S[j], d);
      for (let i = 0; i < n; i++) d[i] -= alphaTmp[j] * Y[j][i];
    }
    let gamma: number;
    if (S.length > 0) {
      const last = S.length - 1;
      gamma = dot(S[last], Y[last]) / dot(Y[last], Y[last]);
    } else gamma = 1 / Math.max(1, normInf(g));
    for (let i = 0; i < n; i++) d[i] *= gamma;
    for (let j = 0; j < S.length; j++) {
      const b = rho[j] * dot(Y[j], d);
      for (let i = 0; i < n; i++) d[i] += S[j][i] * (alphaTmp[j] - b);
    }
    let slope = dot(g, d);
    if (!(slope < 0)) {
      // Not a descent direction (numerical trouble): restart from steepest descent.
      S.length = 0;
      Y.length = 0;
      rho.length = 0;
      for (let i = 0; i < n; i++) d[i] = -g[i] / Math.max(1, normInf(g));
      slope = dot(g, d);
    }
    let step = 1;
    let fNew = Infinity;
    let accepted = false;
    for (let ls = 0; ls < 60; ls++) {
      for (let i = 0; i < n; i++) xNew[i] = x[i] + step * d[i];
      fNew = f(xNew, gNew);
      evaluations++;
      if (Number.isFinite(fNew) && fNew <= fx + 1e-4 * step * slope) {
        accepted = true;
        break;
      }
      step *= Number.isFinite(fNew) ? 0.5 : 0.1;
    }
    if (!accepted) return { x, f: fx, iterations: it, evaluations, converged: false, reason: 'line search failed' };
    const s = new Float64Array(n);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      s[i] = xNew[i] - x[i];
      y[i] = gNew[i] - g[i];
    }
    const sy = dot(s, y);
    if (sy > 1e-12 * Math.sqrt(dot(s, s) * dot(y, y))) {
      if (S.length === m) {
        S.shift();
        Y.shift();
        rho.shift();
      }
      S.push(s);
      Y.push(y);
      rho.push(1 / sy);
    }
    const decrease = fx - fNew;
    x.set(xNew);
    g.set(gNew);
    fx = fNew;
    if (decrease <= ftol * Math.max(1, Math.abs(fx))) return { x, f: fx, iterations: it + 1, evaluations, converged: true, reason: 'function' };
  }
  return { x, f: fx, iterations: maxIt, evaluations, converged: false, reason: 'iteration limit' };
}
