// Count state of the fast sampler: per-language topic totals n_k^ℓ, their cached reciprocals
// 1/(n_k^ℓ + V_ℓ β_ℓ), and for every word row a short list of (topic, n_kw) pairs with n_kw > 0,
// kept sorted by count, largest first.
//
// Method: the sparse, count-sorted word-topic lists of SparseLDA (Yao, Mimno & McCallum,
// "Efficient methods for topic model inference on streaming document collections", KDD 2009,
// §3.4). The "topic-word" bucket visits only topics where the word has a non-zero count, and
// reads their counts from the list itself, so the hot loop never touches the dense
// (ΣV_ℓ)×K table (at K = 500 one row is 2 KB; each dense read would be a cache miss). A word
// row has at most min(K, freq(w)) non-zero topics, so the lists live in one pool of
// Σ_w min(K, freq(w)) ≤ N slots (2 + 4 bytes each). Sorting by count puts the likely old topic
// first when it is looked up, and is kept by one bubble step per change, as in SparseLDA.
// Ties are ordered by topic number, so the order is a function of the counts alone and a state
// rebuilt from z (resume from a checkpoint) holds exactly the lists of the running one.
// The dense n_kw of the Sampler contract is rebuilt from the lists only when asked for.
//
// Everything here is derivable from z (types.ts): the state is rebuilt from z on construction.
import type { Corpus, Priors } from './types.js';
import { checkPriors, countsFromAssignments } from './reference-sampler.js';

export class FastState {
  readonly K: number;
  readonly L: number;
  /** n_k^ℓ, L×K. */
  readonly nk: Int32Array;
  /** 1 / (n_k^ℓ + V_ℓ β_ℓ), L×K. */
  readonly inv: Float64Array;
  /** Word row → first slot of its list in the pool. */
  readonly wlStart: Int32Array;
  /** Word row → number of (topic, count) pairs in its list. */
  readonly wlLen: Int32Array;
  /** Pooled topics and their counts n_kw, sorted by count within a row (largest first). */
  readonly wlTopics: Uint16Array;
  readonly wlCounts: Int32Array;
  /** Word row → language (to apply another worker's moves). */
  readonly rowLang: Uint8Array;
  /** V_ℓ β_ℓ per language. */
  readonly vb: Float64Array;
  alpha: Float64Array;
  /** Σ_k α_pk per covariate pattern p. */
  alphaSum: Float64Array;
  beta: Float64Array;
  /** Dense n_kw, rebuilt from the lists on demand (null when this copy never needs it). */
  private dense: Int32Array | null;
  private denseValid = true;

  constructor(readonly corpus: Corpus, z: Uint16Array, priors: Priors, keepDense = true) {
    checkPriors(corpus, priors);
    const K = priors.K;
    this.K = K;
    const L = corpus.languages.length;
    this.L = L;
    if (z.length !== corpus.words.length) throw new Error(`z has ${z.length} entries for ${corpus.words.length} tokens.`);
    for (let i = 0; i < z.length; i++) {
      if (z[i] >= K) throw new Error(`Token ${i} has topic ${z[i]} but K = ${K}.`);
    }
    const R = corpus.wordBase[L];
    const { nkw, nk } = countsFromAssignments(corpus, z, K);
    this.nk = nk;
    this.rowLang = new Uint8Array(R);
    for (let l = 0; l < L; l++) this.rowLang.fill(l, corpus.wordBase[l], corpus.wordBase[l + 1]);
    // Capacity per row = min(K, frequency of the word).
    this.wlStart = new Int32Array(R + 1);
    for (let r = 0; r < R; r++) {
      let f = 0;
      const off = r * K;
      for (let k = 0; k < K; k++) f += nkw[off + k];
      this.wlStart[r + 1] = this.wlStart[r] + (f < K ? f : K);
    }
    this.wlLen = new Int32Array(R);
    this.wlTopics = new Uint16Array(this.wlStart[R]);
    this.wlCounts = new Int32Array(this.wlStart[R]);
    for (let r = 0; r < R; r++) {
      const off = r * K;
      const s = this.wlStart[r];
      let n = 0;
      for (let k = 0; k < K; k++) {
        const c = nkw[off + k];
        if (c === 0) continue;
        // Insertion into the sorted list (construction only).
        let j = s + n++;
        while (j > s && this.wlCounts[j - 1] < c) {
          this.wlCounts[j] = this.wlCounts[j - 1];
          this.wlTopics[j] = this.wlTopics[j - 1];
          j--;
        }
        this.wlCounts[j] = c;
        this.wlTopics[j] = k;
      }
      this.wlLen[r] = n;
    }
    this.dense = keepDense ? nkw : null;
    this.vb = new Float64Array(L);
    this.inv = new Float64Array(L * K);
    this.alpha = priors.alpha;
    this.alphaSum = new Float64Array(priors.alpha.length / K);
    this.beta = priors.beta;
    this.setPriors(priors);
  }

  setPriors(priors: Priors): void {
    checkPriors(this.corpus, priors);
    if (priors.K !== this.K) throw new Error('setPriors cannot change K.');
    this.alpha = priors.alpha;
    this.beta = priors.beta;
    const { K, L, nk, inv, vb } = this;
    const P = priors.alpha.length / K;
    if (this.alphaSum.length !== P) this.alphaSum = new Float64Array(P);
    for (let p = 0; p < P; p++) {
      let a = 0;
      for (let k = 0; k < K; k++) a += priors.alpha[p * K + k];
      this.alphaSum[p] = a;
    }
    for (let l = 0; l < L; l++) {
      vb[l] = this.corpus.vocabSizes[l] * priors.beta[l];
      for (let k = 0; k < K; k++) inv[l * K + k] = 1 / (nk[l * K + k] + vb[l]);
    }
  }

  /** Marks the dense view stale (after counts moved). */
  touched(): void {
    this.denseValid = false;
  }

  /** Dense n_kw, (ΣV_ℓ)×K row-major, rebuilt from the lists when counts moved since last time. */
  denseCounts(): Int32Array {
    if (this.dense === null) throw new Error('This copy of the counts keeps no dense table.');
    if (!this.denseValid) {
      const { K, dense, wlStart, wlLen, wlTopics, wlCounts } = this;
      dense.fill(0);
      const R = wlLen.length;
      for (let r = 0; r < R; r++) {
        const s = wlStart[r];
        const e = s + wlLen[r];
        for (let j = s; j < e; j++) dense[r * K + wlTopics[j]] = wlCounts[j];
      }
      this.denseValid = true;
    }
    return this.dense;
  }

  /**
   * Applies moves made by another worker (AD-LDA merge, Newman et al., JMLR 2009): each entry
   * is two ints, word row and (old << 16 | new).
   */
  applyMoves(log: Int32Array, length: number): void {
    const { K, nk, inv, vb, wlStart, wlLen, wlTopics, wlCounts, rowLang } = this;
    for (let e = 0; e < length; e += 2) {
      const row = log[e];
      const pair = log[e + 1] >>> 0;
      const old = pair >>> 16;
      const nw = pair & 0xffff;
      const l = rowLang[row];
      const lK = l * K;
      const ws = wlStart[row];
      let end = ws + wlLen[row];
      // Decrement old, bubbling down to keep the order; drop it at zero (it is then last).
      let j = ws;
      while (wlTopics[j] !== old) j++;
      let c = --wlCounts[j];
      while (j + 1 < end && (wlCounts[j + 1] > c || (wlCounts[j + 1] === c && wlTopics[j + 1] < old))) {
        wlCounts[j] = wlCounts[j + 1];
        wlTopics[j] = wlTopics[j + 1];
        j++;
      }
      wlCounts[j] = c;
      wlTopics[j] = old;
      if (c === 0) end--;
      inv[lK + old] = 1 / (--nk[lK + old] + vb[l]);
      // Increment new, appending at zero, bubbling up.
      j = ws;
      while (j < end && wlTopics[j] !== nw) j++;
      if (j === end) {
        wlTopics[j] = nw;
        wlCounts[j] = 0;
        end++;
      }
      c = ++wlCounts[j];
      while (j > ws && (wlCounts[j - 1] < c || (wlCounts[j - 1] === c && wlTopics[j - 1] > nw))) {
        wlCounts[j] = wlCounts[j - 1];
        wlTopics[j] = wlTopics[j - 1];
        j--;
      }
      wlCounts[j] = c;
      wlTopics[j] = nw;
      wlLen[row] = end - ws;
      inv[lK + nw] = 1 / (++nk[lK + nw] + vb[l]);
    }
    if (length > 0) this.denseValid = false;
  }

  /** Bytes held by arrays that grow with the number of tokens (the pooled lists). */
  perTokenBytes(): number {
    return this.wlTopics.byteLength + this.wlCounts.byteLength;
  }

  /** Bytes held by arrays that grow with vocabulary × K (dense view, totals, list headers). */
  tableBytes(): number {
    return (this.dense?.byteLength ?? 0) + this.nk.byteLength + this.inv.byteLength + this.wlStart.byteLength + this.wlLen.byteLength + this.rowLang.byteLength;
  }
}
