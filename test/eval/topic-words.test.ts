import { describe, expect, it } from 'vitest';
import { topicWordDistributions, topWords } from '../../src/eval/index.js';

describe('topic-word distributions and top words', () => {
  it('smooths counts with β per language and ranks words by probability', () => {
    // K = 2; language 0 has V = 3, language 1 has V = 2. n_kw rows are words, columns themes.
    const wordTopic = Int32Array.from([
      5, 0, // l0 w0
      1, 2, // l0 w1
      0, 6, // l0 w2
      3, 1, // l1 w0
      0, 1, // l1 w1
    ]);
    const topicTotals = Int32Array.from([6, 8, 3, 2]);
    const phi = topicWordDistributions({ K: 2, vocabSizes: Int32Array.from([3, 2]), wordBase: Int32Array.from([0, 3, 5]), wordTopic, topicTotals, beta: Float64Array.from([0.5, 1]) });
    // φ_0,l0,w0 = (5 + 0.5)/(6 + 3·0.5) = 5.5/7.5; φ_1,l1,w1 = (1 + 1)/(2 + 2·1) = 0.5
    expect(phi[0][0]).toBeCloseTo(5.5 / 7.5, 12);
    expect(phi[1][1 * 2 + 1]).toBeCloseTo(0.5, 12);
    for (const [l, V] of [[0, 3], [1, 2]]) {
      for (let k = 0; k < 2; k++) expect(phi[l].subarray(k * V, (k + 1) * V).reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    }
    expect(topWords(phi[0], 2, 2).map((a) => Array.from(a))).toEqual([[0, 1], [2, 1]]);
    expect(topWords(phi[1], 2, 5).map((a) => a.length)).toEqual([2, 2]);
  });
});
