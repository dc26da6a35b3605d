import { crsUnits, utmEpsgForLonLat } from '../../core/crs.ts';
import type { RangeReader } from '../../imagery/Raster.ts';
import { createRenderPool } from '../../imagery/renderPool.ts';
import type { FileRef } from '../../platform/types.ts';
import { openImageryFiles, PixelSpaceOffer } from '../openImageryFiles.ts';
import type { SceneView } from '../site.ts';

// The imagery of a site: one scene per date, each one or two GeoTIFFs (panchromatic and
// multiband), opened with one render pool for all. Patches are kept in the scene's CRS
// in metres, so a scene in longitude and latitude is refused with what to do instead,
// and every date must share one CRS.

export interface SceneFiles {
  /** YYYY-MM-DD; null takes the date the files record */
  date: string | null;
  files: FileRef[];
}

export interface SiteImagery {
  epsg: number;
  crsName: string;
  extent: [number, number, number, number];
  scenes: SceneView[];
  notes: string[];
  dispose(): void;
}

export interface ProgressOptions {
  onProgress?: (progress: { label: string; fraction: number | null }) => void;
  signal?: AbortSignal;
}

/** 'YYYY:MM:DD hh:mm:ss' (TIFF's DateTime) or an ISO date as YYYY-MM-DD; null when it is neither. */
export function dateOf(recorded: string | undefined | null): string | null {
  const m = /^(\d{4})[:-](\d{2})[:-](\d{2})/.exec(recorded?.trim() ?? '');
  return m ? `${m[1]}-${m[2]}-${m[3]}` : null;
}

export async function openSceneImagery(platform: RangeReader, scenes: SceneFiles[], options: ProgressOptions = {}): Promise<SiteImagery> {
  const { onProgress = () => {}, signal } = options;
  if (scenes.length === 0) throw new Error('Pick the imagery of at least one date.');
  const pool = createRenderPool();
  try {
    const opened = [];
    for (const [i, scene] of scenes.entries()) {
      const names = scene.files.map((f) => f.name).join(' and ');
      const site = await openImageryFiles(platform, scene.files, {
        pool, signal,
        onProgress: (p) => onProgress({ label: p.label, fraction: p.fraction === null ? null : (i + p.fraction) / scenes.length }),
      }).catch((error: unknown) => {
        // Pixel space is for looking only: a site's patches need map coordinates.
        if (error instanceof PixelSpaceOffer) throw new Error(`${error.reasons.join('\n')}\nA site keeps its patches in map coordinates, so its imagery must be placed on a map (Open GeoTIFF files… can still show these files in pixel space).`);
        throw error;
      });
      const epsg = site.epsg;
      if (epsg === null || crsUnits(epsg) !== 'metre') {
        const [x0, y0, x1, y1] = site.extent;
        const utm = utmEpsgForLonLat((x0 + x1) / 2, (y0 + y1) / 2);
        throw new Error(`${names}: in ${site.crsName}, a geographic CRS in degrees; patches are kept in a projected CRS in metres, so reproject the imagery first (for this place e.g. gdalwarp -t_srs EPSG:${utm})`);
      }
      if (opened.length && site.epsg !== opened[0].epsg) {
        throw new Error(`${names}: in EPSG:${site.epsg}, but the first date is in EPSG:${opened[0].epsg}; every date of a site must share one CRS`);
      }
      const date = scene.date ?? dateOf(site.scenes[0].date);
      if (!date) throw new Error(`${names}: the files record no acquisition date; enter the date of this scene`);
      opened.push({ ...site, epsg, scenes: [{ ...site.scenes[0], date }] });
    }
    const extents = opened.map((s) => s.extent);
    return {
      epsg: opened[0].epsg,
      crsName: opened[0].crsName,
      extent: [
        Math.min(...extents.map((e) => e[0])), Math.min(...extents.map((e) => e[1])),
        Math.max(...extents.map((e) => e[2])), Math.max(...extents.map((e) => e[3])),
      ],
      scenes: opened.map((s) => s.scenes[0]),
      notes: opened.flatMap((s) => s.notes ?? []),
      dispose: () => pool.dispose(),
    };
  } catch (error) {
    pool.dispose();
    throw error;
  }
}
