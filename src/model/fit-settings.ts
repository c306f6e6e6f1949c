// Settings, hooks and result of a fit (see fit.ts). Defaults and their sources are documented
// field by field.
import type { Checkpoint } from './checkpoint.js';
import { DEFAULT_PRIOR_VARIANCE, type PriorVariance } from './dmr.js';
import { createReferenceSampler } from './reference-sampler.js';
import type { SamplerFactory } from './types.js';

export interface FitSettings {
  K: number;
  sweeps: number;
  burnIn: number;
  seed: number;
  /** Re-estimate λ and β every this many sweeps (0 = never). */
  optimizeEvery: number;
  /** First sweep after which optimization may run. */
  optimizeFrom: number;
  sampleEvery: number;
  /** Keep at most this many whole θ samples (the most recent). */
  keepThetaSamples: number;
  /** …and at most this many Float32 cells in total across them (memory bound). */
  maxThetaSampleCells: number;
  /** Emit a checkpoint every this many sweeps (0 = only when stopping), skipping one while the last cost over 5% of the time since (fit.ts). */
  checkpointEvery: number;
  samplerFactory: SamplerFactory;
  priorVariance: PriorVariance;
  /**
   * Initial symmetric α per topic; null = min(1, 50/K), and initial β = 0.1: the values of
   * Griffiths & Steyvers, "Finding scientific topics", PNAS 2004, §3 (α = 50/K, β = 0.1), with α
   * capped at 1 (common practice). Generous starting priors let the chain explore before the
   * optimizer sharpens them; on the demo study, starting from α = 0.1, β = 0.01 left the chain in
   * visibly worse local modes (log-likelihood per token −5.08 against −4.84).
   */
  initialAlpha: number | null;
  initialBeta: number;
  optimizeBeta: boolean;
  optimizeLambda: boolean;
  /** 'sequential' (warm start on multilingual link groups, then one sequential pass) or 'random'. */
  initialization: 'sequential' | 'random';
  /** Sweeps of the warm start on multilingual link groups (see initialize.ts). */
  warmStartSweeps: number;
  /** Only link groups below this index seed the warm start (null: all); later ones are extra links. */
  seedGroupLimit: number | null;
  /**
   * Start search (start-search.ts): this many independent short chains, each improved by
   * merge–split perturbations, and the most probable becomes the start. 0 = off (the default,
   * and what the services use): one chain from the initialization above.
   */
  startChains: number;
  /** Sweeps of each search chain before its perturbations. */
  startSweeps: number;
  /** Merge–split perturbations tried per search chain. */
  startPerturbations: number;
  /** Gibbs sweeps after each perturbation before it is judged. */
  startRelaxSweeps: number;
  /** Restricted Gibbs sweeps of each proposed split. */
  startRestrictedSweeps: number;
  /** Sampler for the search (null = samplerFactory); a serial sampler avoids restarting workers. */
  startSamplerFactory: SamplerFactory | null;
}

export const DEFAULT_FIT_SETTINGS: Omit<FitSettings, 'K'> = {
  sweeps: 1000,
  burnIn: 200,
  seed: 1,
  optimizeEvery: 10,
  optimizeFrom: -1, // resolved to floor(burnIn / 2)
  sampleEvery: 10,
  keepThetaSamples: 20,
  maxThetaSampleCells: 50_000_000,
  checkpointEvery: 50,
  samplerFactory: createReferenceSampler,
  priorVariance: DEFAULT_PRIOR_VARIANCE,
  initialAlpha: null,
  initialBeta: 0.1,
  optimizeBeta: true,
  optimizeLambda: true,
  initialization: 'sequential',
  warmStartSweeps: 50,
  seedGroupLimit: null,
  startChains: 0,
  startSweeps: 100,
  startPerturbations: 4,
  startRelaxSweeps: 40,
  startRestrictedSweeps: 30,
  startSamplerFactory: null,
};

export interface SweepProgress {
  sweep: number;
  sweeps: number;
  tokensPerSecond: number;
  logLikelihoodPerToken: number;
  /** Estimated seconds left. */
  eta: number;
}

export interface FitHooks {
  onSweep?(progress: SweepProgress): void;
  onCheckpoint?(checkpoint: Checkpoint): void | Promise<void>;
  shouldStop?(): boolean;
  resumeFrom?: Checkpoint;
}

export interface FitResult {
  K: number;
  languages: readonly string[];
  /** φ̂ per language, K×V_ℓ row-major: phi[ℓ][k·V_ℓ + w]; posterior mean over saved samples. */
  phi: Float64Array[];
  /** θ̂ per link group, G×K row-major; posterior mean over saved samples. */
  theta: Float64Array;
  /** The most recent saved θ samples (G×K each) and the sweeps they come from. */
  thetaSamples: Float32Array[];
  thetaSampleSweeps: number[];
  /** λ, K×F row-major (F = features.numFeatures; feature 0 is the intercept). */
  lambda: Float64Array;
  featureNames: string[];
  /** α per pattern (P×K) and the pattern of each group. */
  alpha: Float64Array;
  groupPattern: Int32Array;
  beta: Float64Array;
  /** Joint log-likelihood per token after each sweep. */
  logLikelihoodTrace: Float64Array;
  /** Final assignments and counts ((ΣV_ℓ)×K and L×K). */
  z: Uint16Array;
  wordTopicCounts: Int32Array;
  topicTotals: Int32Array;
  /** Final state, to continue the run later. */
  checkpoint: Checkpoint;
  diagnostics: {
    sampler: string;
    sweepsCompleted: number;
    stopped: boolean;
    samples: number;
    tokens: number;
    seconds: number;
    tokensPerSecond: number;
    optimizations: number;
    finalLogLikelihoodPerToken: number;
    /** Outcome of the start search, null when it was off or the run was resumed. */
    startSearch: { chainLogLikelihoods: number[]; chainImprovements: number[] } | null;
  };
}

export function resolveFitSettings(settings: Partial<FitSettings> & { K: number }): FitSettings {
  const s = { ...DEFAULT_FIT_SETTINGS, ...settings };
  if (s.optimizeFrom < 0) s.optimizeFrom = Math.floor(s.burnIn / 2);
  if (!(Number.isInteger(s.K) && s.K >= 1 && s.K <= 65535)) throw new Error(`The number of themes must be a whole number from 1 to 65535 (got ${s.K}).`);
  if (!(s.sweeps >= 1)) throw new Error(`Sweeps must be at least 1 (got ${s.sweeps}).`);
  if (!(s.burnIn >= 0 && s.burnIn < s.sweeps)) throw new Error(`Burn-in (${s.burnIn}) must be below the number of sweeps (${s.sweeps}).`);
  if (!(Number.isInteger(s.startChains) && s.startChains >= 0)) throw new Error(`startChains must be a whole number ≥ 0 (got ${s.startChains}).`);
  if (!(s.sampleEvery >= 1)) throw new Error('sampleEvery must be at least 1.');
  return s;
}
