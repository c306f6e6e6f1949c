// Parallel sweeps: approximate distributed Gibbs sampling, AD-LDA (Newman, Asuncion, Smyth &
// Welling, "Distributed algorithms for topic models", JMLR 10, 2009, §2). Link groups are split
// into contiguous partitions of equal token count; partition 0 runs on the calling thread, the
// others on worker threads. Every partition samples with the fast exact sweep (fast-sweep.ts)
// against its own copy of the word-topic counts and logs its moves; before the next sweep (or a
// read of the counts, or new priors) each copy adds the other partitions' moves, so all copies
// equal the counts of the shared z again. One thread hand-off per sweep: the merge of sweep s−1
// and the sampling of sweep s run in one command (protocol.ts).
// Corpus arrays, z, α and β live in SharedArrayBuffers: shared, never copied per token.
// Deterministic for a given seed and thread count: the partition depends only on the thread
// count, partition p draws from Xoshiro128.fromSeed(sweepSeed, p), and merges add integers.
import { availableParallelism } from 'node:os';
import type { Corpus, Priors, Rng, Sampler, SamplerFactory } from '../types.js';
import { FastState } from '../fast-state.js';
import { createScratch, sweepGroups, type FastScratch } from '../fast-sweep.js';
import { Xoshiro128 } from '../rng.js';
import { checkPriors } from '../reference-sampler.js';
import { partitionGroups } from './partition.js';
import { PendingMerge } from './merge.js';
import { CMD_INIT, CMD_PRIORS, CMD_SWEEP, LOG_LENGTH, type InitMessage } from './protocol.js';
import { WorkerPool } from './worker-pool.js';

type Typed = Int32Array | Uint16Array | Uint8Array | Float64Array;

function shared<T extends Typed>(a: T): T {
  if (a.buffer instanceof SharedArrayBuffer) return a;
  const ctor = a.constructor as new (b: SharedArrayBuffer) => T;
  const out = new ctor(new SharedArrayBuffer(a.byteLength));
  out.set(a as never);
  return out;
}

function sharedCorpus(c: Corpus): Corpus {
  return {
    languages: [...c.languages],
    vocabSizes: shared(c.vocabSizes),
    wordBase: shared(c.wordBase),
    docOffsets: shared(c.docOffsets),
    words: shared(c.words),
    docLanguage: shared(c.docLanguage),
    docGroup: shared(c.docGroup),
    groupDocOffsets: shared(c.groupDocOffsets),
    numGroups: c.numGroups,
  };
}

class ParallelSampler implements Sampler {
  readonly name: string;
  private readonly job: InitMessage;
  private readonly state: FastState;
  private readonly scratch: FastScratch;
  private readonly pending: PendingMerge;
  private sweeps = 0;
  private groupLogLik = NaN;
  private released = false;
  /** The assignments, in shared memory (a copy of the caller's z when that was not shared). */
  readonly z: Uint16Array;

  constructor(
    private readonly pool: WorkerPool,
    private readonly release: (pool: WorkerPool) => Promise<void>,
    corpus: Corpus,
    z: Uint16Array,
    priors: Priors,
  ) {
    checkPriors(corpus, priors);
    const T = pool.partitions;
    this.name = `parallel-${T}`;
    const c = sharedCorpus(corpus);
    const bounds = partitionGroups(c, T);
    // With one partition nothing is merged, so no log is kept.
    const logs: Int32Array[][] = [[], []];
    for (const side of logs) {
      for (let p = 0; p < T; p++) {
        const tokens = T === 1 ? 0 : c.docOffsets[c.groupDocOffsets[bounds[p + 1]]] - c.docOffsets[c.groupDocOffsets[bounds[p]]];
        side.push(new Int32Array(new SharedArrayBuffer(Math.max(2, 2 * tokens) * 4)));
      }
    }
    this.job = {
      corpus: c,
      z: shared(z),
      K: priors.K,
      groupPattern: shared(priors.groupPattern),
      alpha: shared(Float64Array.from(priors.alpha)),
      beta: shared(Float64Array.from(priors.beta)),
      bounds,
      logs,
      ctrlAll: pool.ctrlAll,
      track: new Int32Array(new SharedArrayBuffer(4)),
      groupLogLik: new Float64Array(new SharedArrayBuffer(8 * T)),
    };
    this.z = this.job.z;
    this.state = new FastState(c, this.job.z, this.priorsView());
    this.scratch = createScratch(priors.K);
    this.pending = new PendingMerge(logs, pool.ctrlAll, 0);
    pool.post(CMD_INIT, 0, this.job);
    pool.wait();
  }

  sweep(rng: Rng): void {
    const { pool, job, state } = this;
    const seed = Math.floor(rng.nextDouble() * 4294967296) | 0;
    const parity = this.sweeps++ & 1;
    pool.post(CMD_SWEEP, seed, undefined, parity);
    this.pending.settle(state);
    const log = pool.partitions > 1 ? job.logs[parity][0] : null;
    const length = sweepGroups(state, this.scratch, job.z, job.groupPattern, job.bounds[0], job.bounds[1], Xoshiro128.fromSeed(seed, 0), log);
    Atomics.store(pool.ctrlAll, LOG_LENGTH + parity, length);
    job.groupLogLik[0] = this.scratch.groupLogLik;
    pool.wait();
    this.pending.owe(parity);
    let sum = 0;
    for (let p = 0; p < pool.partitions; p++) sum += job.groupLogLik[p];
    this.groupLogLik = sum;
  }

  setPriors(priors: Priors): void {
    checkPriors(this.job.corpus, priors);
    if (priors.K !== this.job.K || priors.alpha.length !== this.job.alpha.length) {
      throw new Error('setPriors cannot change K or the number of covariate patterns.');
    }
    this.job.alpha.set(priors.alpha);
    this.job.beta.set(priors.beta);
    this.pending.settle(this.state);
    this.state.setPriors(this.priorsView());
    this.groupLogLik = NaN;
    // The workers settle their own owed merge before taking the new priors.
    this.pool.post(CMD_PRIORS);
    this.pool.wait();
  }

  trackGroupLogLikelihood(): void {
    this.scratch.trackGroupLogLik = true;
    Atomics.store(this.job.track, 0, 1);
  }

  lastGroupLogLikelihood(): number {
    return this.groupLogLik;
  }

  wordTopicCounts(): Int32Array {
    this.pending.settle(this.state);
    return this.state.denseCounts();
  }

  topicTotals(): Int32Array {
    this.pending.settle(this.state);
    return this.state.nk;
  }

  /** Bytes of state that grow with the tokens: z, pooled word lists of every copy, move logs. */
  perTokenStateBytes(): number {
    const logs = this.job.logs.flat().reduce((s, l) => s + l.byteLength, 0);
    return this.z.byteLength + this.pool.partitions * this.state.perTokenBytes() + logs;
  }

  dispose(): Promise<void> {
    if (this.released) return Promise.resolve();
    this.released = true;
    return this.release(this.pool);
  }

  private priorsView(): Priors {
    return { K: this.job.K, groupPattern: this.job.groupPattern, alpha: this.job.alpha, beta: this.job.beta };
  }
}

export interface ParallelSamplerFactory extends SamplerFactory {
  readonly threads: number;
  /** Terminates workers kept for reuse (only with `keepWorkers`). */
  close(): Promise<void>;
}

export interface ParallelOptions {
  /**
   * Keep the worker threads between samplers made by this factory (dispose returns them to the
   * factory; close() ends them). Default false: each sampler's dispose() terminates its workers.
   */
  keepWorkers?: boolean;
}

/** A factory of AD-LDA parallel samplers on `threads` threads (default: every core). */
export function createParallelSampler(threads: number = availableParallelism(), options: ParallelOptions = {}): ParallelSamplerFactory {
  if (!(Number.isInteger(threads) && threads >= 1 && threads <= 256)) {
    throw new Error(`The number of threads must be a whole number from 1 to 256 (got ${threads}).`);
  }
  let kept: WorkerPool | null = null;
  const terminate = (pool: WorkerPool) => pool.terminate();
  const giveBack = async (pool: WorkerPool) => {
    if (pool === kept) pool.busy = false;
    else await pool.terminate();
  };
  const factory = (corpus: Corpus, z: Uint16Array, priors: Priors): Sampler => {
    if (!options.keepWorkers) {
      const pool = new WorkerPool(threads);
      try {
        return new ParallelSampler(pool, terminate, corpus, z, priors);
      } catch (error) {
        void pool.terminate();
        throw error;
      }
    }
    if (kept === null) kept = new WorkerPool(threads);
    const pool = kept.busy ? new WorkerPool(threads) : kept;
    pool.busy = true;
    try {
      return new ParallelSampler(pool, giveBack, corpus, z, priors);
    } catch (error) {
      void giveBack(pool);
      throw error;
    }
  };
  return Object.assign(factory, {
    threads,
    close: async () => {
      const pool = kept;
      kept = null;
      if (pool) await pool.terminate();
    },
  });
}
