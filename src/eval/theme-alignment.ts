// Per-theme alignment across languages (docs/design.md §6, issue 12): for each theme and pair of
// languages, do two texts that say the same thing in the two languages get the same theme?
//
// Input: matched pairs, each two theme mixtures for two texts in different languages that are
// known to mean the same: the members of one held-out link group, each folded in on its own
// (a translation of an answer), or the terms of one glossary row (p(theme | word), averaged over
// the row's words). For a theme k and a language pair (a, b):
//   involving  = pairs where the dominant theme of either text is k;
//   agreeing   = pairs where the dominant theme of both texts is k;
//   agreement  = agreeing / involving (the Jaccard index of the two sets of texts led by k);
//   chance     = the same figure when texts are paired at random: with p_a, p_b the shares of
//                texts in a and b led by k, P(both | either) = p_a·p_b / (p_a + p_b − p_a·p_b);
//   correlation of theme k's share between the two texts, across all pairs (Pearson).
// Rule: a theme is aligned for a language pair when the lower end of the 95% Wilson score
// interval of its agreement (Wilson, "Probable inference, the law of succession, and statistical
// inference", JASA 1927) lies above chance; with fewer than `minPairs` pairs involving it there
// is too little evidence to say. A theme is flagged "not aligned" when it is not aligned for any
// language pair with enough evidence.

export interface MatchedPair {
  readonly languageA: number;
  readonly languageB: number;
  /** K shares each (need not sum to 1). */
  readonly mixtureA: ArrayLike<number>;
  readonly mixtureB: ArrayLike<number>;
}

export type AlignmentStatus = 'aligned' | 'not aligned' | 'too few pairs';

export interface ThemeAlignmentCell {
  readonly theme: number;
  readonly languageA: string;
  readonly languageB: string;
  /** Pairs of this language pair (all themes). */
  readonly pairs: number;
  readonly involving: number;
  readonly agreeing: number;
  readonly agreement: number;
  readonly chance: number;
  /** Lower end of the 95% Wilson interval of the agreement. */
  readonly low: number;
  /** Pearson correlation of the theme's share between the two texts of a pair (NaN when constant). */
  readonly correlation: number;
  readonly status: AlignmentStatus;
}

export interface LanguagePairAgreement {
  readonly languageA: string;
  readonly languageB: string;
  readonly pairs: number;
  /** Share of pairs whose two texts have the same dominant theme, and that share at random. */
  readonly agreement: number;
  readonly chance: number;
}

export interface ThemeAlignmentResult {
  readonly cells: ThemeAlignmentCell[];
  readonly languagePairs: LanguagePairAgreement[];
  /** Per theme: 'not aligned' if any pair with enough evidence is not aligned, else 'aligned' if any is, else 'too few pairs'. */
  readonly themes: { theme: number; status: AlignmentStatus; pairs: number }[];
  readonly minPairs: number;
}

const Z95 = 1.959963984540054;

/** Lower end of the Wilson score interval for `x` successes in `n` trials (Wilson 1927). */
export function wilsonLower(x: number, n: number, z = Z95): number {
  if (n <= 0) return NaN;
  if (x <= 0) return 0; // exactly, not a rounding error above it
  const p = x / n;
  const z2 = z * z;
  return (p + z2 / (2 * n) - z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n))) / (1 + z2 / n);
}

function argmax(m: ArrayLike<number>, K: number): number {
  let best = 0;
  for (let k = 1; k < K; k++) if (m[k] > m[best]) best = k;
  return best;
}

function pearson(x: Float64Array, y: Float64Array): number {
  const n = x.length;
  if (n < 2) return NaN;
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    mx += x[i];
    my += y[i];
  }
  mx /= n;
  my /= n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = x[i] - mx;
    const dy = y[i] - my;
    sxy += dx * dy;
    sxx += dx * dx;
    syy += dy * dy;
  }
  return sxx > 0 && syy > 0 ? sxy / Math.sqrt(sxx * syy) : NaN;
}

export function themeAlignment(K: number, languages: readonly string[], pairs: readonly MatchedPair[], options: { minPairs?: number } = {}): ThemeAlignmentResult {
  const minPairs = options.minPairs ?? 5;
  // Group by unordered language pair, lower index first.
  const groups = new Map<string, { a: number; b: number; items: { domA: number; domB: number; mA: ArrayLike<number>; mB: ArrayLike<number> }[] }>();
  for (const p of pairs) {
    if (p.languageA === p.languageB) continue;
    const swap = p.languageA > p.languageB;
    const a = swap ? p.languageB : p.languageA;
    const b = swap ? p.languageA : p.languageB;
    const mA = swap ? p.mixtureB : p.mixtureA;
    const mB = swap ? p.mixtureA : p.mixtureB;
    const key = `${a}|${b}`;
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { a, b, items: [] }));
    g.items.push({ domA: argmax(mA, K), domB: argmax(mB, K), mA, mB });
  }
  const cells: ThemeAlignmentCell[] = [];
  const languagePairs: LanguagePairAgreement[] = [];
  const ordered = [...groups.values()].sort((x, y) => x.a - y.a || x.b - y.b);
  for (const g of ordered) {
    const n = g.items.length;
    const ledA = new Float64Array(K);
    const ledB = new Float64Array(K);
    let same = 0;
    for (const it of g.items) {
      ledA[it.domA]++;
      ledB[it.domB]++;
      if (it.domA === it.domB) same++;
    }
    let chanceAll = 0;
    for (let k = 0; k < K; k++) chanceAll += (ledA[k] / n) * (ledB[k] / n);
    const nameA = languages[g.a] ?? String(g.a);
    const nameB = languages[g.b] ?? String(g.b);
    languagePairs.push({ languageA: nameA, languageB: nameB, pairs: n, agreement: same / n, chance: chanceAll });
    const xs = new Float64Array(n);
    const ys = new Float64Array(n);
    for (let k = 0; k < K; k++) {
      let involving = 0;
      let agreeing = 0;
      g.items.forEach((it, i) => {
        xs[i] = it.mA[k];
        ys[i] = it.mB[k];
        if (it.domA === k || it.domB === k) involving++;
        if (it.domA === k && it.domB === k) agreeing++;
      });
      const pa = ledA[k] / n;
      const pb = ledB[k] / n;
      const either = pa + pb - pa * pb;
      const chance = either > 0 ? (pa * pb) / either : 0;
      const low = wilsonLower(agreeing, involving);
      const status: AlignmentStatus = involving < minPairs ? 'too few pairs' : low > chance ? 'aligned' : 'not aligned';
      cells.push({ theme: k, languageA: nameA, languageB: nameB, pairs: n, involving, agreeing, agreement: involving > 0 ? agreeing / involving : NaN, chance, low, correlation: pearson(xs, ys), status });
    }
  }
  const themes = Array.from({ length: K }, (_, k) => {
    const mine = cells.filter((c) => c.theme === k);
    const status: AlignmentStatus = mine.some((c) => c.status === 'not aligned') ? 'not aligned' : mine.some((c) => c.status === 'aligned') ? 'aligned' : 'too few pairs';
    return { theme: k, status, pairs: mine.reduce((s, c) => s + c.involving, 0) };
  });
  return { cells, languagePairs, themes, minPairs };
}

/**
 * p(theme | text) for a short text from its words alone: the mean over its known words of
 * p(k | w) ∝ π_k φ_kw (Bayes' rule with the themes' weights π in that language). Used for
 * glossary terms, whose one or two words are too few to fold in.
 */
export function wordThemeMixture(phi: Float64Array, K: number, tokens: ArrayLike<number>, weights: ArrayLike<number>): Float64Array | null {
  const V = phi.length / K;
  const out = new Float64Array(K);
  const one = new Float64Array(K);
  let used = 0;
  for (let i = 0; i < tokens.length; i++) {
    const w = tokens[i];
    if (w < 0 || w >= V) continue;
    let s = 0;
    for (let k = 0; k < K; k++) s += (one[k] = Math.max(0, weights[k]) * phi[k * V + w]);
    if (!(s > 0)) continue;
    for (let k = 0; k < K; k++) out[k] += one[k] / s;
    used++;
  }
  if (used === 0) return null;
  for (let k = 0; k < K; k++) out[k] /= used;
  return out;
}
