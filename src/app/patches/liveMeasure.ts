import { multiPolygonArea } from '../../core/geometry/measure.ts';
import { gridOfSummary, type RasterGrid } from '../../core/geometry/rasterGrid.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { patchPixels } from '../../core/pixels/patchPixels.ts';
import type { SceneView } from '../site.ts';

// What the patch panel shows while an outline is drawn or edited: its area and the
// multispectral pixels under it. "Pure" pixels lie wholly inside the outline (the
// checks' rule: src/core/geometry/purePixels.ts); "touched" ones are covered at all.

export interface OutlineMeasure {
  areaM2: number;
  /** null when the scene has no georeferenced multispectral raster */
  purePixels: number | null;
  touchedPixels: number | null;
  /** the multispectral pixel area, m² */
  pixelAreaM2: number | null;
}

/** The multispectral grid of a scene, or null when it has none in metres. */
export function multispectralGrid(scene: SceneView | undefined): RasterGrid | null {
  const summary = scene?.ms?.raster.summary;
  if (!summary || !summary.georeferenced) return null;
  return gridOfSummary(summary);
}

export function measureOutline(parts: MultiPolygonRings, grid: RasterGrid | null): OutlineMeasure {
  const areaM2 = multiPolygonArea(parts);
  if (!grid) return { areaM2, purePixels: null, touchedPixels: null, pixelAreaM2: null };
  const pixelAreaM2 = grid.pixelWidth * grid.pixelHeight;
  try {
    const pixels = patchPixels(parts, grid, { kind: 'inside', buffer: 0 });
    let touched = 0;
    for (const share of pixels.coverage.fraction) if (share > 0) touched++;
    return { areaM2, purePixels: pixels.rows.length, touchedPixels: touched, pixelAreaM2 };
  } catch {
    // A half-drawn sketch can be degenerate; its pixels are simply not known yet.
    return { areaM2, purePixels: null, touchedPixels: null, pixelAreaM2 };
  }
}
