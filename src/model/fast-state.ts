// Count state of the fast sampler: dense word-topic counts n_kw (the Sampler contract exposes
// them), per-language topic totals n_k^ℓ, their cached reciprocals 1/(n_k^ℓ + V_ℓ β_ℓ), and for
// every word row a short unordered list of the topics with n_kw > 0.
//
// Method: the sparse word-topic lists are those of SparseLDA (Yao, Mimno & McCallum, "Efficient
// methods for topic model inference on streaming document collections", KDD 2009, §3.4): the
// "topic-word" bucket only visits topics where the word has a non-zero count. A word row w can
// have at most min(K, freq(w)) non-zero topics, so the lists live in one pool whose total size
// is Σ_w min(K, freq(w)) ≤ N tokens (2 bytes per token at most). Removal from a list is a linear
// scan of that list, which the bucket sum visits anyway.
//
// Everything here is derivable from z (types.ts): the state is rebuilt from z on construction.
import type { Corpus, Priors } from './types.js';
import { checkPriors, countsFromAssignments } from './reference-sampler.js';

export class FastState {
  readonly K: number;
  readonly L: number;
  /** n_kw, (ΣV_ℓ)×K row-major. */
  readonly nkw: Int32Array;
  /** n_k^ℓ, L×K. */
  readonly nk: Int32Array;
  /** 1 / (n_k^ℓ + V_ℓ β_ℓ), L×K. */
  readonly inv: Float64Array;
  /** Word row → first slot of its topic list in `wlTopics`. */
  readonly wlStart: Int32Array;
  /** Word row → number of topics in its list. */
  readonly wlLen: Int32Array;
  /** Pooled topic lists. */
  readonly wlTopics: Uint16Array;
  /** Word row → language (to apply another worker's moves). */
  readonly rowLang: Uint8Array;
  /** V_ℓ β_ℓ per language. */
  readonly vb: Float64Array;
  alpha: Float64Array;
  beta: Float64Array;

  constructor(readonly corpus: Corpus, z: Uint16Array, priors: Priors) {
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
    this.nkw = nkw;
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
    for (let r = 0; r < R; r++) {
      const off = r * K;
      const s = this.wlStart[r];
      let n = 0;
      for (let k = 0; k < K; k++) if (nkw[off + k] > 0) this.wlTopics[s + n++] = k;
      this.wlLen[r] = n;
    }
    this.vb = new Float64Array(L);
    this.inv = new Float64Array(L * K);
    this.alpha = priors.alpha;
    this.beta = priors.beta;
    this.setPriors(priors);
  }

  setPriors(priors: Priors): void {
    checkPriors(this.corpus, priors);
    if (priors.K !== this.K) throw new Error('setPriors cannot change K.');
    this.alpha = priors.alpha;
    this.beta = priors.beta;
    const { K, L, nk, inv, vb } = this;
    for (let l = 0; l < L; l++) {
      vb[l] = this.corpus.vocabSizes[l] * priors.beta[l];
      for (let k = 0; k < K; k++) inv[l * K + k] = 1 / (nk[l * K + k] + vb[l]);
    }
  }

  /**
   * Applies moves made by another worker (AD-LDA merge, Newman et al., JMLR 2009): each entry
   * is two ints, word row and (old << 16 | new).
   */
  applyMoves(log: Int32Array, length: number): void {
    const { K, nkw, nk, inv, vb, wlStart, wlLen, wlTopics, rowLang } = this;
    for (let e = 0; e < length; e += 2) {
      const row = log[e];
      const pair = log[e + 1] >>> 0;
      const old = pair >>> 16;
      const nw = pair & 0xffff;
      const l = rowLang[row];
      const rowK = row * K;
      const lK = l * K;
      if (--nkw[rowK + old] === 0) {
        const s = wlStart[row];
        const last = s + wlLen[row] - 1;
        let j = s;
        while (wlTopics[j] !== old) j++;
        wlTopics[j] = wlTopics[last];
        wlLen[row]--;
      }
      inv[lK + old] = 1 / (--nk[lK + old] + vb[l]);
      if (nkw[rowK + nw]++ === 0) wlTopics[wlStart[row] + wlLen[row]++] = nw;
      inv[lK + nw] = 1 / (++nk[lK + nw] + vb[l]);
    }
  }

  /** Bytes held by arrays that grow with the number of tokens (pooled word lists). */
  perTokenBytes(): number {
    return this.wlTopics.byteLength;
  }

  /** Bytes held by arrays that grow with vocabulary × K (dense counts and list headers). */
  tableBytes(): number {
    return this.nkw.byteLength + this.nk.byteLength + this.inv.byteLength + this.wlStart.byteLength + this.wlLen.byteLength + this.rowLang.byteLength;
  }
}
