import type { SceneGrids } from '../../core/checks/settings.ts';
import { gridOfSummary } from '../../core/geometry/rasterGrid.ts';
import type { SceneView } from '../site.ts';
import type { CheckScene } from './checkHost.ts';
import type { PageBytes } from './checkRunner.ts';

/** The scene's pan and multispectral grids, which the undersized and off-image checks use. */
export function sceneGrids(scene: SceneView | undefined): SceneGrids {
  return {
    ...(scene?.pan ? { pan: gridOfSummary(scene.pan.raster.summary) } : {}),
    ...(scene?.ms ? { ms: gridOfSummary(scene.ms.raster.summary) } : {}),
  };
}

/** What the checks worker needs of a scene: its grids, its rasters' headers, and a way to their bytes. */
export function checkScene(scene: SceneView | undefined, noDataValue: number | null = null): { scene: CheckScene; bytes: PageBytes } {
  const rasters = [scene?.pan?.raster, scene?.ms?.raster].filter((r) => r !== undefined);
  return {
    scene: { ...sceneGrids(scene), rasters: rasters.map((r) => ({ summary: r.summary })), noDataValue },
    bytes: (raster, offset, length, signal) => rasters[raster].readBytes(offset, length, signal),
  };
}
