import { MinHeap } from './minHeap.ts';

/** A candidate pair between row `row` and column `column`, worth `weight` (> 0). */
export interface WeightedEdge {
  row: number;
  column: number;
  weight: number;
}

/**
 * The one-to-one pairing of largest total weight over sparse candidate edges: the
 * Hungarian method (Kuhn 1955; Munkres 1957) in its shortest augmenting path form,
 * with Dijkstra's search over reduced costs (as in Jonker & Volgenant 1987), one
 * row at a time. Each row also gets a private "stay unmatched" column, so the
 * minimum-cost assignment of every row is the maximum-weight matching. Only edges
 * are stored, so a large delineation whose candidates chain into one big group
 * still costs little memory and time.
 * Returns the chosen edges, sorted by row.
 */
export function maxWeightMatching<E extends WeightedEdge>(rowCount: number, columnCount: number, edges: readonly E[]): E[] {
  for (const e of edges) {
    if (!(e.weight > 0) || !Number.isFinite(e.weight)) throw new RangeError(`edge ${e.row}–${e.column} has weight ${e.weight}, expected a positive number`);
    if (!Number.isInteger(e.row) || !Number.isInteger(e.column) || e.row < 0 || e.row >= rowCount || e.column < 0 || e.column >= columnCount) throw new RangeError(`edge ${e.row}–${e.column} lies outside ${rowCount} × ${columnCount}`);
  }
  // Adjacency of rows (compressed): columns and costs of each row's edges.
  const start = new Int32Array(rowCount + 1);
  for (const e of edges) start[e.row + 1]++;
  for (let r = 0; r < rowCount; r++) start[r + 1] += start[r];
  const fill = start.slice(0, rowCount);
  // Costs W − weight, and W for staying unmatched: all ≥ 0, so the search can start
  // from zero potentials, and every free column keeps the same potential (0), which
  // is what lets Dijkstra compare paths that end at different free columns.
  let heaviest = 0;
  for (const e of edges) heaviest = Math.max(heaviest, e.weight);
  const adjColumn = new Int32Array(edges.length);
  const adjCost = new Float64Array(edges.length);
  const adjEdge = new Int32Array(edges.length);
  edges.forEach((e, k) => {
    const at = fill[e.row]++;
    adjColumn[at] = e.column;
    adjCost[at] = heaviest - e.weight;
    adjEdge[at] = k;
  });

  // Columns 0..columnCount-1 are real; column columnCount + r is row r's own "unmatched".
  const totalColumns = columnCount + rowCount;
  const u = new Float64Array(rowCount);
  const v = new Float64Array(totalColumns);
  const rowOfColumn = new Int32Array(totalColumns).fill(-1);
  const columnOfRow = new Int32Array(rowCount).fill(-1);

  const dist = new Float64Array(totalColumns).fill(Infinity);
  const previousRow = new Int32Array(totalColumns);
  const done = new Uint8Array(totalColumns);
  const touched: number[] = [];
  const heap = new MinHeap();

  const relax = (row: number, base: number) => {
    for (let a = start[row]; a < start[row + 1]; a++) {
      const c = adjColumn[a];
      if (done[c]) continue;
      const d = base + adjCost[a] - u[row] - v[c];
      if (d < dist[c]) {
        if (dist[c] === Infinity) touched.push(c);
        dist[c] = d;
        previousRow[c] = row;
        heap.push(d, c);
      }
    }
    const own = columnCount + row;
    if (!done[own]) {
      const d = base + heaviest - u[row] - v[own];
      if (d < dist[own]) {
        if (dist[own] === Infinity) touched.push(own);
        dist[own] = d;
        previousRow[own] = row;
        heap.push(d, own);
      }
    }
  };

  const scanned: number[] = [];
  for (let r0 = 0; r0 < rowCount; r0++) {
    heap.clear();
    scanned.length = 0;
    relax(r0, 0);
    let free = -1;
    let shortest = 0;
    // Dijkstra over columns: through a matched column, continue from its row.
    while (heap.size > 0) {
      const c = heap.pop();
      const d = heap.lastKey;
      if (done[c] || d > dist[c]) continue;
      done[c] = 1;
      scanned.push(c);
      if (rowOfColumn[c] === -1) {
        free = c;
        shortest = d;
        break;
      }
      relax(rowOfColumn[c], d);
    }
    // The own column is always reachable, so a free column is always found.
    // Move the potentials so the tree's edges stay tight and every reduced cost ≥ 0.
    u[r0] += shortest;
    for (const c of scanned) {
      const gap = shortest - dist[c];
      v[c] -= gap;
      const row = rowOfColumn[c];
      if (row !== -1) u[row] += gap;
    }
    // Flip the augmenting path back to r0.
    let c = free;
    for (;;) {
      const row = previousRow[c];
      const next = columnOfRow[row];
      rowOfColumn[c] = row;
      columnOfRow[row] = c;
      if (row === r0) break;
      c = next;
    }
    for (const t of touched) {
      dist[t] = Infinity;
      done[t] = 0;
    }
    touched.length = 0;
  }

  // Read the chosen edges back (the cheapest edge where one pair has several).
  const chosen: E[] = [];
  for (let r = 0; r < rowCount; r++) {
    const c = columnOfRow[r];
    if (c < 0 || c >= columnCount) continue;
    let best = -1;
    for (let a = start[r]; a < start[r + 1]; a++) {
      if (adjColumn[a] === c && (best === -1 || adjCost[a] < adjCost[best])) best = a;
    }
    chosen.push(edges[adjEdge[best]]);
  }
  return chosen;
}
