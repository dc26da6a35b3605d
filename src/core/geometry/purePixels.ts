import type { RasterGrid } from './rasterGrid.ts';
import type { MultiPolygonRings, Position } from './types.ts';

// Pure pixels: raster cells whose whole footprint lies inside an outline, so their
// spectrum is the patch's alone. Row by row: a cell is spoilt when an edge passes
// through its open interior; an unspoilt cell is wholly in or wholly out, and its
// centre decides (even-odd crossings along the row's centre line). An edge lying on a
// pixel boundary spoils nothing, so a patch drawn on a pixel's edges owns that pixel.

/**
 * Counts pure pixels of a valid outline on a grid; stops early once `stopAt` is reached
 * (the undersized check only needs to know whether there are enough).
 */
export function countPurePixels(parts: MultiPolygonRings, grid: RasterGrid, stopAt = Infinity): number {
  const edges: [Position, Position][] = [];
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const rings of parts) {
    for (const ring of rings) {
      for (let i = 1; i < ring.length; i++) {
        const p = ring[i - 1], q = ring[i];
        if (p[0] === q[0] && p[1] === q[1]) continue;
        edges.push([p, q]);
      }
      for (const [x, y] of ring) {
        minX = Math.min(minX, x); maxX = Math.max(maxX, x);
        minY = Math.min(minY, y); maxY = Math.max(maxY, y);
      }
    }
  }
  if (edges.length === 0 || !(minX <= maxX)) return 0;
  const { originX: ox, originY: oy, pixelWidth: pw, pixelHeight: ph } = grid;
  const c0 = Math.max(0, Math.floor((minX - ox) / pw));
  const c1 = Math.min(grid.width - 1, Math.ceil((maxX - ox) / pw) - 1);
  const r0 = Math.max(0, Math.floor((oy - maxY) / ph));
  const r1 = Math.min(grid.height - 1, Math.ceil((oy - minY) / ph) - 1);
  if (c0 > c1 || r0 > r1) return 0;

  const columns = c1 - c0 + 1;
  const spoilt = new Uint8Array(columns);
  const crossings: number[] = [];
  let count = 0;
  for (let r = r0; r <= r1; r++) {
    const top = oy - r * ph;
    const bottom = top - ph;
    spoilt.fill(0);
    crossings.length = 0;
    const centreY = top - ph / 2;
    for (const [p, q] of edges) {
      const lowY = Math.min(p[1], q[1]);
      const highY = Math.max(p[1], q[1]);
      if ((p[1] > centreY) !== (q[1] > centreY)) {
        crossings.push(p[0] + ((centreY - p[1]) * (q[0] - p[0])) / (q[1] - p[1]));
      }
      if (highY <= bottom || lowY >= top) continue; // misses the open strip
      let lo: number, hi: number;
      if (p[1] === q[1]) {
        lo = Math.min(p[0], q[0]);
        hi = Math.max(p[0], q[0]);
      } else {
        // x where the edge meets the strip's bounds (or its own ends inside the strip)
        const at = (y: number) => p[0] + ((y - p[1]) * (q[0] - p[0])) / (q[1] - p[1]);
        const xa = at(Math.max(lowY, bottom));
        const xb = at(Math.min(highY, top));
        lo = Math.min(xa, xb);
        hi = Math.max(xa, xb);
      }
      const a = (lo - ox) / pw - c0;
      const b = (hi - ox) / pw - c0;
      if (lo === hi) {
        if (Number.isInteger(a)) continue; // on a column boundary
        const c = Math.floor(a);
        if (c >= 0 && c < columns) spoilt[c] = 1;
        continue;
      }
      const from = Math.max(0, Math.floor(a));
      const to = Math.min(columns - 1, Math.ceil(b) - 1);
      for (let c = from; c <= to; c++) spoilt[c] = 1;
    }
    crossings.sort((x, y) => x - y);
    let k = 0;
    for (let c = 0; c < columns; c++) {
      const centreX = ox + (c0 + c + 0.5) * pw;
      while (k < crossings.length && crossings[k] < centreX) k++;
      if (!spoilt[c] && k % 2 === 1) {
        count++;
        if (count >= stopAt) return count;
      }
    }
  }
  return count;
}
