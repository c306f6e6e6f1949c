import { describe, expect, it } from 'vitest';
import { Xoshiro128 } from '../../src/model/rng.js';
import { assignRectangular, hungarian } from '../../src/eval/index.js';

/** Minimum total cost over every injective row→column map, by enumeration. */
function bruteForce(cost: Float64Array, rows: number, cols: number): number {
  let best = Infinity;
  const used = new Uint8Array(cols);
  const go = (i: number, acc: number) => {
    if (i === rows) {
      best = Math.min(best, acc);
      return;
    }
    for (let j = 0; j < cols; j++) {
      if (used[j]) continue;
      used[j] = 1;
      go(i + 1, acc + cost[i * cols + j]);
      used[j] = 0;
    }
  };
  go(0, 0);
  return best;
}

describe('Hungarian method (Kuhn 1955; Munkres 1957)', () => {
  it('finds the optimum of a textbook-sized example computed by hand', () => {
    // Rows [4,1,3],[2,0,5],[3,2,2]; the 6 column orders by hand: (0,1,2)=4+0+2=6,
    // (0,2,1)=4+5+2=11, (1,0,2)=1+2+2=5, (1,2,0)=1+5+3=9, (2,0,1)=3+2+2=7, (2,1,0)=3+0+3=6.
    // The unique optimum is (1,0,2) with cost 5.
    const { rowToColumn, totalCost } = hungarian(Float64Array.from([4, 1, 3, 2, 0, 5, 3, 2, 2]), 3, 3);
    expect(Array.from(rowToColumn)).toEqual([1, 0, 2]);
    expect(totalCost).toBe(5);
  });

  it('agrees with brute force over all permutations on 300 small random matrices', () => {
    const rng = Xoshiro128.fromSeed(2024);
    for (let t = 0; t < 300; t++) {
      const rows = 1 + rng.nextInt(6);
      const cols = rows + rng.nextInt(3);
      // Integer costs make ties common, which is where assignment codes tend to break.
      const cost = Float64Array.from({ length: rows * cols }, () => (t % 2 === 0 ? rng.nextInt(5) : rng.nextDouble() * 10 - 5));
      const { rowToColumn, totalCost } = hungarian(cost, rows, cols);
      expect(new Set(rowToColumn).size).toBe(rows);
      let check = 0;
      for (let i = 0; i < rows; i++) check += cost[i * cols + rowToColumn[i]];
      expect(check).toBeCloseTo(totalCost, 9);
      expect(totalCost, `matrix ${rows}×${cols}: ${Array.from(cost).join(',')}`).toBeCloseTo(bruteForce(cost, rows, cols), 9);
    }
  });

  it('leaves surplus rows unmatched when there are more rows than columns', () => {
    // Rows 0 and 2 are cheap for columns 1 and 0; row 1 is left out.
    const cost = Float64Array.from([5, 0, 9, 9, 0, 5]);
    const { rowToColumn, totalCost } = assignRectangular(cost, 3, 2);
    expect(Array.from(rowToColumn)).toEqual([1, -1, 0]);
    expect(totalCost).toBe(0);
    expect(() => hungarian(cost, 3, 2)).toThrow(/rows ≤ cols/);
  });
});
