/**
 * The optimal one-to-one assignment (Kuhn 1955; Munkres 1957) in its shortest
 * augmenting path form with row and column potentials, O(rows² · columns).
 * Minimises the total cost over a rows × columns matrix with rows ≤ columns;
 * returns, for every row, the column assigned to it.
 */
export function minCostAssignment(cost: readonly (readonly number[])[]): number[] {
  const rows = cost.length;
  if (rows === 0) return [];
  const columns = cost[0].length;
  if (rows > columns) throw new RangeError(`assignment needs rows ≤ columns, got ${rows} × ${columns}`);
  // 1-based arrays; index 0 of `rowOfColumn` is the virtual column the search starts from.
  const u = new Float64Array(rows + 1);
  const v = new Float64Array(columns + 1);
  const rowOfColumn = new Int32Array(columns + 1);
  const way = new Int32Array(columns + 1);
  const minSlack = new Float64Array(columns + 1);
  const used = new Uint8Array(columns + 1);
  for (let r = 1; r <= rows; r++) {
    rowOfColumn[0] = r;
    let c0 = 0;
    minSlack.fill(Infinity);
    used.fill(0);
    // Grow a tree of tight edges from row r until it reaches a free column.
    do {
      used[c0] = 1;
      const r0 = rowOfColumn[c0];
      let delta = Infinity;
      let c1 = 0;
      for (let c = 1; c <= columns; c++) {
        if (used[c]) continue;
        const slack = cost[r0 - 1][c - 1] - u[r0] - v[c];
        if (slack < minSlack[c]) {
          minSlack[c] = slack;
          way[c] = c0;
        }
        if (minSlack[c] < delta) {
          delta = minSlack[c];
          c1 = c;
        }
      }
      for (let c = 0; c <= columns; c++) {
        if (used[c]) {
          u[rowOfColumn[c]] += delta;
          v[c] -= delta;
        } else minSlack[c] -= delta;
      }
      c0 = c1;
    } while (rowOfColumn[c0] !== 0);
    // Flip the augmenting path back to the virtual column.
    do {
      const c1 = way[c0];
      rowOfColumn[c0] = rowOfColumn[c1];
      c0 = c1;
    } while (c0 !== 0);
  }
  const columnOfRow = new Array<number>(rows).fill(-1);
  for (let c = 1; c <= columns; c++) if (rowOfColumn[c] > 0) columnOfRow[rowOfColumn[c] - 1] = c - 1;
  return columnOfRow;
}

/**
 * The one-to-one pairing of largest total weight over a weights matrix of any shape
 * (weights ≥ 0; a zero weight means "no edge" and is never returned as a pair).
 */
export function maxWeightMatching(weights: readonly (readonly number[])[]): Array<[row: number, column: number]> {
  const rows = weights.length;
  if (rows === 0) return [];
  const columns = weights[0].length;
  if (columns === 0) return [];
  const flip = rows > columns;
  const max = Math.max(0, ...weights.flat());
  // Cost = max − weight turns the maximum into a minimum; transpose so rows ≤ columns.
  const cost = flip
    ? Array.from({ length: columns }, (_, c) => Array.from({ length: rows }, (__, r) => max - weights[r][c]))
    : weights.map((row) => row.map((w) => max - w));
  const assigned = minCostAssignment(cost);
  const pairs: Array<[number, number]> = [];
  assigned.forEach((other, i) => {
    const [r, c] = flip ? [other, i] : [i, other];
    if (other >= 0 && weights[r][c] > 0) pairs.push([r, c]);
  });
  return pairs.sort((a, b) => a[0] - b[0]);
}
