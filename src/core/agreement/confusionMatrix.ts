/**
 * The confusion matrix between two interpreters: rows are the first interpreter's calls,
 * columns the second's, both over the same class list (the matrix order).
 */
export interface ConfusionMatrix {
  /** Class names in matrix order. */
  classes: string[];
  /** counts[i][j]: patches the first interpreter called classes[i] and the second classes[j]. */
  counts: number[][];
  /** Total number of pairs. */
  n: number;
  /** Row sums: how often the first interpreter used each class. */
  rowTotals: number[];
  /** Column sums: how often the second interpreter used each class. */
  columnTotals: number[];
}

/** Plain string order, independent of the locale, so both machines sort alike. */
function byCodePoint(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/**
 * Builds the matrix from paired calls (first[i] and second[i] are the same patch).
 * `classes` fixes the matrix order (e.g. the roster's); by default it is every class
 * seen in either list, sorted, so swapping the interpreters transposes the matrix.
 */
export function confusionMatrix(
  first: readonly string[],
  second: readonly string[],
  classes?: readonly string[],
): ConfusionMatrix {
  if (first.length !== second.length) {
    throw new RangeError(`paired calls differ in length: ${first.length} and ${second.length}`);
  }
  const order = classes ? [...classes] : seenClasses(first, second);
  const index = new Map<string, number>();
  order.forEach((name, i) => {
    if (index.has(name)) throw new RangeError(`class '${name}' is listed twice`);
    index.set(name, i);
  });
  const k = order.length;
  // One flat typed array while counting: the hot loop of a large pass.
  const flat = new Float64Array(k * k);
  for (let p = 0; p < first.length; p++) {
    const i = index.get(first[p]);
    const j = index.get(second[p]);
    if (i === undefined) throw new RangeError(`class '${first[p]}' is not in the class list`);
    if (j === undefined) throw new RangeError(`class '${second[p]}' is not in the class list`);
    flat[i * k + j] += 1;
  }
  const counts: number[][] = [];
  for (let i = 0; i < k; i++) counts.push(Array.from(flat.subarray(i * k, (i + 1) * k)));
  return matrixFromCounts(order, counts);
}

/** Every class used by either interpreter, in code-point order. */
export function seenClasses(first: readonly string[], second: readonly string[]): string[] {
  const seen = new Set<string>();
  for (const c of first) seen.add(c);
  for (const c of second) seen.add(c);
  return [...seen].sort(byCodePoint);
}

/** Wraps a square table of counts (or weights) given row by row, checking its shape. */
export function matrixFromCounts(classes: readonly string[], counts: readonly (readonly number[])[]): ConfusionMatrix {
  const k = classes.length;
  if (counts.length !== k) throw new RangeError(`matrix has ${counts.length} rows for ${k} classes`);
  const rows = counts.map((row, i) => {
    if (row.length !== k) throw new RangeError(`matrix row ${i + 1} has ${row.length} cells for ${k} classes`);
    for (const cell of row) {
      if (!Number.isFinite(cell) || cell < 0) throw new RangeError(`matrix row ${i + 1} holds ${cell}, not a count`);
    }
    return [...row];
  });
  const rowTotals = rows.map((row) => row.reduce((s, c) => s + c, 0));
  const columnTotals = classes.map((_, j) => rows.reduce((s, row) => s + row[j], 0));
  const n = rowTotals.reduce((s, c) => s + c, 0);
  return { classes: [...classes], counts: rows, n, rowTotals, columnTotals };
}

/** The same pairs seen from the other side: the second interpreter's calls as rows. */
export function transpose(m: ConfusionMatrix): ConfusionMatrix {
  const counts = m.classes.map((_, i) => m.classes.map((__, j) => m.counts[j][i]));
  return matrixFromCounts(m.classes, counts);
}

/** Each cell as a share of its row (what the second said when the first said X); null for an empty row. */
export function rowShares(m: ConfusionMatrix): (number | null)[][] {
  return m.counts.map((row, i) => row.map((c) => (m.rowTotals[i] > 0 ? c / m.rowTotals[i] : null)));
}

/** Each cell as a share of its column (what the first said when the second said Y); null for an empty column. */
export function columnShares(m: ConfusionMatrix): (number | null)[][] {
  return m.counts.map((row) => row.map((c, j) => (m.columnTotals[j] > 0 ? c / m.columnTotals[j] : null)));
}
