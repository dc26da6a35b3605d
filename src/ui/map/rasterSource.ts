import DataTile from 'ol/source/DataTile.js';
import TileGrid from 'ol/tilegrid/TileGrid.js';
import type { ProjectionLike } from 'ol/proj.js';
import type { Raster } from '../../imagery/Raster.ts';
import type { TileImage } from '../../imagery/renderJobs.ts';
import { renderSharpenedTile } from '../../imagery/sharpenedTile.ts';
import type { StretchLimits } from '../../core/render/stretch.ts';
import type { SceneView } from '../../app/site.ts';
import type { LayerSpec } from './layerSpec.ts';
import { getIntersection, intersects, isEmpty, type Extent } from 'ol/extent.js';
import { TileWarmer } from './tileWarmer.ts';

/** The raster's own tile pyramid as an OpenLayers tile grid: z 0 is its smallest overview. */
export function rasterTileGrid(raster: Raster): TileGrid {
  const { summary } = raster;
  const levels = summary.levels;
  const order = levels.map((_, i) => levels.length - 1 - i); // z -> level index
  return new TileGrid({
    extent: summary.extent,
    origin: [summary.extent[0], summary.extent[3]],
    resolutions: order.map((level) => raster.resolution(level)),
    tileSizes: order.map((level) => raster.tileSize(level)),
  });
}

type TileLoader = (level: number, x: number, y: number, signal: AbortSignal) => Promise<TileImage>;

type SourceTile = ImageBitmap | Uint8ClampedArray;

/** Each source's read-ahead (see tileWarmer.ts). */
const warmers = new WeakMap<DataTile, TileWarmer<SourceTile>>();

function source(raster: Raster, projection: ProjectionLike, load: TileLoader): DataTile {
  const levelCount = raster.levelCount;
  const warmer = new TileWarmer<SourceTile>(async (z, x, y, signal) => {
    const tile = await load(levelCount - 1 - z, x, y, signal);
    return 'rgba' in tile ? tile.rgba : tile;
  });
  const made = new DataTile({
    projection,
    tileGrid: rasterTileGrid(raster),
    interpolate: false,
    transition: 0,
    wrapX: false,
    loader: (z, x, y, { signal }) => warmer.load(z, x, y, signal),
  });
  warmers.set(made, warmer);
  return made;
}

/**
 * Reads ahead the tiles of a source over `extents` (in order) at the level the map would
 * show at `resolution`, leaving out those of the view `shown`; a source without
 * read-ahead is left alone.
 */
export function readAhead(source: DataTile, extents: Extent[], resolution: number, shown: Extent): void {
  const warmer = warmers.get(source);
  const grid = source.getTileGrid();
  if (!warmer || !grid) return;
  const z = grid.getZForResolution(resolution, source.zDirection);
  const coords: [number, number, number][] = [];
  for (const extent of extents) {
    // Only the raster's own tiles, and none the map already has (those of the view shown).
    const inside = getIntersection(extent, grid.getExtent());
    if (isEmpty(inside)) continue;
    grid.forEachTileCoord(inside, z, ([tz, x, y]) => {
      const tile = grid.getTileCoordExtent([tz, x, y]);
      if (!intersects(tile, shown) && intersects(tile, inside)) coords.push([tz, x, y]);
    });
  }
  warmer.warm(coords);
}

/** Lets go what a source read ahead (its layer is hidden). */
export function dropReadAhead(source: DataTile): void {
  warmers.get(source)?.warm([]);
}

/** Ends a source's read-ahead (its layer is closed). */
export function stopReadAhead(source: DataTile): void {
  warmers.get(source)?.dispose();
}

/**
 * A tile source that asks the render pool for finished tiles of the given bands (one
 * for grey, three for a composite) with the given stretch.
 */
export function rasterSource(raster: Raster, projection: ProjectionLike, bands: number[], limits: StretchLimits[]): DataTile {
  return source(raster, projection, (level, x, y, signal) => raster.renderTile(level, x, y, bands, limits, signal));
}

/** The tile source of a layer spec over a scene; null when the scene lacks the raster it needs. */
export function layerSource(scene: SceneView, spec: LayerSpec, projection: ProjectionLike): DataTile | null {
  const { pan, ms } = scene;
  switch (spec.kind) {
    case 'pan':
      return pan ? rasterSource(pan.raster, projection, [0], [spec.limits]) : null;
    case 'bands':
      return ms ? rasterSource(ms.raster, projection, spec.bands, spec.limits) : null;
    case 'index': {
      if (!ms) return null;
      const range = { low: spec.low, high: spec.high, threshold: spec.threshold };
      return source(ms.raster, projection, (level, x, y, signal) => ms.raster.renderIndexTile(level, x, y, spec.a, spec.b, range, signal));
    }
    case 'sharpened': {
      if (!pan || !ms) return null;
      const sharpen = { method: spec.method, bands: spec.bands, limits: spec.limits, gain: spec.gain };
      return source(pan.raster, projection, (level, x, y, signal) => renderSharpenedTile(pan.raster, ms.raster, level, x, y, sharpen, signal));
    }
  }
}
