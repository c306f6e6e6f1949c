// Jensen–Shannon divergence between two theme mixtures.
//
// Method: JSD(p, q) = ½ KL(p ‖ m) + ½ KL(q ‖ m), m = ½(p + q) (Lin, "Divergence measures based
// on the Shannon entropy", IEEE Trans. Information Theory 37(1), 1991), in bits, so it lies in
// [0, 1]; terms with p_k = 0 contribute 0 (the limit of x log x).

/** JSD in bits between p[pOffset..pOffset+K) and q[qOffset..qOffset+K). */
export function jensenShannon(p: ArrayLike<number>, q: ArrayLike<number>, K: number, pOffset = 0, qOffset = 0): number {
  let sum = 0;
  for (let k = 0; k < K; k++) {
    const a = p[pOffset + k];
    const b = q[qOffset + k];
    const m = 0.5 * (a + b);
    if (a > 0) sum += a * Math.log(a / m);
    if (b > 0) sum += b * Math.log(b / m);
  }
  const v = (0.5 * sum) / Math.LN2;
  return v < 0 ? 0 : v;
}
