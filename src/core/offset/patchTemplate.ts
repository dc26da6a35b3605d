import type { MultiPolygonRings } from '../geometry/types.ts';
import { extentOfRings } from '../geometry/measure.ts';
import type { SignalGrid } from './signalGrid.ts';

// A patch as the shift search sees it: sample points on a regular lattice inside the
// polygon, and in a ring just outside it, stored as fractional pixel coordinates of the
// signal grid (column, row of pixel centres) so a trial shift is one add per point.

export interface PatchTemplate {
  id: string | number;
  /** Interleaved (column, row) of the inside points, signal-grid pixel units. */
  inside: Float64Array;
  /** Interleaved (column, row) of the ring points. */
  ring: Float64Array;
}

export interface TemplateSettings {
  /** Lattice spacing of the sample points, metres. */
  spacing: number;
  /** Width of the ring outside the polygon, metres. */
  ringWidth: number;
}

/**
 * Sample points of one patch. Each patch's lattice is offset by its own phase (a share
 * of the spacing per axis): with one phase for all, the error of bilinear
 * interpolation at a given sub-pixel shift would be the same in every patch, so it
 * would neither average out over patches nor show in the bootstrap.
 */
export function patchTemplate(
  id: string | number, parts: MultiPolygonRings, grid: SignalGrid, settings: TemplateSettings, phase: [number, number] = [0.5, 0.5],
): PatchTemplate {
  const { spacing, ringWidth } = settings;
  const [minX, minY, maxX, maxY] = extentOfRings(parts);
  const i0 = Math.floor((minX - ringWidth) / spacing - phase[0]);
  const i1 = Math.ceil((maxX + ringWidth) / spacing - phase[0]);
  const j0 = Math.floor((minY - ringWidth) / spacing - phase[1]);
  const j1 = Math.ceil((maxY + ringWidth) / spacing - phase[1]);
  const cols = i1 - i0 + 1;
  const rows = j1 - j0 + 1;
  const xOf = (i: number) => (i0 + i + phase[0]) * spacing;
  const yOf = (j: number) => (j0 + j + phase[1]) * spacing;
  const rings = parts.flat();

  // Inside, row by row: even-odd crossings of the row with every edge, filled between pairs.
  const inside = new Uint8Array(cols * rows);
  const crossings: number[] = [];
  for (let j = 0; j < rows; j++) {
    const y = yOf(j);
    crossings.length = 0;
    for (const ring of rings) {
      for (let k = 0; k + 1 < ring.length; k++) {
        const [xa, ya] = ring[k];
        const [xb, yb] = ring[k + 1];
        if (ya > y !== yb > y) crossings.push(xa + ((y - ya) * (xb - xa)) / (yb - ya));
      }
    }
    crossings.sort((a, b) => a - b);
    for (let c = 0; c + 1 < crossings.length; c += 2) {
      const from = Math.max(0, Math.ceil(crossings[c] / spacing - phase[0] - i0));
      const to = Math.min(cols - 1, Math.floor(crossings[c + 1] / spacing - phase[0] - i0));
      for (let i = from; i <= to; i++) if (xOf(i) > crossings[c] && xOf(i) < crossings[c + 1]) inside[j * cols + i] = 1;
    }
  }

  // The ring: outside points within ringWidth of some edge, edge by edge over its own box.
  const near = new Uint8Array(cols * rows);
  const w2 = ringWidth * ringWidth;
  for (const ring of rings) {
    for (let k = 0; k + 1 < ring.length; k++) {
      const [ax, ay] = ring[k];
      const [bx, by] = ring[k + 1];
      const ex = bx - ax;
      const ey = by - ay;
      const len2 = ex * ex + ey * ey;
      const c0 = Math.max(0, Math.floor((Math.min(ax, bx) - ringWidth) / spacing - phase[0] - i0));
      const c1 = Math.min(cols - 1, Math.ceil((Math.max(ax, bx) + ringWidth) / spacing - phase[0] - i0));
      const r0 = Math.max(0, Math.floor((Math.min(ay, by) - ringWidth) / spacing - phase[1] - j0));
      const r1 = Math.min(rows - 1, Math.ceil((Math.max(ay, by) + ringWidth) / spacing - phase[1] - j0));
      for (let j = r0; j <= r1; j++) {
        const y = yOf(j);
        for (let i = c0; i <= c1; i++) {
          const cell = j * cols + i;
          if (near[cell] || inside[cell]) continue;
          const x = xOf(i);
          const t = len2 > 0 ? Math.min(1, Math.max(0, ((x - ax) * ex + (y - ay) * ey) / len2)) : 0;
          const dx = ax + t * ex - x;
          const dy = ay + t * ey - y;
          if (dx * dx + dy * dy <= w2) near[cell] = 1;
        }
      }
    }
  }

  const toPixels = (list: number[], i: number, j: number) => {
    list.push((xOf(i) - grid.originX) / grid.pixelX - 0.5, (grid.originY - yOf(j)) / grid.pixelY - 0.5);
  };
  const insidePoints: number[] = [];
  const ringPoints: number[] = [];
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < cols; i++) {
      if (inside[j * cols + i]) toPixels(insidePoints, i, j);
      else if (near[j * cols + i]) toPixels(ringPoints, i, j);
    }
  }
  return { id, inside: Float64Array.from(insidePoints), ring: Float64Array.from(ringPoints) };
}
