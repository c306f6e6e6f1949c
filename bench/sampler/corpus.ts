// Seeded synthetic corpus for the sampler benchmark (invented data, issue #5): 4 languages,
// link groups of one document (85%) or two documents in different languages (15%), documents of
// 5–35 tokens (mean 20), drawn from a planted polylingual topic model so that the samplers have
// real structure to find (sparse topics make the word-topic counts sparse, as in real text).
import { buildCorpus } from '../../src/model/corpus.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import type { Corpus } from '../../src/model/types.js';

export interface BenchCorpus {
  corpus: Corpus;
  /** Covariate pattern per group (4 patterns), to exercise the per-pattern α. */
  groupPattern: Int32Array;
  patterns: number;
}

const LANGUAGES = ['en', 'de', 'es', 'pl'];
const PLANTED_TOPICS = 60;
const WORDS_PER_TOPIC = 150;

export function benchCorpus(groups: number, seed: number, vocabPerLanguage = 6000): BenchCorpus {
  const rng = Xoshiro128.fromSeed(seed);
  const L = LANGUAGES.length;
  // Planted topic t in language ℓ: Zipf(1) over WORDS_PER_TOPIC words picked at random.
  const topicWords = new Int32Array(PLANTED_TOPICS * L * WORDS_PER_TOPIC);
  for (let i = 0; i < topicWords.length; i++) topicWords[i] = rng.nextInt(vocabPerLanguage);
  const zipf = new Float64Array(WORDS_PER_TOPIC);
  let acc = 0;
  for (let r = 0; r < WORDS_PER_TOPIC; r++) zipf[r] = acc += 1 / (r + 1);
  for (let r = 0; r < WORDS_PER_TOPIC; r++) zipf[r] /= acc;
  const theta = new Float64Array(PLANTED_TOPICS);
  const documents: { language: number; tokens: Int32Array; linkKey: string | null }[] = [];
  for (let g = 0; g < groups; g++) {
    // Each group mixes 1–3 planted topics (short answers talk about one or two things).
    const n = 1 + rng.nextInt(3);
    theta.fill(0);
    for (let j = 0; j < n; j++) theta[rng.nextInt(PLANTED_TOPICS)] += 1 / n;
    const members = rng.nextDouble() < 0.15 ? 2 : 1;
    const first = rng.nextInt(L);
    for (let m = 0; m < members; m++) {
      const language = (first + m) % L;
      const tokens = new Int32Array(5 + rng.nextInt(31));
      for (let i = 0; i < tokens.length; i++) {
        let u = rng.nextDouble();
        let t = 0;
        while (t < PLANTED_TOPICS - 1 && (u -= theta[t]) >= 0) t++;
        if (rng.nextDouble() < 0.1) {
          tokens[i] = rng.nextInt(vocabPerLanguage); // background noise word
          continue;
        }
        const v = rng.nextDouble();
        let lo = 0;
        let hi = WORDS_PER_TOPIC - 1;
        while (lo < hi) {
          const mid = (lo + hi) >> 1;
          if (zipf[mid] < v) lo = mid + 1;
          else hi = mid;
        }
        tokens[i] = topicWords[(t * L + language) * WORDS_PER_TOPIC + lo];
      }
      documents.push({ language, tokens, linkKey: members > 1 ? `g${g}` : null });
    }
  }
  const { corpus } = buildCorpus({ languages: LANGUAGES, vocabSizes: new Array(L).fill(vocabPerLanguage), documents });
  const patterns = 4;
  const groupPattern = new Int32Array(corpus.numGroups);
  for (let g = 0; g < groupPattern.length; g++) groupPattern[g] = rng.nextInt(patterns);
  return { corpus, groupPattern, patterns };
}
