import type { MultiPolygonRings, Ring } from '../geometry/types.ts';
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

/** Whether (x, y) is inside a polygon with holes, by the even-odd crossing rule. */
function insideRings(rings: readonly Ring[], x: number, y: number): boolean {
  let inside = false;
  for (const ring of rings) {
    for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
      const [xi, yi] = ring[i];
      const [xj, yj] = ring[j];
      if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
    }
  }
  return inside;
}

/** Squared distance from (x, y) to the nearest edge of any ring. */
function edgeDistance2(parts: MultiPolygonRings, x: number, y: number): number {
  let best = Infinity;
  for (const part of parts) {
    for (const ring of part) {
      for (let i = 0; i + 1 < ring.length; i++) {
        const [ax, ay] = ring[i];
        const [bx, by] = ring[i + 1];
        const ex = bx - ax;
        const ey = by - ay;
        const len2 = ex * ex + ey * ey;
        const t = len2 > 0 ? Math.min(1, Math.max(0, ((x - ax) * ex + (y - ay) * ey) / len2)) : 0;
        const dx = ax + t * ex - x;
        const dy = ay + t * ey - y;
        const d2 = dx * dx + dy * dy;
        if (d2 < best) best = d2;
      }
    }
  }
  return best;
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
  const inside: number[] = [];
  const ring: number[] = [];
  const ring2 = ringWidth * ringWidth;
  const i0 = Math.floor((minX - ringWidth) / spacing);
  const i1 = Math.ceil((maxX + ringWidth) / spacing);
  const j0 = Math.floor((minY - ringWidth) / spacing);
  const j1 = Math.ceil((maxY + ringWidth) / spacing);
  for (let j = j0; j <= j1; j++) {
    const y = (j + phase[1]) * spacing;
    for (let i = i0; i <= i1; i++) {
      const x = (i + phase[0]) * spacing;
      const u = (x - grid.originX) / grid.pixelX - 0.5;
      const v = (grid.originY - y) / grid.pixelY - 0.5;
      if (parts.some((part) => insideRings(part, x, y))) inside.push(u, v);
      else if (edgeDistance2(parts, x, y) <= ring2) ring.push(u, v);
    }
  }
  return { id, inside: Float64Array.from(inside), ring: Float64Array.from(ring) };
}
