import { bandTableFor } from '../core/bandTable.ts';
import { createRenderPool } from '../imagery/renderPool.ts';
import { Raster } from '../imagery/Raster.ts';
import type { FileRef, Platform } from '../platform/types.ts';
import { multispectralView, panchromaticView } from './sceneView.ts';
import type { OpenSite } from './site.ts';

export interface OpenFilesOptions {
  onProgress?: (progress: { label: string; fraction: number | null }) => void;
  signal?: AbortSignal;
}

/**
 * Opens one or two GeoTIFFs the user picked as a scene: a one-band file is the
 * panchromatic raster, a multiband file the multispectral one. Every problem is told in
 * a line that names its file; nothing opens unless all of them are usable.
 */
export async function openImageryFiles(platform: Platform, files: FileRef[], options: OpenFilesOptions = {}): Promise<OpenSite> {
  const { onProgress = () => {}, signal } = options;
  if (files.length === 0 || files.length > 2) throw new Error(`Pick one or two GeoTIFF files (a panchromatic and a multiband one); got ${files.length}.`);
  const pool = createRenderPool();
  try {
    const rasters: Raster[] = [];
    const problems: string[] = [];
    for (const [i, file] of files.entries()) {
      onProgress({ label: `Opening ${file.name}`, fraction: i / files.length });
      try {
        const raster = await Raster.open(platform, pool, file, signal);
        await raster.bandLimits(0, 2, 98, signal); // decodes a small level: a broken file shows itself now
        if (!raster.summary.georeferenced || raster.summary.epsg === null) {
          problems.push(`${file.name}: has no usable georeferencing (CRS and geotransform), so it cannot be placed on the map`);
        } else rasters.push(raster);
      } catch (error) {
        if ((error as Error).name === 'AbortError') throw error;
        problems.push((error as Error).message);
      }
    }
    const pan = rasters.filter((r) => r.summary.bands === 1);
    const ms = rasters.filter((r) => r.summary.bands > 1);
    if (pan.length > 1) problems.push(`${pan.map((r) => r.file.name).join(' and ')}: both are one-band rasters; a scene pairs one panchromatic with one multiband raster`);
    if (ms.length > 1) problems.push(`${ms.map((r) => r.file.name).join(' and ')}: both are multiband rasters; a scene pairs one panchromatic with one multiband raster`);
    if (pan.length === 1 && ms.length === 1 && pan[0].summary.epsg !== ms[0].summary.epsg) {
      problems.push(`${pan[0].file.name} is in EPSG:${pan[0].summary.epsg} but ${ms[0].file.name} is in EPSG:${ms[0].summary.epsg}; a scene's rasters must share one CRS`);
    }
    if (problems.length) throw new Error(problems.join('\n'));

    onProgress({ label: 'Computing the default stretch', fraction: 0.9 });
    const first = rasters[0].summary;
    const msRaster = ms[0] ?? null;
    const msBands = msRaster ? bandTableFor(msRaster.summary.bands, msRaster.summary.bandNames, msRaster.summary.bandWavelengthsNm) : [];
    const hasNaturalColour = ['red', 'green', 'blue'].every((name) => msBands.some((b) => b.name.toLowerCase() === name));
    const [panView, msView] = await Promise.all([
      pan[0] ? panchromaticView(pan[0], signal) : null,
      msRaster && hasNaturalColour ? multispectralView(msRaster, msBands, signal) : null,
    ]);
    if (msRaster && !hasNaturalColour) throw new Error(`${msRaster.file.name}: its bands (${msBands.map((b) => b.name).join(', ')}) include no red, green and blue for a natural-colour view`);
    const extents = rasters.map((r) => r.summary.extent);
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
      dispose: () => pool.dispose(),
    };
  } catch (error) {
    pool.dispose();
    throw error;
  }
}
