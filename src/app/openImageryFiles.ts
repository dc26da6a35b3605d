import { bandTableFor, bandTableProblem } from '../core/bandTable.ts';
import { createRenderPool } from '../imagery/renderPool.ts';
import { Raster, type RangeReader } from '../imagery/Raster.ts';
import { viewable } from '../imagery/pyramidCache.ts';
import { tileStoreFor, type TileStore } from '../imagery/tileStore.ts';
import { urlReader } from '../imagery/urlSource.ts';
import type { FileRef } from '../platform/types.ts';
import { multispectralView, panchromaticView } from './sceneView.ts';
import type { OpenSite } from './site.ts';

export interface OpenFilesOptions {
  onProgress?: (progress: { label: string; fraction: number | null }) => void;
  signal?: AbortSignal;
  /** a render pool to share (a site of two dates); the caller disposes it. Default: one of its own. */
  pool?: ReturnType<typeof createRenderPool>;
  /** Where pyramid caches are kept. Default: the platform's app files on disk where it has them, else IndexedDB (tileStoreFor). */
  tileStore?: () => Promise<TileStore | null>;
}

/**
 * Opens one or two GeoTIFFs the user picked as a scene: a one-band file is the
 * panchromatic raster, a multiband file the multispectral one. Every problem is told in
 * a line that names its file; nothing opens unless all of them are usable.
 */
export async function openImageryFiles(platform: RangeReader, files: FileRef[], options: OpenFilesOptions = {}): Promise<OpenSite> {
  const { onProgress = () => {}, signal } = options;
  if (files.length === 0 || files.length > 2) throw new Error(`Pick one or two GeoTIFF files (a panchromatic and a multiband one); got ${files.length}.`);
  const pool = options.pool ?? createRenderPool();
  const disposePool = options.pool ? () => {} : () => pool.dispose();
  try {
    const rasters: Raster[] = [];
    const problems: string[] = [];
    for (const [i, file] of files.entries()) {
      onProgress({ label: `Opening ${file.name}`, fraction: i / files.length });
      try {
        const opened = await Raster.open(platform, pool, file, signal);
        if (!opened.summary.georeferenced || opened.summary.epsg === null) {
          problems.push(`${file.name}: has no usable georeferencing (CRS and geotransform), so it cannot be placed on the map`);
          continue;
        }
        const raster = await viewable(opened, options.tileStore ?? tileStoreFor(platform), { signal, onProgress });
        await raster.bandLimits(0, 2, 98, signal); // decodes a small level: a broken file shows itself now
        rasters.push(raster);
      } catch (error) {
        if ((error as Error).name === 'AbortError') throw error;
        problems.push((error as Error).message);
      }
    }
    const pan = rasters.filter((r) => r.summary.bands === 1);
    const ms = rasters.filter((r) => r.summary.bands > 1);
    if (pan.length > 1) problems.push(`${pan.map((r) => r.file.name).join(' and ')}: both are one-band rasters; a scene pairs one panchromatic with one multiband raster`);
    if (ms.length > 1) problems.push(`${ms.map((r) => r.file.name).join(' and ')}: both are multiband rasters; a scene pairs one panchromatic with one multiband raster`);
    if (problems.length) throw new Error(problems.join('\n'));

    // A pair that disagrees is told how; the panchromatic raster is kept, so the scene is still usable.
    const notes: string[] = [];
    if (pan.length === 1 && ms.length === 1) {
      const disagreement = pairProblem(pan[0], ms[0]);
      if (disagreement) {
        notes.push(disagreement);
        if (pan[0].summary.epsg !== ms[0].summary.epsg) ms.pop();
      }
    }
    const kept = [...pan, ...ms];

    onProgress({ label: 'Computing the default stretch', fraction: 0.9 });
    const first = kept[0].summary;
    const msRaster = ms[0] ?? null;
    let msBands: ReturnType<typeof bandTableFor> = [];
    if (msRaster) {
      const { bands, bandNames, bandWavelengthsNm } = msRaster.summary;
      msBands = bandTableFor(bands, bandNames, bandWavelengthsNm);
      const tableProblem = bandTableProblem(bands, bandNames, bandWavelengthsNm);
      if (tableProblem) notes.push(`${msRaster.file.name}: ${tableProblem}`);
    }
    const [panView, msView] = await Promise.all([
      pan[0] ? panchromaticView(pan[0], signal) : null,
      msRaster ? multispectralView(msRaster, msBands, signal, notes) : null,
    ]);
    const extents = kept.map((r) => r.summary.extent);
    return {
      name: files.map((f) => f.name).join(' + '),
      epsg: first.epsg!,
      crsName: first.crsName ?? `EPSG:${first.epsg}`,
      extent: [
        Math.min(...extents.map((e) => e[0])),
        Math.min(...extents.map((e) => e[1])),
        Math.max(...extents.map((e) => e[2])),
        Math.max(...extents.map((e) => e[3])),
      ],
      scenes: [{ date: first.metadata.TIFFTAG_DATETIME ?? 'date not recorded', pan: panView, ms: msView }],
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
