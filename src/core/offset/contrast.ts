import type { PatchTemplate } from './patchTemplate.ts';
import type { SignalGrid } from './signalGrid.ts';

// The score of one patch at one trial shift: the mean signal inside the moved polygon
// minus the mean in the ring just outside it. A polygon that sits on its crown shows
// the largest contrast; template matching by the maximum of a contrast score is common
// practice in image registration.

/** Mean of the bilinearly interpolated signal at the points moved by (du, dv) pixels.
 * Points whose four neighbouring pixel centres are not all on the grid, and no-data,
 * are left out; NaN when none is left. */
function meanAt(points: Float64Array, grid: SignalGrid, du: number, dv: number): number {
  const values = grid.values;
  const width = grid.width;
  const maxU = width - 1;
  const maxV = grid.height - 1;
  let sum = 0;
  let count = 0;
  for (let k = 0; k < points.length; k += 2) {
    const u = points[k] + du;
    const v = points[k + 1] + dv;
    if (!(u >= 0 && v >= 0 && u < maxU && v < maxV)) continue;
    const c = u | 0;
    const r = v | 0;
    const fu = u - c;
    const fv = v - r;
    const i = r * width + c;
    const top = values[i] + (values[i + 1] - values[i]) * fu;
    const bottom = values[i + width] + (values[i + width + 1] - values[i + width]) * fu;
    const value = top + (bottom - top) * fv;
    if (value === value) {
      sum += value;
      count++;
    }
  }
  return count > 0 ? sum / count : NaN;
}

/** Inside minus ring at a shift of (dx, dy) metres (east, north). */
export function patchContrast(template: PatchTemplate, grid: SignalGrid, dx: number, dy: number): number {
  const du = dx / grid.pixelX;
  const dv = -dy / grid.pixelY;
  return meanAt(template.inside, grid, du, dv) - meanAt(template.ring, grid, du, dv);
}
