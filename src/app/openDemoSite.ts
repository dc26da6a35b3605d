import type { Platform } from '../platform/types.ts';
import { createRenderPool } from '../imagery/renderPool.ts';
import type { Raster } from '../imagery/Raster.ts';
import { openForViewing } from '../imagery/pyramidCache.ts';
import { tileStoreFor } from '../imagery/tileStore.ts';
import { multispectralView, panchromaticView } from './sceneView.ts';
import type { BandInfo, FieldPolygons, OpenSite, RosterEntry, SceneView } from './site.ts';

interface DemoManifest {
  kind: string;
  basin: string;
  crs: { epsg: number; name: string };
  extent: [number, number, number, number];
  dates: { key: string; date: string }[];
  bands: BandInfo[];
  files: { name: string; role: string; date?: string }[];
}

export interface OpenOptions {
  onProgress?: (progress: { label: string; fraction: number | null }) => void;
  signal?: AbortSignal;
}

/** Opens the generated demo site: its manifest, both dates' rasters, the roster and the field polygons. */
export async function openDemoSite(platform: Platform, options: OpenOptions = {}): Promise<OpenSite> {
  const { onProgress = () => {}, signal } = options;
  const readJson = async <T>(name: string): Promise<T> => {
    const file = await platform.openDemoFile(name);
    const bytes = await platform.readRange(file, 0, file.size, signal);
    try {
      return JSON.parse(new TextDecoder().decode(bytes)) as T;
    } catch (error) {
      throw new Error(`${name}: not valid JSON (${(error as Error).message})`, { cause: error });
    }
  };

  onProgress({ label: 'Reading the demo manifest', fraction: 0 });
  const manifest = await readJson<DemoManifest>('manifest.json');
  if (manifest.kind !== 'fellfield demo manifest') throw new Error('manifest.json: not a Fellfield demo manifest');

  const pool = createRenderPool();
  const tiles = tileStoreFor(platform);
  try {
    const scenes: SceneView[] = [];
    const steps = manifest.dates.length * 2 + 2;
    let step = 0;
    for (const { date } of manifest.dates) {
      const panName = manifest.files.find((f) => f.date === date && f.role.startsWith('panchromatic'))?.name;
      const msName = manifest.files.find((f) => f.date === date && f.role.startsWith('multispectral'))?.name;
      if (!panName || !msName) throw new Error(`manifest.json: the scene of ${date} lacks a panchromatic or multispectral file`);
      onProgress({ label: `Opening ${panName}`, fraction: ++step / steps });
      const pan = await openForViewing(platform, pool, await platform.openDemoFile(panName), tiles, { signal, onProgress });
      onProgress({ label: `Opening ${msName}`, fraction: ++step / steps });
      const ms = await openForViewing(platform, pool, await platform.openDemoFile(msName), tiles, { signal, onProgress });
      scenes.push(await sceneView(date, pan, ms, manifest.bands, signal));
    }
    onProgress({ label: 'Reading the roster and field polygons', fraction: ++step / steps });
    const roster = (await readJson<{ species: RosterEntry[] }>('roster.json')).species;
    const fieldPolygons = await readJson<FieldPolygons>('field.geojson');
    onProgress({ label: 'Ready', fraction: 1 });
    return {
      name: manifest.basin,
      epsg: manifest.crs.epsg,
      crsName: manifest.crs.name,
      extent: manifest.extent,
      scenes,
      roster,
      fieldPolygons,
      dispose: () => pool.dispose(),
    };
  } catch (error) {
    pool.dispose();
    throw error;
  }
}

async function sceneView(date: string, pan: Raster, ms: Raster, bands: BandInfo[], signal?: AbortSignal): Promise<SceneView> {
  const [panView, msView] = await Promise.all([panchromaticView(pan, signal), multispectralView(ms, bands, signal)]);
  return { date, pan: panView, ms: msView };
}
