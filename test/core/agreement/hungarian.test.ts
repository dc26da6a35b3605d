import { describe, expect, it } from 'vitest';
import { maxWeightMatching, type WeightedEdge } from '../../../src/core/agreement/hungarian.ts';
import { seeded } from '../../../bench/harness.ts';

/** Every one-to-one choice of edges, each row matched or not: what the matching must equal. */
function bruteForceMax(rows: number, columns: number, edges: WeightedEdge[]): number {
  const byRow = Array.from({ length: rows }, (_, r) => edges.filter((e) => e.row === r));
  const used = new Array<boolean>(columns).fill(false);
  let best = 0;
  const visit = (r: number, total: number) => {
    if (r === rows) {
      best = Math.max(best, total);
      return;
    }
    visit(r + 1, total);
    for (const e of byRow[r]) {
      if (used[e.column]) continue;
      used[e.column] = true;
      visit(r + 1, total + e.weight);
      used[e.column] = false;
    }
  };
  visit(0, 0);
  return best;
}

function randomEdges(rows: number, columns: number, density: number, random: () => number): WeightedEdge[] {
  const edges: WeightedEdge[] = [];
  for (let row = 0; row < rows; row++) {
    for (let column = 0; column < columns; column++) {
      if (random() < density) edges.push({ row, column, weight: Math.round(random() * 1000) / 100 + 0.01 });
    }
  }
  return edges;
}

const total = (edges: WeightedEdge[]) => edges.reduce((s, e) => s + e.weight, 0);

describe('maxWeightMatching', () => {
  const random = seeded(7);
  const shapes: [number, number, number][] = [[1, 1, 1], [3, 3, 0.7], [4, 6, 0.5], [6, 4, 0.5], [6, 6, 0.4], [7, 7, 0.9], [8, 5, 0.3]];

  it.each(shapes)('reaches the brute-force maximum on random %i × %i edges (density %f)', (rows, columns, density) => {
    for (let trial = 0; trial < 25; trial++) {
      const edges = randomEdges(rows, columns, density, random);
      const chosen = maxWeightMatching(rows, columns, edges);
      expect(new Set(chosen.map((e) => e.row)).size).toBe(chosen.length);
      expect(new Set(chosen.map((e) => e.column)).size).toBe(chosen.length);
      chosen.forEach((e) => expect(edges).toContain(e));
      expect(total(chosen)).toBeCloseTo(bruteForceMax(rows, columns, edges), 9);
    }
  });

  it('prefers two good pairs over one best pair, and one best pair over two poor ones', () => {
    const twoGood = [{ row: 0, column: 0, weight: 0.7 }, { row: 0, column: 1, weight: 0.45 }, { row: 1, column: 0, weight: 0.45 }];
    expect(maxWeightMatching(2, 2, twoGood).map((e) => [e.row, e.column])).toEqual([[0, 1], [1, 0]]);
    const oneBest = [{ row: 0, column: 0, weight: 0.95 }, { row: 0, column: 1, weight: 0.3 }, { row: 1, column: 0, weight: 0.3 }];
    expect(maxWeightMatching(2, 2, oneBest).map((e) => [e.row, e.column])).toEqual([[0, 0]]);
  });

  it('handles no edges, rows without edges and long chains of candidates', () => {
    expect(maxWeightMatching(3, 2, [])).toEqual([]);
    // A chain row i – column i (0.6) and row i+1 – column i (0.7), 2,000 long: the best
    // takes every 0.7 edge (row 0 and column n−1 then stay single); taking rows in
    // order, each its best free column, would take the 0.6 ones, 0.6·n in all.
    const n = 2000;
    const chain: WeightedEdge[] = [];
    for (let i = 0; i < n; i++) {
      chain.push({ row: i, column: i, weight: 0.6 });
      if (i + 1 < n) chain.push({ row: i + 1, column: i, weight: 0.7 });
    }
    const chosen = maxWeightMatching(n, n, chain);
    expect(total(chosen)).toBeCloseTo(0.7 * (n - 1), 6);
    expect(chosen).toHaveLength(n - 1);
  });

  it('refuses edges that are not positive or lie outside the table', () => {
    expect(() => maxWeightMatching(1, 1, [{ row: 0, column: 0, weight: 0 }])).toThrow(/positive/);
    expect(() => maxWeightMatching(1, 1, [{ row: 0, column: 1, weight: 1 }])).toThrow(/outside 1 × 1/);
  });
});
