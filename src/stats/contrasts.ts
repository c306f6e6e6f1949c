// Group contrasts: how much each group of respondents writes about each theme, with intervals.
//
// Method. For a covariate with levels ℓ, the share of theme k in level ℓ is the survey-weighted
// mean of the documents' theme shares, Σ_{d∈ℓ} w_d θ_dk / Σ_{d∈ℓ} w_d (a Hájek ratio mean).
// Uncertainty has two sources, both drawn: the model's (which θ) and the sample's (which
// documents). Draw b uses saved posterior sample s = b mod S of θ and a nonparametric
// bootstrap resample of the documents within each level (Efron, "Bootstrap methods: another
// look at the jackknife", Annals of Statistics 1979; resampling within strata, Davison &
// Hinkley, "Bootstrap Methods and their Application", 1997, §3.7; optionally whole link groups
// as clusters, §3.8; see bootstrap.ts). Intervals are percentile
// intervals of the draws. A pairwise difference uses the two levels' draws with the same b, so
// both sides see the same posterior sample. Its two-sided p-value is the share of draws on the
// far side of zero, doubled: p = min(1, (1 + 2·min(#{Δ ≤ 0}, #{Δ ≥ 0})) / (B + 1)) (the +1
// keeps p above zero with finitely many draws, common practice). Benjamini & Hochberg (1995)
// flags are computed over all differences of one covariate.
//
// Assumptions shown to users (docs/design.md §10): answers are independent; weights are correct.
// Cost: S·D·K to total the units once, then B·(Σ_ℓ min(n_ℓ, cap))·K for the draws (see
// bootstrapDraws); resamples are typed-array multiplicities, never objects.
import { Xoshiro128 } from '../model/index.js';
import { bootstrapDraws } from './bootstrap.js';
import { quantileBins } from './bins.js';
import { benjaminiHochberg } from './fdr.js';
import { percentileInterval } from './quantile.js';
import { kishEffectiveNOf } from './weighted.js';

/** Default bootstrap unit cap per level (see ContrastOptions.maxResamplingUnits). */
export const DEFAULT_MAX_RESAMPLING_UNITS = 1000;

/** Saved posterior samples of the document mixtures: each is D×K row-major (θ_dk at d·K+k). */
export interface ThetaSamples {
  readonly K: number;
  readonly D: number;
  readonly samples: readonly (Float64Array | Float32Array)[];
}

export type ContrastCovariate =
  | { readonly name: string; readonly kind: 'categorical'; readonly levels: readonly string[]; readonly levelOfDoc: Int32Array }
  | { readonly name: string; readonly kind: 'numeric'; readonly values: Float64Array; readonly bins?: number };

export interface ContrastOptions {
  /** Survey weight per document (1 when omitted). NaN or negative weights exclude the document. */
  readonly weights?: Float64Array;
  /** Number of draws B (default 1000, common practice for percentile intervals). */
  readonly draws?: number;
  readonly seed?: number;
  /** Interval coverage (default 0.95). */
  readonly level?: number;
  /** False discovery rate for the Benjamini–Hochberg flag; null switches the flag off (default 0.05). */
  readonly fdr?: number | null;
  /** Theme labels (default "Theme 1", "Theme 2", …). */
  readonly themeLabels?: readonly string[];
  /**
   * Bootstrap unit cap per level (default 1000): larger levels are resampled as this many
   * random groups of documents, so a draw costs O(cap·K), not O(n·K). With M groups the
   * spread is estimated with M − 1 degrees of freedom, so the interval's width has a relative
   * standard error of about 1/√(2M) ≈ 2% at M = 1000 (random groups: Wolter, "Introduction to
   * Variance Estimation", 2nd ed. 2007, ch. 2; 1/√(2M) is the usual large-sample error of a
   * standard deviation on M − 1 degrees of freedom, quoted from memory), below the Monte Carlo error of the percentile endpoints
   * from 1000 draws; 5000 groups cost five times more for 1% (measured: the contrasts were
   * 80% of a 20,000-answer fit's wall time at 5000).
   */
  readonly maxResamplingUnits?: number;
  /**
   * Cluster per document (e.g. link group id): documents of one cluster within a level are
   * resampled together, since linked answers share one mixture (cluster bootstrap).
   */
  readonly clusterOfDoc?: Int32Array;
  /** Compare every level with this one only; default: every pair of levels. */
  readonly reference?: string;
}

/** One row of `theme-shares-by-group.csv` (docs/design.md §8). */
export interface ShareRow {
  readonly covariate: string;
  readonly level: string;
  readonly theme: number;
  readonly themeLabel: string;
  readonly share: number;
  readonly low: number;
  readonly high: number;
  readonly n: number;
  readonly effectiveN: number;
}

export interface DifferenceRow {
  readonly covariate: string;
  /** Difference is share(levelA) − share(levelB). */
  readonly levelA: string;
  readonly levelB: string;
  readonly theme: number;
  readonly themeLabel: string;
  readonly difference: number;
  readonly low: number;
  readonly high: number;
  readonly p: number;
  /** Benjamini–Hochberg adjusted p (NaN when the flag is off). */
  readonly pAdjusted: number;
  /** True when the difference survives false-discovery control (false when off). */
  readonly discovery: boolean;
}

export interface ContrastResult {
  readonly covariate: string;
  readonly levels: readonly string[];
  readonly shares: ShareRow[];
  readonly differences: DifferenceRow[];
  readonly draws: number;
  readonly posteriorSamples: number;
  /** Documents left out: missing level or unusable weight. */
  readonly excludedDocuments: number;
  readonly notes: string[];
}

/** Weighted theme shares per level of one covariate, with intervals and pairwise differences. */
export function groupContrasts(theta: ThetaSamples, covariate: ContrastCovariate, options: ContrastOptions = {}): ContrastResult {
  const { K, D, samples } = theta;
  const S = samples.length;
  if (S === 0) throw new Error('groupContrasts needs at least one posterior sample of the mixtures.');
  for (const s of samples) {
    if (s.length !== D * K) throw new Error(`A posterior sample has ${s.length} values; expected D·K = ${D * K}.`);
  }
  const B = Math.max(1, Math.floor(options.draws ?? 1000));
  const ci = options.level ?? 0.95;
  const weights = options.weights;
  const labels = Array.from({ length: K }, (_, k) => options.themeLabels?.[k] ?? `Theme ${k + 1}`);
  const notes: string[] = [];

  let levels: readonly string[];
  let levelOfDoc: Int32Array;
  if (covariate.kind === 'numeric') {
    const binning = quantileBins(covariate.values, covariate.bins ?? 4);
    levels = binning.levels;
    levelOfDoc = binning.levelOfDoc;
    notes.push(`Numeric covariate cut at its quantiles into ${levels.length} bins.`);
  } else {
    levels = covariate.levels;
    levelOfDoc = covariate.levelOfDoc;
  }
  if (levelOfDoc.length !== D) throw new Error(`Covariate "${covariate.name}" has ${levelOfDoc.length} values; expected ${D}.`);

  // Documents per level as index arrays (counting pass, then fill).
  const L = levels.length;
  const counts = new Int32Array(L);
  let excluded = 0;
  const usable = (d: number): boolean => {
    const l = levelOfDoc[d];
    if (l < 0 || l >= L) return false;
    if (!weights) return true;
    const w = weights[d];
    return Number.isFinite(w) && w >= 0;
  };
  for (let d = 0; d < D; d++) {
    if (usable(d)) counts[levelOfDoc[d]]++;
    else excluded++;
  }
  const members = Array.from({ length: L }, (_, l) => new Int32Array(counts[l]));
  const fill = new Int32Array(L);
  for (let d = 0; d < D; d++) if (usable(d)) members[levelOfDoc[d]][fill[levelOfDoc[d]]++] = d;
  if (excluded > 0) notes.push(`${excluded} document(s) left out: no value for "${covariate.name}" or an unusable weight.`);

  // Point estimates: weighted mean over all documents of the level, averaged over samples.
  const point = new Float64Array(L * K);
  const acc = new Float64Array(K);
  for (let l = 0; l < L; l++) {
    for (let s = 0; s < S; s++) {
      const wsum = accumulate(samples[s], K, members[l], weights, acc);
      for (let k = 0; k < K; k++) point[l * K + k] += acc[k] / wsum / S;
    }
  }

  // Draws: posterior sample × bootstrap resample within level; stored level-major, theme, draw.
  const maxUnits = Math.max(2, Math.floor(options.maxResamplingUnits ?? DEFAULT_MAX_RESAMPLING_UNITS));
  const clusters = options.clusterOfDoc;
  if (clusters && clusters.length !== D) throw new Error(`clusterOfDoc has ${clusters.length} values; expected ${D}.`);
  const drawn = bootstrapDraws(samples, K, members, weights, B, maxUnits, Xoshiro128.fromSeed(options.seed ?? 1), clusters);
  if (clusters) notes.push('Documents of one link group were resampled together (cluster bootstrap).');
  if (members.some((m) => m.length > maxUnits)) notes.push(`Levels with more than ${maxUnits} resampling units were resampled as ${maxUnits} random groups of units.`);

  const shares: ShareRow[] = [];
  for (let l = 0; l < L; l++) {
    const n = members[l].length;
    const effectiveN = kishEffectiveNOf(members[l], weights);
    for (let k = 0; k < K; k++) {
      const [low, high] = n > 0 ? percentileInterval(drawn.subarray((l * K + k) * B, (l * K + k + 1) * B), ci) : [NaN, NaN];
      shares.push({ covariate: covariate.name, level: levels[l], theme: k, themeLabel: labels[k], share: n > 0 ? point[l * K + k] : NaN, low, high, n, effectiveN });
    }
  }

  const differences = pairwiseDifferences(covariate.name, levels, labels, K, B, point, drawn, members, ci, options);
  return { covariate: covariate.name, levels, shares, differences, draws: B, posteriorSamples: S, excludedDocuments: excluded, notes };
}

/** Σ w θ_k over all docs of a level into acc; returns Σ w (NaN if 0). */
function accumulate(theta: Float64Array | Float32Array, K: number, docs: Int32Array, weights: Float64Array | undefined, acc: Float64Array): number {
  acc.fill(0);
  let wsum = 0;
  for (let i = 0; i < docs.length; i++) {
    const d = docs[i];
    const w = weights ? weights[d] : 1;
    if (w === 0) continue;
    wsum += w;
    const base = d * K;
    for (let k = 0; k < K; k++) acc[k] += w * theta[base + k];
  }
  return wsum > 0 ? wsum : NaN;
}

function pairwiseDifferences(
  name: string, levels: readonly string[], labels: string[], K: number, B: number,
  point: Float64Array, drawn: Float64Array, members: Int32Array[], ci: number, options: ContrastOptions,
): DifferenceRow[] {
  const L = levels.length;
  const pairs: [number, number][] = [];
  const ref = options.reference === undefined ? -1 : levels.indexOf(options.reference);
  if (options.reference !== undefined && ref < 0) {
    throw new Error(`Reference level "${options.reference}" is not a level of "${name}" (levels: ${levels.join(', ')}).`);
  }
  for (let a = 0; a < L; a++) {
    for (let b = a + 1; b < L; b++) {
      if (members[a].length === 0 || members[b].length === 0) continue;
      if (ref >= 0 && a !== ref && b !== ref) continue;
      pairs.push(ref === b ? [a, b] : ref === a ? [b, a] : [a, b]);
    }
  }
  const diff = new Float64Array(B);
  const rows: { a: number; b: number; k: number; d: number; low: number; high: number; p: number }[] = [];
  for (const [a, b] of pairs) {
    for (let k = 0; k < K; k++) {
      const oa = (a * K + k) * B;
      const ob = (b * K + k) * B;
      let below = 0;
      let above = 0;
      for (let i = 0; i < B; i++) {
        const v = drawn[oa + i] - drawn[ob + i];
        diff[i] = v;
        if (v <= 0) below++;
        if (v >= 0) above++;
      }
      const [low, high] = percentileInterval(diff, ci);
      const p = Math.min(1, (1 + 2 * Math.min(below, above)) / (B + 1));
      rows.push({ a, b, k, d: point[a * K + k] - point[b * K + k], low, high, p });
    }
  }
  const q = options.fdr === undefined ? 0.05 : options.fdr;
  const fdr = q === null ? null : benjaminiHochberg(rows.map((r) => r.p), q);
  return rows.map((r, i) => ({
    covariate: name, levelA: levels[r.a], levelB: levels[r.b], theme: r.k, themeLabel: labels[r.k],
    difference: r.d, low: r.low, high: r.high, p: r.p,
    pAdjusted: fdr ? fdr.adjusted[i] : NaN, discovery: fdr ? fdr.flags[i] === 1 : false,
  }));
}
