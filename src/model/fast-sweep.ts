// The hot loop of the fast sampler: one pass over link groups g0 .. g1-1.
//
// Method: SparseLDA bucket decomposition (Yao, Mimno & McCallum, "Efficient methods for topic
// model inference on streaming document collections", KDD 2009, eq. 2), extended to link groups
// ("Polylingual Topic Models", EMNLP 2009) and a per-pattern α (DMR, UAI 2008). For a token of
// group g (pattern p), language ℓ, word w, with c_k = 1/(n_k^ℓ + V_ℓ β_ℓ):
//
//   (n_gk + α_pk)(n_kw + β_ℓ) c_k =  β_ℓ α_pk c_k          s: smoothing, all K topics
//                                  + β_ℓ n_gk c_k           r: group, topics with n_gk > 0
//                                  + (n_gk + α_pk) n_kw c_k q: word, topics with n_kw > 0
//
// Sampling a bucket with probability proportional to its mass and then a topic inside it draws
// exactly from the full conditional (same distribution as the reference sampler). s depends on
// (p, ℓ), which are fixed within a document: it is computed once per document in O(K) (documents
// are ≈20 tokens, so O(K/20) per token) and kept up to date incrementally while the document's
// tokens move, which also bounds floating-point drift to one document. r is rebuilt per document
// from the group's non-zero topics; n_gk is rebuilt from z when the sweep enters a group (docs are
// short), so no G×K array exists. q is summed fresh per token over the word's non-zero topics,
// with SparseLDA's cached coefficient (n_gk + α_pk) c_k (built in the same O(K) pass as s and
// updated for the two topics a token moves between), so each non-zero topic costs two loads.
import type { Rng } from './types.js';
import type { FastState } from './fast-state.js';
import { logRising } from './log-likelihood.js';

/** Scratch arrays of length K, allocated once per sampler (never inside the loop). */
export interface FastScratch {
  ngk: Int32Array;
  gList: Uint16Array;
  gPos: Int32Array;
  qCum: Float64Array;
  /** (n_gk + α_pk) / (n_k^ℓ + V_ℓ β_ℓ) for the current document (SparseLDA's cached coefficient). */
  coef: Float64Array;
  /**
   * When true, sweepGroups sums Σ_g log p(z_g | α_p(g)) over its groups into groupLogLik, under
   * the priors it sampled with (the group part of the joint likelihood, log-likelihood.ts), while
   * each group's counts n_gk are at hand: the fit's likelihood trace then needs no pass over z,
   * and on several threads the sum is split like the sweep. Off by default (it costs logarithms).
   */
  trackGroupLogLik: boolean;
  groupLogLik: number;
}

export function createScratch(K: number): FastScratch {
  return { ngk: new Int32Array(K), gList: new Uint16Array(K), gPos: new Int32Array(K), qCum: new Float64Array(K), coef: new Float64Array(K), trackGroupLogLik: false, groupLogLik: 0 };
}

/**
 * The group part of the joint likelihood for one group (Dirichlet-multinomial of its topic
 * counts: log-likelihood.ts), then clears the group's counts. Kept out of the sweep's body.
 */
function groupTermAndReset(ngk: Int32Array, gList: Uint16Array, gn: number, alpha: Float64Array, aOff: number, alphaSum: number, n: number): number {
  let sg = -logRising(alphaSum, n);
  for (let j = 0; j < gn; j++) {
    const k = gList[j];
    sg += logRising(alpha[aOff + k], ngk[k]);
    ngk[k] = 0;
  }
  return sg;
}

/**
 * Resamples every token of groups [g0, g1). When `log` is given, each token whose topic changed
 * appends (word row, old << 16 | new) for the parallel merge; returns the log length used.
 */
export function sweepGroups(
  st: FastState,
  scratch: FastScratch,
  z: Uint16Array,
  groupPattern: Int32Array,
  g0: number,
  g1: number,
  rng: Rng,
  log: Int32Array | null,
): number {
  const { K, nk, inv, vb, wlStart, wlLen, wlTopics, wlCounts, alpha, alphaSum, beta } = st;
  const { words, docOffsets, docLanguage, groupDocOffsets, wordBase } = st.corpus;
  const { ngk, gList, gPos, qCum, coef } = scratch;
  let logPos = 0;
  let gn = 0;
  let s = 0;
  let r = 0;
  let q = 0;
  let u = 0;
  let groupLogLik = 0;
  const track = scratch.trackGroupLogLik;
  for (let g = g0; g < g1; g++) {
    const d0 = groupDocOffsets[g];
    const d1 = groupDocOffsets[g + 1];
    const t0 = docOffsets[d0];
    const t1 = docOffsets[d1];
    if (t0 === t1) continue;
    gn = 0;
    for (let i = t0; i < t1; i++) {
      const k = z[i];
      if (ngk[k]++ === 0) {
        gPos[k] = gn;
        gList[gn++] = k;
      }
    }
    const aOff = groupPattern[g] * K;
    for (let d = d0; d < d1; d++) {
      const l = docLanguage[d];
      const b = beta[l];
      const vbl = vb[l];
      const lK = l * K;
      const base = wordBase[l];
      s = 0;
      for (let k = 0; k < K; k++) {
        const c0 = alpha[aOff + k] * inv[lK + k];
        coef[k] = c0;
        s += c0;
      }
      s *= b;
      r = 0;
      for (let j = 0; j < gn; j++) {
        const k = gList[j];
        const c1 = ngk[k] * inv[lK + k];
        coef[k] += c1;
        r += c1;
      }
      r *= b;
      const i1 = docOffsets[d + 1];
      for (let i = docOffsets[d]; i < i1; i++) {
        const row = base + words[i];
        const old = z[i];
        // Remove token i from the counts, keeping s and r current.
        let iv = inv[lK + old];
        let a = alpha[aOff + old];
        let c = ngk[old];
        s -= b * a * iv;
        r -= b * c * iv;
        c--;
        ngk[old] = c;
        if (c === 0) {
          const last = gList[--gn];
          gList[gPos[old]] = last;
          gPos[last] = gPos[old];
        }
        iv = 1 / (--nk[lK + old] + vbl);
        inv[lK + old] = iv;
        s += b * a * iv;
        r += b * c * iv;
        coef[old] = (c + a) * iv;
        if (gn === 0) r = 0;
        // Word list: decrement n_kw of the old topic, bubbling down to keep the order (count
        // descending, then topic ascending: a total order that is a function of the counts alone,
        // so a list rebuilt from z at a checkpoint is the same list and a resumed run draws the
        // same topics); at zero it is last and drops off.
        const ws = wlStart[row];
        let we = ws + wlLen[row];
        let j = ws;
        while (wlTopics[j] !== old) j++;
        let cw = wlCounts[j] - 1;
        while (j + 1 < we && (wlCounts[j + 1] > cw || (wlCounts[j + 1] === cw && wlTopics[j + 1] < old))) {
          wlCounts[j] = wlCounts[j + 1];
          wlTopics[j] = wlTopics[j + 1];
          j++;
        }
        wlCounts[j] = cw;
        wlTopics[j] = old;
        if (cw === 0) we--;
        // Word bucket, summed fresh from the list (counts read from the list, not the dense table).
        q = 0;
        for (j = ws; j < we; j++) {
          q += coef[wlTopics[j]] * wlCounts[j];
          qCum[j - ws] = q;
        }
        u = rng.nextDouble() * (s + r + q);
        let nw = -1;
        let at = -1;
        if (u < q) {
          const wn = we - ws;
          at = 0;
          while (at < wn - 1 && qCum[at] <= u) at++;
          at += ws;
          nw = wlTopics[at];
        } else {
          u -= q;
          if (u < r) {
            for (let jg = 0; jg < gn; jg++) {
              const k = gList[jg];
              u -= b * ngk[k] * inv[lK + k];
              if (u < 0) {
                nw = k;
                break;
              }
            }
            if (nw < 0 && gn > 0) nw = gList[gn - 1];
          } else u -= r;
          if (nw < 0) {
            // Smoothing bucket: O(K), rarely reached (its mass is ∝ β).
            nw = K - 1;
            for (let k = 0; k < K; k++) {
              u -= b * alpha[aOff + k] * inv[lK + k];
              if (u < 0) {
                nw = k;
                break;
              }
            }
          }
        }
        // Add token i back with topic nw.
        iv = inv[lK + nw];
        a = alpha[aOff + nw];
        c = ngk[nw];
        s -= b * a * iv;
        r -= b * c * iv;
        if (c === 0) {
          gPos[nw] = gn;
          gList[gn++] = nw;
        }
        c++;
        ngk[nw] = c;
        iv = 1 / (++nk[lK + nw] + vbl);
        inv[lK + nw] = iv;
        s += b * a * iv;
        r += b * c * iv;
        coef[nw] = (c + a) * iv;
        // Word list: increment n_kw of the new topic (found by the word bucket, or looked up),
        // bubbling up to keep the count order.
        if (at < 0) {
          at = ws;
          while (at < we && wlTopics[at] !== nw) at++;
          if (at === we) {
            wlTopics[at] = nw;
            wlCounts[at] = 0;
            we++;
          }
        }
        cw = wlCounts[at] + 1;
        while (at > ws && (wlCounts[at - 1] < cw || (wlCounts[at - 1] === cw && wlTopics[at - 1] > nw))) {
          wlCounts[at] = wlCounts[at - 1];
          wlTopics[at] = wlTopics[at - 1];
          at--;
        }
        wlCounts[at] = cw;
        wlTopics[at] = nw;
        wlLen[row] = we - ws;
        z[i] = nw;
        if (log !== null && nw !== old) {
          log[logPos++] = row;
          log[logPos++] = (old << 16) | nw;
        }
      }
    }
    if (track) groupLogLik += groupTermAndReset(ngk, gList, gn, alpha, aOff, alphaSum[groupPattern[g]], t1 - t0);
    else for (let j = 0; j < gn; j++) ngk[gList[j]] = 0;
  }
  scratch.groupLogLik = track ? groupLogLik : NaN;
  if (g1 > g0) st.touched();
  return logPos;
}
