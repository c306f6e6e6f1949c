// Covariate features of link groups for Dirichlet-multinomial regression (docs/design.md §4;
// Mimno & McCallum, "Topic models conditioned on arbitrary features with Dirichlet-multinomial
// regression", UAI 2008): x_g = [1, one indicator per categorical level but the first,
// standardized numeric covariates]. Groups with identical rows share one "pattern", so α is
// stored and optimized per pattern (Priors.groupPattern).
//
// Choices (documented for users):
// - A link group takes the covariates of its first member in input order: members of a group
//   are translations or pairs of one answer and normally agree; when they do not, the first
//   row is the source answer in the usual layout (the original before its translations).
// - Categorical levels are sorted by code point; the first is the baseline. A missing value
//   (null, '' or undefined) is its own level "(missing)", so missing is never silently merged
//   with the baseline.
// - Numeric values are standardized with the mean and population standard deviation over
//   groups; a missing or non-numeric value gets the mean (0 after standardizing; common practice).
//   A constant column gives 0 everywhere.
// - At fold-in, a level never seen while fitting is treated as the baseline (all indicators 0).
import type { CovariateType } from '../text/index.js';

export type CovariateValue = string | number | null | undefined;

export interface CovariateSpec {
  readonly column: string;
  readonly type: CovariateType;
}

export const MISSING_LEVEL = '(missing)';

/** How covariate rows become feature vectors; kept with a fitted model for fold-in. */
export interface FeatureEncoding {
  readonly specs: readonly CovariateSpec[];
  /** Feature names: 'intercept', 'column=level', 'column'. */
  readonly names: string[];
  /** Per spec: sorted levels (first = baseline) for categorical, null for numeric. */
  readonly levels: (string[] | null)[];
  /** Per spec: mean and standard deviation for numeric (0 and 1 for categorical). */
  readonly means: number[];
  readonly sds: number[];
}

export interface GroupFeatures {
  readonly encoding: FeatureEncoding;
  readonly numFeatures: number;
  /** Distinct feature rows, P×F row-major. */
  readonly patterns: Float64Array;
  readonly numPatterns: number;
  /** Pattern per group (length G). */
  readonly groupPattern: Int32Array;
  /** Number of groups per pattern. */
  readonly patternSizes: Int32Array;
}

function levelOf(v: CovariateValue): string {
  if (v === null || v === undefined) return MISSING_LEVEL;
  const s = String(v).trim();
  return s === '' ? MISSING_LEVEL : s;
}

function numberOf(v: CovariateValue): number {
  if (typeof v === 'number') return Number.isFinite(v) ? v : NaN;
  if (v === null || v === undefined) return NaN;
  const s = v.trim().replace(',', '.');
  return s === '' ? NaN : Number(s);
}

/** Learns the encoding (levels, means, standard deviations) from one covariate row per group. */
export function learnEncoding(rows: readonly Record<string, CovariateValue>[], specs: readonly CovariateSpec[]): FeatureEncoding {
  const names = ['intercept'];
  const levels: (string[] | null)[] = [];
  const means: number[] = [];
  const sds: number[] = [];
  for (const spec of specs) {
    if (spec.type === 'categorical') {
      const set = new Set<string>();
      for (const r of rows) set.add(levelOf(r[spec.column]));
      const sorted = [...set].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
      levels.push(sorted);
      means.push(0);
      sds.push(1);
      for (const lv of sorted.slice(1)) names.push(`${spec.column}=${lv}`);
    } else {
      let n = 0;
      let sum = 0;
      for (const r of rows) {
        const v = numberOf(r[spec.column]);
        if (!Number.isNaN(v)) {
          n++;
          sum += v;
        }
      }
      const mean = n > 0 ? sum / n : 0;
      let ss = 0;
      for (const r of rows) {
        const v = numberOf(r[spec.column]);
        if (!Number.isNaN(v)) ss += (v - mean) ** 2;
      }
      levels.push(null);
      means.push(mean);
      sds.push(n > 0 ? Math.sqrt(ss / n) : 0);
      names.push(spec.column);
    }
  }
  return { specs: [...specs], names, levels, means, sds };
}

/** x for one covariate row under a learned encoding (length = number of features). */
export function encodeCovariates(row: Record<string, CovariateValue>, encoding: FeatureEncoding, out = new Float64Array(encoding.names.length)): Float64Array {
  out.fill(0);
  out[0] = 1;
  let f = 1;
  encoding.specs.forEach((spec, j) => {
    const lv = encoding.levels[j];
    if (lv) {
      const idx = lv.indexOf(levelOf(row[spec.column]));
      if (idx > 0) out[f + idx - 1] = 1;
      f += lv.length - 1;
    } else {
      const v = numberOf(row[spec.column]);
      const sd = encoding.sds[j];
      out[f] = Number.isNaN(v) || sd === 0 ? 0 : (v - encoding.means[j]) / sd;
      f += 1;
    }
  });
  return out;
}

/**
 * Features with deduplicated patterns from one covariate row per group. `learnFrom` marks the
 * rows the encoding is learned from (default all): groups that are not answers (glossary rows,
 * words spelled alike) have no covariates and must not add a "(missing)" level that would become
 * the reference; their rows encode with the answers' encoding, so a level it lacks gets the
 * reference level's features and a missing number the mean.
 */
export function buildGroupFeatures(rows: readonly Record<string, CovariateValue>[], specs: readonly CovariateSpec[], learnFrom?: readonly boolean[]): GroupFeatures {
  const taught = learnFrom ? rows.filter((_, g) => learnFrom[g]) : rows;
  const encoding = learnEncoding(taught.length > 0 ? taught : rows, specs);
  const F = encoding.names.length;
  const x = new Float64Array(F);
  const index = new Map<string, number>();
  const patternRows: number[] = [];
  const groupPattern = new Int32Array(rows.length);
  const sizes: number[] = [];
  for (let g = 0; g < rows.length; g++) {
    encodeCovariates(rows[g], encoding, x);
    const key = x.join(',');
    let p = index.get(key);
    if (p === undefined) {
      p = sizes.length;
      index.set(key, p);
      sizes.push(0);
      for (let f = 0; f < F; f++) patternRows.push(x[f]);
    }
    sizes[p]++;
    groupPattern[g] = p;
  }
  return {
    encoding,
    numFeatures: F,
    patterns: Float64Array.from(patternRows),
    numPatterns: sizes.length,
    groupPattern,
    patternSizes: Int32Array.from(sizes),
  };
}

/** Intercept-only features (no covariates): every group has pattern 0, x = [1]. */
export function interceptOnlyFeatures(numGroups: number): GroupFeatures {
  return {
    encoding: { specs: [], names: ['intercept'], levels: [], means: [], sds: [] },
    numFeatures: 1,
    patterns: Float64Array.of(1),
    numPatterns: 1,
    groupPattern: new Int32Array(numGroups),
    patternSizes: Int32Array.of(numGroups),
  };
}

/** α (P×K) = exp(λ_k · x_p), λ is K×F row-major. */
export function alphaFromLambda(lambda: Float64Array, patterns: Float64Array, K: number, F: number, out?: Float64Array): Float64Array {
  const P = patterns.length / F;
  const alpha = out ?? new Float64Array(P * K);
  for (let p = 0; p < P; p++) {
    for (let k = 0; k < K; k++) {
      let s = 0;
      for (let f = 0; f < F; f++) s += lambda[k * F + f] * patterns[p * F + f];
      alpha[p * K + k] = Math.exp(s);
    }
  }
  return alpha;
}
