// The fast exact sampler: the SparseLDA bucket decomposition (Yao, Mimno & McCallum, "Efficient
// methods for topic model inference on streaming document collections", KDD 2009) over link
// groups, languages and per-pattern α. Same conditional as the reference sampler (docs/design.md §4),
// less work per token: see fast-sweep.ts for the decomposition and fast-state.ts for the counts.
import type { Corpus, Priors, Rng, Sampler, SamplerFactory } from './types.js';
import { FastState } from './fast-state.js';
import { createScratch, sweepGroups, type FastScratch } from './fast-sweep.js';

class FastSampler implements Sampler {
  readonly name = 'fast';
  private readonly state: FastState;
  private readonly scratch: FastScratch;
  private groupPattern: Int32Array;

  constructor(corpus: Corpus, readonly z: Uint16Array, priors: Priors) {
    this.state = new FastState(corpus, z, priors);
    this.scratch = createScratch(priors.K);
    this.groupPattern = priors.groupPattern;
  }

  sweep(rng: Rng): void {
    sweepGroups(this.state, this.scratch, this.z, this.groupPattern, 0, this.state.corpus.numGroups, rng, null);
  }

  setPriors(priors: Priors): void {
    this.state.setPriors(priors);
    this.groupPattern = priors.groupPattern;
    this.scratch.groupLogLik = NaN;
  }

  trackGroupLogLikelihood(): void {
    this.scratch.trackGroupLogLik = true;
  }

  lastGroupLogLikelihood(): number {
    return this.scratch.groupLogLik;
  }

  wordTopicCounts(): Int32Array {
    return this.state.denseCounts();
  }

  topicTotals(): Int32Array {
    return this.state.nk;
  }

  /** Bytes of sampler state that grow with the tokens (z and the pooled word lists). */
  perTokenStateBytes(): number {
    return this.z.byteLength + this.state.perTokenBytes();
  }
}

/** The fast exact collapsed Gibbs sampler (see file header). */
export const createFastSampler: SamplerFactory = (corpus, z, priors) => new FastSampler(corpus, z, priors);
