import { describe, expect, it } from 'vitest';
import { maxWeightMatching, minCostAssignment } from '../../../src/core/agreement/hungarian.ts';
import { seeded } from '../../../bench/harness.ts';

/** Every way to give each row its own column: the brute force the assignment must equal. */
function bruteForceMin(cost: number[][]): number {
  const rows = cost.length;
  const columns = cost[0].length;
  let best = Infinity;
  const used = new Array<boolean>(columns).fill(false);
  const visit = (r: number, total: number) => {
    if (r === rows) {
      best = Math.min(best, total);
      return;
    }
    for (let c = 0; c < columns; c++) {
      if (used[c]) continue;
      used[c] = true;
      visit(r + 1, total + cost[r][c]);
      used[c] = false;
    }
  };
  visit(0, 0);
  return best;
}

describe('minCostAssignment', () => {
  const random = seeded(7);
  const shapes: [number, number][] = [[1, 1], [3, 3], [4, 6], [6, 6], [5, 7], [7, 7]];

  it.each(shapes)('finds the minimum of the brute force on random %i × %i costs', (rows, columns) => {
    for (let trial = 0; trial < 20; trial++) {
      const cost = Array.from({ length: rows }, () => Array.from({ length: columns }, () => Math.round(random() * 100) / 10));
      const assignment = minCostAssignment(cost);
      expect(new Set(assignment).size).toBe(rows);
      const total = assignment.reduce((s, c, r) => s + cost[r][c], 0);
      expect(total).toBeCloseTo(bruteForceMin(cost), 9);
    }
  });

  it('solves the classic 3 × 3 example', () => {
    // Rows take columns 1, 0, 2 at total cost 1 + 2 + 2 = 5 (checked by hand).
    expect(minCostAssignment([[4, 1, 3], [2, 0, 5], [3, 2, 2]])).toEqual([1, 0, 2]);
  });

  it('refuses more rows than columns and accepts an empty matrix', () => {
    expect(() => minCostAssignment([[1], [2]])).toThrow(/rows ≤ columns/);
    expect(minCostAssignment([])).toEqual([]);
  });
});

describe('maxWeightMatching', () => {
  it('never pairs over a zero weight and handles tall matrices', () => {
    const weights = [[0.9, 0], [0.8, 0], [0, 0]];
    expect(maxWeightMatching(weights)).toEqual([[0, 0]]);
    expect(maxWeightMatching([[0, 0], [0, 0]])).toEqual([]);
  });

  it('prefers two good pairs over one best pair', () => {
    expect(maxWeightMatching([[0.7, 0.45], [0.45, 0]])).toEqual([[0, 1], [1, 0]]);
  });
});
