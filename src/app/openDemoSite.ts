import type { Platform } from '../platform/types.ts';
import { createRenderPool } from '../imagery/renderPool.ts';
import { openForViewing } from '../imagery/pyramidCache.ts';
import { tileStoreFor } from '../imagery/tileStore.ts';
import { warmInspectWorkers } from '../imagery/inspectInWorker.ts';
import { multispectralView, panchromaticView, startDefaultStretch } from './sceneView.ts';
import type { BandInfo, FieldPolygons, MappedSite, RosterEntry, SceneView } from './site.ts';

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

/**
 * Opens the generated demo site: its manifest, then at once both dates' rasters, the
 * roster and the field polygons; the first date's default stretch starts reading before
 * this returns, so the desk's first screen is under way while the site is set up.
 */
export async function openDemoSite(platform: Platform, options: OpenOptions = {}): Promise<MappedSite> {
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

  // The render workers and the header readers start while the manifest is read.
  const pool = createRenderPool();
  warmInspectWorkers(4);
  const tiles = tileStoreFor(platform);
  try {
    onProgress({ label: 'Reading the demo manifest', fraction: 0 });
    const manifest = await readJson<DemoManifest>('manifest.json');
    if (manifest.kind !== 'fellfield demo manifest') throw new Error('manifest.json: not a Fellfield demo manifest');
    performance.mark('fellfield:manifest');
    const pairs = manifest.dates.map(({ date }) => {
      const panName = manifest.files.find((f) => f.date === date && f.role.startsWith('panchromatic'))?.name;
      const msName = manifest.files.find((f) => f.date === date && f.role.startsWith('multispectral'))?.name;
      if (!panName || !msName) throw new Error(`manifest.json: the scene of ${date} lacks a panchromatic or multispectral file`);
      return { date, panName, msName };
    });
    const steps = pairs.length * 2 + 2;
    let step = 0;
    const open = async (name: string) => {
      const raster = await openForViewing(platform, pool, await platform.openDemoFile(name), tiles, { signal, onProgress });
      onProgress({ label: `Opened ${name}`, fraction: ++step / steps });
      return raster;
    };
    onProgress({ label: `Opening ${pairs.flatMap((p) => [p.panName, p.msName]).join(', ')}`, fraction: 0 });
    const [scenes, roster, fieldPolygons] = await Promise.all([
      Promise.all(pairs.map(async ({ date, panName, msName }): Promise<SceneView> => {
        const [pan, ms] = await Promise.all([open(panName), open(msName)]);
        return { date, pan: panchromaticView(pan), ms: multispectralView(ms, manifest.bands) };
      })),
      readJson<{ species: RosterEntry[] }>('roster.json').then((r) => r.species),
      readJson<FieldPolygons>('field.geojson'),
    ]);
    performance.mark('fellfield:rasters-open');
    startDefaultStretch(scenes[0]);
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
