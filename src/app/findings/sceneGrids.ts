import type { SceneGrids } from '../../core/checks/settings.ts';
import type { RasterGrid } from '../../core/geometry/rasterGrid.ts';
import type { TiffSummary } from '../../core/tiff/inspectTiff.ts';
import type { SceneView } from '../site.ts';

function gridOf(summary: TiffSummary): RasterGrid {
  return {
    originX: summary.origin[0],
    originY: summary.origin[1],
    pixelWidth: summary.pixelSize[0],
    pixelHeight: summary.pixelSize[1],
    width: summary.width,
    height: summary.height,
    epsg: summary.epsg ?? undefined,
  };
}

/** The scene's pan and multispectral grids, which the undersized and off-image checks use. */
export function sceneGrids(scene: SceneView | undefined): SceneGrids {
  return {
    ...(scene?.pan ? { pan: gridOf(scene.pan.raster.summary) } : {}),
    ...(scene?.ms ? { ms: gridOf(scene.ms.raster.summary) } : {}),
  };
}
