import DataTile from 'ol/source/DataTile.js';
import TileGrid from 'ol/tilegrid/TileGrid.js';
import type { ProjectionLike } from 'ol/proj.js';
import type { Raster } from '../../imagery/Raster.ts';
import type { StretchLimits } from '../../core/render/stretch.ts';

/** The raster's own tile pyramid as an OpenLayers tile grid: z 0 is its smallest overview. */
export function rasterTileGrid(raster: Raster): TileGrid {
  const { summary } = raster;
  const levels = summary.levels;
  const fullResolution = summary.pixelSize[0];
  const order = levels.map((_, i) => levels.length - 1 - i); // z -> level index
  return new TileGrid({
    extent: summary.extent,
    origin: [summary.extent[0], summary.extent[3]],
    resolutions: order.map((level) => (fullResolution * summary.width) / levels[level].width),
    tileSizes: order.map((level) => [levels[level].blockWidth, levels[level].blockHeight]),
  });
}

/**
 * A tile source that asks the render pool for finished tiles of the given bands (one
 * for grey, three for a composite) with the given stretch.
 */
export function rasterSource(raster: Raster, projection: ProjectionLike, bands: number[], limits: StretchLimits[]): DataTile {
  const grid = rasterTileGrid(raster);
  const levelCount = raster.levelCount;
  return new DataTile({
    projection,
    tileGrid: grid,
    interpolate: false,
    transition: 0,
    wrapX: false,
    loader: (z, x, y, { signal }) => raster.renderTile(levelCount - 1 - z, x, y, bands, limits, signal),
  });
}
