// Held-out document-completion perplexity.
//
// Method: Wallach, Murray, Salakhutdinov & Mimno, "Evaluation methods for topic models",
// ICML 2009, §4.2 ("document completion"). Each held-out document's tokens are split into an
// observed part and an evaluated part; θ is estimated from the observed part alone (fold-in
// with φ fixed), and the evaluated part is scored with
//   log p(w_eval) ≈ Σ_i log Σ_k θ_k φ_k,w_i,   perplexity = exp(−Σ log p / N_eval).
// Using a point estimate of θ (the fold-in average) instead of the paper's left-to-right
// estimator is the common "estimated θ" variant; it is exact when θ is the true mixture, which
// is what the simulation test checks.
//
// A held-out unit is a link group (docs/design.md §3): its documents share one mixture, so the observed
// parts of all its documents are folded in together and all evaluated parts are scored.

/** How a document's tokens are split. */
export type SplitMode =
  /** Even positions (0, 2, 4, …) observed, odd positions evaluated: both halves span the text. */
  | 'alternate'
  /** First ⌈n/2⌉ tokens observed, the rest evaluated (Wallach et al. 2009, §4.2). */
  | 'first-half';

export interface DocumentSplit {
  readonly observed: Int32Array;
  readonly evaluated: Int32Array;
}

/** Split one document's word ids into observed and evaluated parts (default 'alternate'). */
export function splitDocument(words: Int32Array, mode: SplitMode = 'alternate'): DocumentSplit {
  const n = words.length;
  const nObs = Math.ceil(n / 2);
  if (mode === 'first-half') return { observed: words.slice(0, nObs), evaluated: words.slice(nObs) };
  const observed = new Int32Array(nObs);
  const evaluated = new Int32Array(n - nObs);
  for (let i = 0; i < n; i++) {
    if ((i & 1) === 0) observed[i >> 1] = words[i];
    else evaluated[i >> 1] = words[i];
  }
  return { observed, evaluated };
}

/** The corpus arrays perplexity needs (a subset of src/model's Corpus). */
export interface HeldOutCorpus {
  readonly docOffsets: Int32Array;
  readonly words: Int32Array;
  readonly docLanguage: Uint8Array;
  readonly groupDocOffsets: Int32Array;
}

export interface ObservedDocument {
  readonly doc: number;
  readonly language: number;
  readonly words: Int32Array;
}

/** θ (length K, sums to 1) of a link group from its observed tokens; φ stays fixed. */
export type FoldInFunction = (group: number, observed: readonly ObservedDocument[]) => Float64Array;

export interface PerplexityResult {
  readonly perplexity: number;
  /** Σ log p of the evaluated tokens (natural log). */
  readonly logLikelihood: number;
  readonly evaluatedTokens: number;
  readonly observedTokens: number;
  readonly groups: number;
  /** Held-out groups with nothing to evaluate (fewer than two tokens in every document). */
  readonly skippedGroups: number;
  /** Evaluated tokens whose word id is outside the language vocabulary (skipped). */
  readonly unknownTokens: number;
}

/**
 * Document-completion perplexity over the held-out link groups `groups`.
 * `phi[ℓ]` is K×V_ℓ row-major (see topicWordDistributions).
 */
export function documentCompletionPerplexity(
  corpus: HeldOutCorpus,
  groups: ArrayLike<number>,
  phi: readonly Float64Array[],
  K: number,
  foldIn: FoldInFunction,
  mode: SplitMode = 'alternate',
): PerplexityResult {
  let ll = 0;
  let nEval = 0;
  let nObs = 0;
  let skipped = 0;
  let unknown = 0;
  let used = 0;
  for (let gi = 0; gi < groups.length; gi++) {
    const g = groups[gi];
    const parts: ObservedDocument[] = [];
    const evals: { language: number; words: Int32Array }[] = [];
    let groupEval = 0;
    let groupObs = 0;
    for (let d = corpus.groupDocOffsets[g]; d < corpus.groupDocOffsets[g + 1]; d++) {
      const split = splitDocument(corpus.words.subarray(corpus.docOffsets[d], corpus.docOffsets[d + 1]), mode);
      const language = corpus.docLanguage[d];
      parts.push({ doc: d, language, words: split.observed });
      evals.push({ language, words: split.evaluated });
      groupEval += split.evaluated.length;
      groupObs += split.observed.length;
    }
    if (groupEval === 0) {
      skipped++;
      continue;
    }
    used++;
    nObs += groupObs;
    const theta = foldIn(g, parts);
    for (const { language, words } of evals) {
      const table = phi[language];
      const V = table.length / K;
      for (let i = 0; i < words.length; i++) {
        const w = words[i];
        if (w < 0 || w >= V) {
          unknown++;
          continue;
        }
        let p = 0;
        for (let k = 0; k < K; k++) p += theta[k] * table[k * V + w];
        ll += Math.log(p);
        nEval++;
      }
    }
  }
  return {
    perplexity: nEval > 0 ? Math.exp(-ll / nEval) : NaN,
    logLikelihood: ll,
    evaluatedTokens: nEval,
    observedTokens: nObs,
    groups: used,
    skippedGroups: skipped,
    unknownTokens: unknown,
  };
}
