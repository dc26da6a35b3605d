import type { Extent } from './types.ts';

// Every pair of boxes that meet, found at once for a whole site. Crowns are much alike
// in size, so a uniform grid of cells about twice the mean box size holds a handful of
// boxes per cell, and pairing boxes within each cell finds every meeting pair in time
// linear in the boxes and pairs. Each pair is kept once, in the cell that holds the low
// corner of the two boxes' overlap (a cell both lie in). Boxes too uneven for a grid
// (some very large, or crowded into a few cells) go to the spatial index's own search
// instead, one query per box, as before.

/** Pairs per box: the partners of box i are partner[start[i]] .. partner[start[i + 1] - 1], all > i. */
export interface BoxPairs {
  start: Int32Array;
  partner: Int32Array;
}

/** A cell this crowded, or boxes spanning this many cells on average, give up the grid. */
const MAX_PER_CELL = 64;
const MAX_CELLS_PER_BOX = 4;

/**
 * The pairs i < j of boxes that meet (closed boxes: touching counts, as Flatbush's
 * search counts it). `search` answers the indices of boxes meeting a box; it is used
 * when the grid does not suit the boxes.
 */
export function boxPairs(boxes: readonly Extent[], search: (box: Extent) => ArrayLike<number>): BoxPairs {
  return gridPairs(boxes) ?? searchPairs(boxes, search);
}

function searchPairs(boxes: readonly Extent[], search: (box: Extent) => ArrayLike<number>): BoxPairs {
  const start = new Int32Array(boxes.length + 1);
  const partner: number[] = [];
  for (let i = 0; i < boxes.length; i++) {
    const found = search(boxes[i]);
    for (let k = 0; k < found.length; k++) if (found[k] > i) partner.push(found[k]);
    start[i + 1] = partner.length;
  }
  return { start, partner: Int32Array.from(partner) };
}

function gridPairs(boxes: readonly Extent[]): BoxPairs | null {
  const n = boxes.length;
  if (n < 2) return searchPairs(boxes, () => []);
  // The boxes copied into flat arrays once: the passes below read them again and again.
  const x0 = new Float64Array(n), y0 = new Float64Array(n), x1 = new Float64Array(n), y1 = new Float64Array(n);
  let gx0 = Infinity, gy0 = Infinity, gx1 = -Infinity, gy1 = -Infinity, sizes = 0;
  for (let i = 0; i < n; i++) {
    const b = boxes[i];
    x0[i] = b[0];
    y0[i] = b[1];
    x1[i] = b[2];
    y1[i] = b[3];
    if (b[0] < gx0) gx0 = b[0];
    if (b[1] < gy0) gy0 = b[1];
    if (b[2] > gx1) gx1 = b[2];
    if (b[3] > gy1) gy1 = b[3];
    sizes += Math.max(b[2] - b[0], b[3] - b[1]);
  }
  const width = gx1 - gx0, height = gy1 - gy0;
  // Twice the mean size, and never so small that there are more cells than boxes (x 3).
  const side = Math.max((2 * sizes) / n, Math.sqrt((width * height) / n), width / n, height / n);
  if (!(side > 0 && Number.isFinite(side))) return null;
  const cols = Math.floor(width / side) + 1, rows = Math.floor(height / side) + 1;

  // Each box's range of cells; floor is monotone, so boxes that meet share the cell of
  // their overlap's low corner.
  const c0 = new Int32Array(n), c1 = new Int32Array(n), r0 = new Int32Array(n), r1 = new Int32Array(n);
  let placed = 0;
  for (let i = 0; i < n; i++) {
    c0[i] = Math.floor((x0[i] - gx0) / side);
    c1[i] = Math.floor((x1[i] - gx0) / side);
    r0[i] = Math.floor((y0[i] - gy0) / side);
    r1[i] = Math.floor((y1[i] - gy0) / side);
    placed += (c1[i] - c0[i] + 1) * (r1[i] - r0[i] + 1);
  }
  if (placed > MAX_CELLS_PER_BOX * n) return null;

  // Boxes by cell (a counting sort): cell k holds items[first[k]] .. items[first[k + 1] - 1].
  const first = new Int32Array(cols * rows + 1);
  for (let i = 0; i < n; i++) {
    for (let r = r0[i]; r <= r1[i]; r++) for (let c = c0[i]; c <= c1[i]; c++) first[r * cols + c + 1]++;
  }
  for (let k = 0; k < cols * rows; k++) {
    if (first[k + 1] > MAX_PER_CELL) return null;
    first[k + 1] += first[k];
  }
  const items = new Int32Array(placed);
  const next = first.slice(0, cols * rows);
  for (let i = 0; i < n; i++) {
    for (let r = r0[i]; r <= r1[i]; r++) for (let c = c0[i]; c <= c1[i]; c++) items[next[r * cols + c]++] = i;
  }

  // Pairs as found (low, high), then grouped by the low index.
  let low = new Int32Array(n), high = new Int32Array(n), count = 0;
  for (let cell = 0; cell < cols * rows; cell++) {
    const col = cell % cols, row = (cell - col) / cols;
    for (let a = first[cell]; a < first[cell + 1]; a++) {
      const i = items[a];
      for (let b = a + 1; b < first[cell + 1]; b++) {
        const j = items[b];
        if (x0[j] > x1[i] || x1[j] < x0[i] || y0[j] > y1[i] || y1[j] < y0[i]) continue;
        if (Math.max(c0[i], c0[j]) !== col || Math.max(r0[i], r0[j]) !== row) continue;
        if (count === low.length) {
          low = grow(low);
          high = grow(high);
        }
        low[count] = Math.min(i, j);
        high[count++] = Math.max(i, j);
      }
    }
  }
  const start = new Int32Array(n + 1);
  for (let k = 0; k < count; k++) start[low[k] + 1]++;
  for (let i = 0; i < n; i++) start[i + 1] += start[i];
  const partner = new Int32Array(count);
  const fill = start.slice(0, n);
  for (let k = 0; k < count; k++) partner[fill[low[k]]++] = high[k];
  return { start, partner };
}

function grow(array: Int32Array): Int32Array<ArrayBuffer> {
  const bigger = new Int32Array(array.length * 2);
  bigger.set(array);
  return bigger;
}
