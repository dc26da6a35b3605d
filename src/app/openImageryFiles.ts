import { bandTableFor, bandTableProblem } from '../core/bandTable.ts';
import { createRenderPool } from '../imagery/renderPool.ts';
import { Raster, type RangeReader } from '../imagery/Raster.ts';
import { viewable } from '../imagery/pyramidCache.ts';
import { tileStoreFor, type TileStore } from '../imagery/tileStore.ts';
import { urlReader } from '../imagery/urlSource.ts';
import type { FileRef } from '../platform/types.ts';
import { multispectralView, panchromaticView, startDefaultStretch } from './sceneView.ts';
import type { OpenSite, SceneView } from './site.ts';
import { placementIn, referencePlacement, unplacedReason } from '../core/raster/pixelSpace.ts';

export interface OpenFilesOptions {
  onProgress?: (progress: { label: string; fraction: number | null }) => void;
  signal?: AbortSignal;
  /** a render pool to share (a site of two dates); the caller disposes it. Default: one of its own. */
  pool?: ReturnType<typeof createRenderPool>;
  /** Where pyramid caches are kept. Default: the platform's app files on disk where it has them, else IndexedDB (tileStoreFor). */
  tileStore?: () => Promise<TileStore | null>;
  /** Show the scene in pixel space when its CRS cannot be placed on a map (see PixelSpaceOffer). */
  pixelSpace?: boolean;
}

/**
 * The files are usable but their CRS cannot be placed on a map: the message says why,
 * and `open` opens them in pixel space instead, if the user chooses to.
 */
export class PixelSpaceOffer extends Error {
  /** `reasons`: one line per file that cannot be placed, naming it. */
  constructor(readonly reasons: string[], readonly open: (options: OpenFilesOptions) => Promise<OpenSite>) {
    super(`${reasons.join('\n')}\nThe imagery can still be looked at in pixel space: coordinates in pixels, no map, and no patches drawn or stored.`);
    this.name = 'PixelSpaceOffer';
  }
}

/**
 * Opens one or two GeoTIFFs the user picked as a scene: a one-band file is the
 * panchromatic raster, a multiband file the multispectral one. Every problem is told in
 * a line that names its file; nothing opens unless all of them are usable. A scene whose
 * CRS cannot be placed on a map is refused with a PixelSpaceOffer, and opened in pixel
 * space (view-only) when `pixelSpace` is set.
 */
export async function openImageryFiles(platform: RangeReader, files: FileRef[], options: OpenFilesOptions = {}): Promise<OpenSite> {
  const { onProgress = () => {}, signal } = options;
  if (files.length === 0 || files.length > 2) throw new Error(`Pick one or two GeoTIFF files (a panchromatic and a multiband one); got ${files.length}.`);
  const pool = options.pool ?? createRenderPool();
  const disposePool = options.pool ? () => {} : () => pool.dispose();
  try {
    let rasters: Raster[] = [];
    const problems: string[] = [];
    const unplaced: string[] = [];
    for (const [i, file] of files.entries()) {
      onProgress({ label: `Opening ${file.name}`, fraction: i / files.length });
      try {
        const opened = await Raster.open(platform, pool, file, signal);
        const reason = unplacedReason(opened.summary);
        if (reason) unplaced.push(`${file.name}: ${reason}`);
        const raster = await viewable(opened, options.tileStore ?? tileStoreFor(platform), { signal, onProgress });
        await raster.bandLimits(0, 2, 98, signal); // decodes a small level: a broken file shows itself now
        rasters.push(raster);
      } catch (error) {
        if ((error as Error).name === 'AbortError') throw error;
        problems.push((error as Error).message);
      }
    }
    const onePan = rasters.filter((r) => r.summary.bands === 1);
    const oneMs = rasters.filter((r) => r.summary.bands > 1);
    if (onePan.length > 1) problems.push(`${onePan.map((r) => r.file.name).join(' and ')}: both are one-band rasters; a scene pairs one panchromatic with one multiband raster`);
    if (oneMs.length > 1) problems.push(`${oneMs.map((r) => r.file.name).join(' and ')}: both are multiband rasters; a scene pairs one panchromatic with one multiband raster`);
    if (problems.length) throw new Error(problems.join('\n'));
    if (unplaced.length && !options.pixelSpace) {
      throw new PixelSpaceOffer(
        unplaced,
        (again) => openImageryFiles(platform, files, { ...again, pool: options.pool, pixelSpace: true }),
      );
    }

    const notes: string[] = [];
    let reference: Raster | null = null;
    if (unplaced.length) {
      ({ rasters, reference } = inPixelSpace(rasters, notes));
      notes.unshift(`Shown in pixel space, view-only: ${unplaced.join('; ')}. Coordinates are pixels of ${reference.file.name} (x across, y up from its bottom edge); patches cannot be drawn or stored here.`);
    }
    const pan = rasters.filter((r) => r.summary.bands === 1);
    const ms = rasters.filter((r) => r.summary.bands > 1);
    // A pair that disagrees is told how; the panchromatic raster is kept, so the scene is still usable.
    if (pan.length === 1 && ms.length === 1 && !reference) {
      const disagreement = pairProblem(pan[0], ms[0]);
      if (disagreement) {
        notes.push(disagreement);
        if (pan[0].summary.epsg !== ms[0].summary.epsg) ms.pop();
      }
    }
    const kept = [...pan, ...ms];

    const first = kept[0].summary;
    const msRaster = ms[0] ?? null;
    let msBands: ReturnType<typeof bandTableFor> = [];
    if (msRaster) {
      const { bands, bandNames, bandWavelengthsNm } = msRaster.summary;
      msBands = bandTableFor(bands, bandNames, bandWavelengthsNm);
      const tableProblem = bandTableProblem(bands, bandNames, bandWavelengthsNm);
      if (tableProblem) notes.push(`${msRaster.file.name}: ${tableProblem}`);
    }
    const scene: SceneView = {
      date: first.metadata.TIFFTAG_DATETIME ?? 'date not recorded',
      pan: pan[0] ? panchromaticView(pan[0]) : null,
      ms: msRaster ? multispectralView(msRaster, msBands, notes) : null,
    };
    startDefaultStretch(scene);
    const extents = kept.map((r) => r.summary.extent);
    return {
      name: files.map((f) => f.name).join(' + '),
      epsg: reference ? null : first.epsg!,
      crsName: reference ? `pixels of ${reference.file.name}` : (first.crsName ?? `EPSG:${first.epsg}`),
      extent: [
        Math.min(...extents.map((e) => e[0])),
        Math.min(...extents.map((e) => e[1])),
        Math.max(...extents.map((e) => e[2])),
        Math.max(...extents.map((e) => e[3])),
      ],
      scenes: [scene],
      roster: [],
      fieldPolygons: { type: 'FeatureCollection', features: [] },
      notes,
      dispose: disposePool,
    };
  } catch (error) {
    disposePool();
    throw error;
  }
}

/**
 * The rasters in pixels of the first (the panchromatic one when there is one); a raster
 * that cannot be placed against it is left out, with a note.
 */
function inPixelSpace(rasters: Raster[], notes: string[]): { rasters: Raster[]; reference: Raster } {
  const reference = rasters.find((r) => r.summary.bands === 1) ?? rasters[0];
  const placed = [reference.placedAt(referencePlacement(reference.summary))];
  for (const raster of rasters) {
    if (raster === reference) continue;
    const placement = placementIn(reference.summary, raster.summary);
    if (placement) placed.push(raster.placedAt(placement));
    else notes.push(`${raster.file.name} cannot be placed against ${reference.file.name} in pixel space (each needs a geotransform in the same CRS), so only ${reference.file.name} is shown`);
  }
  return { rasters: placed, reference };
}

/**
 * Opens one or two GeoTIFFs kept on a server, read by HTTP range requests, as a scene
 * (the same rules as openImageryFiles).
 */
export async function openImageryUrls(urls: string[], options: OpenFilesOptions = {}): Promise<OpenSite> {
  const reader = urlReader();
  const files = await Promise.all(urls.map((url) => reader.open(url, options.signal)));
  return openImageryFiles(reader, files, options);
}

/** How a panchromatic and a multiband raster disagree (CRS, footprint), or null when they pair. */
export function pairProblem(pan: Raster, ms: Raster): string | null {
  const a = pan.summary, b = ms.summary;
  if (a.epsg !== b.epsg) {
    return `${pan.file.name} is in EPSG:${a.epsg} but ${ms.file.name} is in EPSG:${b.epsg}; a scene's rasters must share one CRS, so only ${pan.file.name} is shown (reproject one, e.g. gdalwarp -t_srs EPSG:${a.epsg})`;
  }
  const [ax0, ay0, ax1, ay1] = a.extent, [bx0, by0, bx1, by1] = b.extent;
  const w = Math.min(ax1, bx1) - Math.max(ax0, bx0), h = Math.min(ay1, by1) - Math.max(ay0, by0);
  const area = (ax1 - ax0) * (ay1 - ay0);
  if (w <= 0 || h <= 0) {
    const dx = (bx0 + bx1) / 2 - (ax0 + ax1) / 2, dy = (by0 + by1) / 2 - (ay0 + ay1) / 2;
    return `${pan.file.name} and ${ms.file.name} do not overlap: the centre of ${ms.file.name} lies ${Math.round(Math.abs(dx))} m ${dx >= 0 ? 'east' : 'west'} and ${Math.round(Math.abs(dy))} m ${dy >= 0 ? 'north' : 'south'} of the other's`;
  }
  const share = (w * h) / area;
  if (share < 0.95) return `${ms.file.name} covers only ${Math.round(share * 100)} % of ${pan.file.name}; pan-sharpened views are empty outside it`;
  return null;
}
