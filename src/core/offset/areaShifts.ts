import { extentOfRings } from '../geometry/measure.ts';
import type { Extent } from '../geometry/types.ts';
import { estimateShift, type OffsetEstimate, type OffsetPatch, type OffsetSettings } from './estimateShift.ts';
import type { SignalGrid } from './signalGrid.ts';

// A shift per area, for when one shift does not fit the whole scene (orthorectification
// errors grow with relief and view angle, so a steep corner can sit off differently):
// the polygons split into a square grid of cells by their centres, a shift estimated
// in every cell with enough polygons, and each compared with the common shift.

export interface AreaShift {
  /** Cell column (west to east) and row (south to north). */
  col: number;
  row: number;
  extent: Extent;
  polygons: number;
  reliable: boolean;
  reasons: string[];
  dx: number | null;
  dy: number | null;
  uncertainty: number | null;
  /** Whether the cell's shift lies within the combined uncertainty of the common one; null when either is unreliable. */
  agrees: boolean | null;
}

export interface AreaShifts {
  cellsAcross: number;
  cells: AreaShift[];
  /** True when every reliable cell agrees with the common shift; null with fewer than two reliable cells. */
  oneShiftFits: boolean | null;
}

/**
 * Cells agree with the common shift when their distance is within the root sum of
 * squares of the two 95 % radii (a conservative test; common practice for comparing
 * two independent estimates).
 */
export function estimateByArea(
  patches: readonly OffsetPatch[], grid: SignalGrid, settings: OffsetSettings, common: OffsetEstimate,
  cellsAcross = 2, minPolygons = 8,
): AreaShifts {
  const centres = patches.map((p) => {
    const [a, b, c, d] = extentOfRings(p.rings);
    return [(a + c) / 2, (b + d) / 2] as const;
  });
  const minX = Math.min(...centres.map((c) => c[0]));
  const maxX = Math.max(...centres.map((c) => c[0]));
  const minY = Math.min(...centres.map((c) => c[1]));
  const maxY = Math.max(...centres.map((c) => c[1]));
  const w = (maxX - minX) / cellsAcross || 1;
  const h = (maxY - minY) / cellsAcross || 1;
  const cellOf = (x: number, y: number) => [
    Math.min(cellsAcross - 1, Math.floor((x - minX) / w)),
    Math.min(cellsAcross - 1, Math.floor((y - minY) / h)),
  ];
  const cells: AreaShift[] = [];
  for (let row = 0; row < cellsAcross; row++) {
    for (let col = 0; col < cellsAcross; col++) {
      const members = patches.filter((_, i) => {
        const [c, r] = cellOf(centres[i][0], centres[i][1]);
        return c === col && r === row;
      });
      const extent: Extent = [minX + col * w, minY + row * h, minX + (col + 1) * w, minY + (row + 1) * h];
      const base = { col, row, extent, polygons: members.length };
      if (members.length < Math.max(2, minPolygons)) {
        cells.push({ ...base, reliable: false, reasons: [`${members.length} polygons, fewer than the ${minPolygons} a cell needs`], dx: null, dy: null, uncertainty: null, agrees: null });
        continue;
      }
      const e = estimateShift(members, grid, settings);
      const agrees = e.reliable && common.reliable
        ? Math.hypot(e.dx! - common.dx!, e.dy! - common.dy!) <= Math.hypot(e.uncertainty!, common.uncertainty!)
        : null;
      cells.push({ ...base, reliable: e.reliable, reasons: e.reasons, dx: e.dx, dy: e.dy, uncertainty: e.uncertainty, agrees });
    }
  }
  const judged = cells.filter((c) => c.agrees !== null);
  return { cellsAcross, cells, oneShiftFits: judged.length >= 2 ? judged.every((c) => c.agrees) : null };
}
