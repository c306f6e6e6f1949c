// A declared (questionnaire) language as a prior, not the truth (docs/design.md §5). People sometimes
// answer in another language than the questionnaire's, so the declaration is evidence about the
// written language, combined with the text's own by Bayes' rule:
//   p(ℓ | text, declared d) ∝ p(text | ℓ) · π_d(ℓ),  π_d(d) = m,  π_d(ℓ ≠ d) = (1 − m)/(n − 1)
// over the n candidate languages. With m = 0.8 and five languages the text must favour another
// language about 16 to 1 over the declared one before it wins: confident detection wins, too
// little evidence keeps the declaration.

/**
 * Prior mass on the declared language (common practice: a strong prior between 0.8 and 0.9;
 * the demo's 3% and real surveys' few per cent of answers in another language than declared
 * would justify more, but the text must be able to win on a short sentence).
 */
export const DECLARED_PRIOR = 0.8;

/** π_d over the candidates, aligned with them; uniform when the declared one is not a candidate. */
export function declaredPrior(candidates: readonly string[], declared: string, mass: number): number[] {
  const n = candidates.length;
  if (n === 1 || !candidates.includes(declared)) return candidates.map(() => 1 / n);
  const rest = (1 - mass) / (n - 1);
  return candidates.map((c) => (c === declared ? mass : rest));
}

/**
 * Combine a heuristic confidence for one language (a trigram guess: no likelihoods to combine)
 * with π_d, reading the confidence as that language's posterior under a uniform prior and the
 * rest as spread evenly (common practice).
 */
export function combineGuess(
  candidates: readonly string[],
  guess: string,
  confidence: number,
  prior: readonly number[],
): { language: string; probability: number }[] {
  const n = candidates.length;
  const c = Math.min(0.999, Math.max(1 / n, confidence));
  const scores = candidates.map((l, j) => (l === guess ? c : (1 - c) / Math.max(1, n - 1)) * prior[j]);
  const sum = scores.reduce((s, x) => s + x, 0);
  return candidates.map((language, j) => ({ language, probability: scores[j] / sum })).sort((a, b) => b.probability - a.probability);
}
