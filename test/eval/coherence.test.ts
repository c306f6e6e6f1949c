import { describe, expect, it } from 'vitest';
import { coherenceByLanguage, npmiFromCounts, themeCoherence, buildCooccurrenceIndex } from '../../src/eval/index.js';

// Invented worked example. Words: a=0, b=1, c=2, d=3, e=4 (never used), f=5.
// Language 0 documents:            Language 1 (must be ignored):
//   d0: a b c    d3: b               d6: a b
//   d1: a b      d4: c d f
//   d2: a c      d5: a b d
// D = 6; D(a)=4, D(b)=4, D(c)=3, D(d)=2, D(f)=1;
// D(a,b)=3 (d0,d1,d5), D(a,c)=2 (d0,d2), D(b,c)=1 (d0), D(c,d)=1 (d4), D(a,f)=0.
const docs = [[0, 1, 2], [0, 1], [0, 2], [1], [2, 3, 5], [0, 1, 3], [0, 1]];
const corpus = {
  docOffsets: Int32Array.from([0, ...docs.map((_, i) => docs.slice(0, i + 1).flat().length)]),
  words: Int32Array.from(docs.flat()),
  docLanguage: Uint8Array.from([0, 0, 0, 0, 0, 0, 1]),
};

describe('theme coherence from document co-occurrence', () => {
  it('counts documents per word and per pair in one language only', () => {
    const index = buildCooccurrenceIndex(corpus, 0, [0, 1, 2, 3, 4, 5]);
    expect(index.documents).toBe(6);
    expect([0, 1, 2, 3, 4, 5].map((w) => index.docFrequency(w))).toEqual([4, 4, 3, 2, 0, 1]);
    expect(index.coDocFrequency(0, 1)).toBe(3);
    expect(index.coDocFrequency(2, 0)).toBe(2);
    expect(index.coDocFrequency(1, 2)).toBe(1);
    expect(index.coDocFrequency(0, 5)).toBe(0);
  });

  it('matches NPMI and the log-conditional measure computed by hand', () => {
    // NPMI, Bouma (GSCL 2009) eq. 7: log[P(v,u)/(P(v)P(u))] / −log P(v,u)
    //   (a,b): P=3/6, P(a)P(b)=(4/6)² = 4/9 → ln(9/8)/ln 2 = 0.1699250
    //   (a,c): P=2/6, P(a)P(c)=(4/6)(3/6) = 1/3 → ln 1 = 0 → 0
    //   (b,c): P=1/6, P(b)P(c)=1/3 → ln(1/2)/ln 6 = −0.3868528
    //   theme mean = (0.1699250 + 0 − 0.3868528)/3 = −0.0723093
    // Log-conditional, Mimno et al. (EMNLP 2011) eq. 1, ranks a, b, c:
    //   ln((D(b,a)+1)/D(a)) + ln((D(c,a)+1)/D(a)) + ln((D(c,b)+1)/D(b))
    //   = ln(4/4) + ln(3/4) + ln(2/4) = 0 − 0.2876821 − 0.6931472 = −0.9808293
    const [abc, cd, af, ae] = themeCoherence(corpus, 0, [Int32Array.from([0, 1, 2]), Int32Array.from([2, 3]), Int32Array.from([0, 5]), Int32Array.from([0, 4])]);
    expect(abc.npmi).toBeCloseTo((Math.log(9 / 8) / Math.log(2) + 0 + Math.log(0.5) / Math.log(6)) / 3, 12);
    expect(abc.npmi).toBeCloseTo(-0.0723093, 6);
    expect(abc.logConditional).toBeCloseTo(-0.9808293, 6);
    expect(abc.pairs).toBe(3);
    // (c,d): P=1/6, P(c)P(d) = (3/6)(2/6) = 1/6 → NPMI 0; ln((1+1)/D(c)) = ln(2/3) = −0.4054651
    expect(cd.npmi).toBeCloseTo(0, 12);
    expect(cd.logConditional).toBeCloseTo(-0.4054651, 6);
    // (a,f) never together: NPMI takes its limit −1 (Bouma 2009 §2.3); ln((0+1)/4) = −1.3862944
    expect(af.npmi).toBe(-1);
    expect(af.logConditional).toBeCloseTo(-1.3862944, 6);
    // e occurs in no document: the pair is skipped and reported, not scored
    expect(ae).toMatchObject({ pairs: 0, skippedPairs: 1 });
    expect(ae.npmi).toBeNaN();
  });

  it('gives NPMI 1 for words always together and stays within [−1, 1]', () => {
    expect(npmiFromCounts(5, 5, 5, 5)).toBe(1);
    expect(npmiFromCounts(2, 2, 2, 10)).toBeCloseTo(1, 12);
    for (const [dv, du, dvu, D] of [[3, 4, 1, 100], [50, 60, 10, 100], [1, 1, 0, 3]]) {
      const v = npmiFromCounts(dv, du, dvu, D);
      expect(v).toBeGreaterThanOrEqual(-1);
      expect(v).toBeLessThanOrEqual(1);
    }
  });

  it('scores each theme in each language from its top words in φ', () => {
    // Two themes, language 0 only (V = 6); theme 0's top words are a, b, c, theme 1's c, d.
    const phi0 = Float64Array.from([0.4, 0.3, 0.2, 0.05, 0.0, 0.05, 0.0, 0.0, 0.5, 0.4, 0.05, 0.05]);
    const rows = coherenceByLanguage(corpus, [phi0], 2, 3);
    expect(rows.map((r) => [r.theme, r.language])).toEqual([[0, 0], [1, 0]]);
    expect(rows[0].logConditional).toBeCloseTo(-0.9808293, 6);
  });
});
