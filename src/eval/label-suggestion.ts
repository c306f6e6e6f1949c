// Suggested theme labels from each theme's most distinctive words.
//
// Method: words are ranked by relevance (Sievert & Shirley, "A method for visualizing
// and interpreting topics", ACL Workshop on Interactive Language Learning, Visualization, and
// Interfaces, 2014, eq. 1):
//   r(w, k | λ) = λ · log φ_kw + (1 − λ) · log(φ_kw / p_w),
// where p_w = Σ_j π_j φ_jw is the word's probability in the language's text as a whole and π_j
// the share of that text given to theme j. λ = 1 ranks by probability alone (frequent words that
// every theme uses come first); λ = 0 ranks by lift alone (rare words lead). The paper's user
// study found λ ≈ 0.6 best for interpreting topics, which is the default here.
// Notes: the label is the top few words of the study's first language; the other languages'
// top words are returned beside it so the reader sees whether the theme means the same thing in
// each. When two themes would get the same label, the later one takes its next word until it
// differs (common practice: a label must tell themes apart).

export interface LabelSuggestionInput {
  readonly K: number;
  readonly languages: readonly string[];
  /** φ̂ per language, K×V_ℓ row-major. */
  readonly phi: readonly Float64Array[];
  /** Written form of each word id, per language. */
  readonly words: readonly (readonly string[])[];
  /** Per language, K weights: how much of that language's text each theme holds (any scale). */
  readonly themeWeights: readonly ArrayLike<number>[];
  /** Index of the language the label is written in. */
  readonly primary: number;
  /** Relevance weight λ in [0, 1] (default 0.6, Sievert & Shirley 2014). */
  readonly lambda?: number;
  /** Words in a label (default 3). */
  readonly wordsPerLabel?: number;
  /** Distinctive words listed per language (default 5). */
  readonly wordsPerLanguage?: number;
}

export interface LabelSuggestion {
  readonly theme: number;
  /** The suggested label: the first language's most relevant words, comma-separated. */
  readonly label: string;
  /** Most relevant words per language, the label's language first. */
  readonly words: { language: string; words: string[] }[];
}

/** Relevance of a word with probability `phiKw` in the theme and `pw` overall (Sievert & Shirley 2014, eq. 1). */
export function relevance(phiKw: number, pw: number, lambda: number): number {
  if (!(phiKw > 0) || !(pw > 0)) return -Infinity;
  return lambda * Math.log(phiKw) + (1 - lambda) * Math.log(phiKw / pw);
}

/** p_w = Σ_j π_j φ_jw for every word of one language, with π the normalised theme weights. */
export function wordProbabilities(phi: Float64Array, K: number, weights: ArrayLike<number>): Float64Array {
  const V = phi.length / K;
  let total = 0;
  for (let j = 0; j < K; j++) total += Math.max(0, weights[j]);
  const pw = new Float64Array(V);
  for (let j = 0; j < K; j++) {
    const pi = total > 0 ? Math.max(0, weights[j]) / total : 1 / K;
    if (pi === 0) continue;
    const row = j * V;
    for (let w = 0; w < V; w++) pw[w] += pi * phi[row + w];
  }
  return pw;
}

function rank(phi: Float64Array, K: number, k: number, pw: Float64Array, lambda: number, n: number): number[] {
  const V = pw.length;
  if (V === 0 || n <= 0) return [];
  const scores = new Float64Array(V);
  for (let w = 0; w < V; w++) scores[w] = relevance(phi[k * V + w], pw[w], lambda);
  const ids = Array.from({ length: V }, (_, w) => w).filter((w) => scores[w] > -Infinity);
  ids.sort((a, b) => scores[b] - scores[a] || a - b);
  return ids.slice(0, n);
}

/** Word ids of one theme and language, most relevant first (ties: lower id first). */
export function relevantWords(phi: Float64Array, K: number, k: number, weights: ArrayLike<number>, lambda: number, n: number): number[] {
  return rank(phi, K, k, wordProbabilities(phi, K, weights), lambda, n);
}

export function suggestThemeLabels(input: LabelSuggestionInput): LabelSuggestion[] {
  const { K, languages, phi, words, themeWeights, primary } = input;
  const lambda = input.lambda ?? 0.6;
  const per = input.wordsPerLabel ?? 3;
  const listed = Math.max(per, input.wordsPerLanguage ?? 5);
  const order = [primary, ...languages.map((_, l) => l).filter((l) => l !== primary)];
  const used = new Set<string>();
  const out: LabelSuggestion[] = [];
  const pw = languages.map((_, l) => wordProbabilities(phi[l], K, themeWeights[l]));
  for (let k = 0; k < K; k++) {
    const lists = order.map((l) => ({ l, ids: rank(phi[l], K, k, pw[l], lambda, listed + K) }));
    const primaryWords = lists[0].ids.map((w) => words[primary][w] ?? '').filter((w) => w !== '');
    let take = Math.min(per, primaryWords.length);
    let label = primaryWords.slice(0, take).join(', ');
    while (used.has(label) && take < primaryWords.length) label = primaryWords.slice(0, ++take).join(', ');
    if (label === '' || used.has(label)) label = label === '' ? `Theme ${k + 1}` : `${label} (${k + 1})`;
    used.add(label);
    out.push({
      theme: k,
      label,
      words: lists.map(({ l, ids }) => ({ language: languages[l], words: ids.slice(0, listed).map((w) => words[l][w] ?? '').filter((w) => w !== '') })),
    });
  }
  return out;
}
