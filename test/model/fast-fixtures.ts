// Invented synthetic corpora for the fast and parallel sampler tests (no real data).
import { buildCorpus } from '../../src/model/corpus.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import type { Corpus, Priors } from '../../src/model/types.js';

export interface SyntheticOptions {
  K: number;
  groups: number;
  patterns: number;
  seed: number;
}

/** Three languages, groups of 1–3 documents of 1–12 tokens, Zipf-like word choice, random z. */
export function syntheticCorpus(o: SyntheticOptions): { corpus: Corpus; priors: Priors; z: Uint16Array } {
  const rng = Xoshiro128.fromSeed(o.seed);
  const vocab = [40, 25, 60];
  const documents = [];
  for (let g = 0; g < o.groups; g++) {
    const members = 1 + rng.nextInt(3);
    for (let m = 0; m < members; m++) {
      const language = rng.nextInt(3);
      const tokens = new Int32Array(1 + rng.nextInt(12));
      for (let i = 0; i < tokens.length; i++) tokens[i] = Math.floor(vocab[language] * rng.nextDouble() ** 2);
      documents.push({ language, tokens, linkKey: members > 1 ? `g${g}` : null });
    }
  }
  const { corpus } = buildCorpus({ languages: ['en', 'de', 'ja'], vocabSizes: vocab, documents });
  const groupPattern = new Int32Array(corpus.numGroups);
  for (let g = 0; g < groupPattern.length; g++) groupPattern[g] = rng.nextInt(o.patterns);
  const alpha = new Float64Array(o.patterns * o.K);
  for (let i = 0; i < alpha.length; i++) alpha[i] = 0.05 + rng.nextDouble();
  const priors: Priors = { K: o.K, groupPattern, alpha, beta: Float64Array.of(0.01, 0.1, 0.5) };
  const z = new Uint16Array(corpus.words.length);
  for (let i = 0; i < z.length; i++) z[i] = rng.nextInt(o.K);
  return { corpus, priors, z };
}
