import type { SceneGrids } from '../../core/checks/settings.ts';
import { gridOfSummary } from '../../core/geometry/rasterGrid.ts';
import type { SceneView } from '../site.ts';

/** The scene's pan and multispectral grids, which the undersized and off-image checks use. */
export function sceneGrids(scene: SceneView | undefined): SceneGrids {
  return {
    ...(scene?.pan ? { pan: gridOfSummary(scene.pan.raster.summary) } : {}),
    ...(scene?.ms ? { ms: gridOfSummary(scene.ms.raster.summary) } : {}),
  };
}
