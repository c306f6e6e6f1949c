// Shared contracts of the numerical core. Plain data and typed arrays only (docs/design.md §2–§4):
// no SQL, HTTP or file paths may enter src/model.

/**
 * The corpus as flat typed arrays (docs/design.md §3): never arrays of objects per token.
 * Documents are ordered so that the documents of one link group are contiguous:
 * group g owns documents groupDocOffsets[g] .. groupDocOffsets[g+1]-1.
 */
export interface Corpus {
  /** BCP 47 language subtags; the index is the language id. */
  readonly languages: readonly string[];
  /** V_ℓ, vocabulary size per language. */
  readonly vocabSizes: Int32Array;
  /** Prefix sums of vocabSizes (length L+1): global word row = wordBase[ℓ] + w. */
  readonly wordBase: Int32Array;
  /** Length D+1: tokens of document d are words[docOffsets[d] .. docOffsets[d+1]). */
  readonly docOffsets: Int32Array;
  /** Word id of each token, within its document's language vocabulary. */
  readonly words: Int32Array;
  /** Language id per document. */
  readonly docLanguage: Uint8Array;
  /** Link group id per document (non-decreasing). */
  readonly docGroup: Int32Array;
  /** Length G+1: documents of group g are groupDocOffsets[g] .. groupDocOffsets[g+1]-1. */
  readonly groupDocOffsets: Int32Array;
  readonly numGroups: number;
}

/**
 * Document-topic and topic-word priors. Groups with identical covariate rows share one
 * "pattern" so α is stored per pattern (P×K), not per group (G×K): this keeps state small
 * and is what the count-histogram optimizers need (Wallach 2008 thesis, ch. 2).
 */
export interface Priors {
  readonly K: number;
  /** Pattern index per group (length G). */
  readonly groupPattern: Int32Array;
  /** α, row-major P×K. */
  readonly alpha: Float64Array;
  /** β_ℓ per language (symmetric within a language). */
  readonly beta: Float64Array;
}

/** A seeded random source whose whole state can be saved in a checkpoint. */
export interface Rng {
  /** Uniform double in [0, 1). */
  nextDouble(): number;
  /** Uniform integer in [0, n). */
  nextInt(n: number): number;
  /** Copy of the state, versioned (element 0 = schema version). */
  saveState(): Uint32Array;
}

/**
 * A collapsed Gibbs sampler for the polylingual DMR model (docs/design.md §4). The canonical state is
 * the assignment vector z; every count a sampler keeps is derivable from z, so checkpoints save
 * only z, the priors and the RNG state. Reference and fast samplers implement the same interface
 * and must pass one shared exactness suite.
 */
export interface Sampler {
  readonly name: string;
  /** Current topic per token (owned by the sampler, updated in place). */
  readonly z: Uint16Array;
  /** One pass over every token. */
  sweep(rng: Rng): void;
  /** Replace priors after hyperparameter optimization (K and groupPattern do not change). */
  setPriors(priors: Priors): void;
  /** n_kw as dense (ΣV_ℓ)×K row-major, row = wordBase[ℓ] + w. May be a live view: do not mutate. */
  wordTopicCounts(): Int32Array;
  /** n_k^ℓ as dense L×K row-major. May be a live view: do not mutate. */
  topicTotals(): Int32Array;
  /** Release workers or buffers (parallel samplers). */
  dispose?(): void | Promise<void>;
  /**
   * Optional: from now on, sum the group part of the joint likelihood, Σ_g log p(z_g | α_p(g)),
   * while sweeping (log-likelihood.ts, groupLogLikelihood), so a caller that traces the
   * likelihood after every sweep need not pass over z again.
   */
  trackGroupLogLikelihood?(): void;
  /** That sum for the state after the last sweep; NaN before a tracked sweep or after setPriors. */
  lastGroupLogLikelihood?(): number;
}

export type SamplerFactory = (corpus: Corpus, z: Uint16Array, priors: Priors) => Sampler;
