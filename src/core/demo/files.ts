import { writeGeoTiff } from '../tiff/writeGeoTiff.ts';
import { BAND_COUNT, demoBands, DN_MAX, DN_PER_REFLECTANCE, panCentreNm, panWeights } from './bands.ts';
import { demoRoster } from './roster.ts';
import { BASIN_NAME, DEMO_CRS_NAME, DEMO_EPSG, DATE_KEYS, SCENE_DATES, type DateKey } from './scene.ts';
import type { DemoScene } from './synthesize.ts';

// The demo scene as files: four GeoTIFFs (pan and multispectral for two dates), the
// field survey, the truth, the roster and a manifest that lists every file with its
// role, CRS and SHA-256. Bytes depend only on the seed and size.

export const TILE_SIZE = 256;

export interface DemoFile {
  name: string;
  role: string;
  bytes: Uint8Array;
  /** EPSG code of the file's coordinates, where it has any. */
  epsg: number | null;
  date?: string;
}

/** Overview factors 2, 4, 8, ... until the overview fits in one tile. */
export function overviewFactors(size: number): number[] {
  const factors: number[] = [];
  for (let f = 2; Math.ceil(size / (f / 2)) > TILE_SIZE; f *= 2) factors.push(f);
  return factors;
}

/** JSON laid out to `depth` levels, deeper values on one line each: readable, yet small
 * (a crown or a feature per line instead of a line per number). */
export function layeredJson(value: unknown, depth = 2, indent = ''): string {
  if (depth === 0 || value === null || typeof value !== 'object') return JSON.stringify(value);
  const inner = `${indent}  `;
  if (Array.isArray(value)) {
    if (value.length === 0) return '[]';
    return `[\n${value.map((v) => inner + layeredJson(v, depth - 1, inner)).join(',\n')}\n${indent}]`;
  }
  const entries = Object.entries(value).filter(([, v]) => v !== undefined);
  if (entries.length === 0) return '{}';
  return `{\n${entries.map(([k, v]) => `${inner}${JSON.stringify(k)}: ${layeredJson(v, depth - 1, inner)}`).join(',\n')}\n${indent}}`;
}

const text = (value: unknown, depth = 2) => new TextEncoder().encode(`${layeredJson(value, depth)}\n`);

/** The two GeoTIFFs of one date; the scene must have that date rendered. */
export function demoRasterFiles(scene: DemoScene, key: DateKey, onFile: (name: string) => void = () => {}): DemoFile[] {
  const { grid } = scene;
  const image = scene.images[key];
  if (!image) throw new Error(`the ${key} date of the demo scene was not rendered`);
  const suffix = key === 'early' ? '' : '-late';
  const date = SCENE_DATES[key].date;
  const common = { sampleType: 'uint16' as const, epsg: DEMO_EPSG, origin: [grid.originX, grid.originY] as [number, number], tileSize: TILE_SIZE, compression: 'deflate' as const, predictor: true };
  onFile(`pan${suffix}.tif`);
  const pan = writeGeoTiff({
    ...common,
    width: grid.size,
    height: grid.size,
    bands: [image.pan],
    pixelSize: [grid.panPixel, grid.panPixel],
    overviewFactors: overviewFactors(grid.size),
    bandNames: ['panchromatic'],
    bandWavelengthsNm: [panCentreNm],
  });
  onFile(`ms${suffix}.tif`);
  const ms = writeGeoTiff({
    ...common,
    width: grid.msSize,
    height: grid.msSize,
    bands: image.ms,
    pixelSize: [grid.msPixel, grid.msPixel],
    overviewFactors: overviewFactors(grid.msSize),
    bandNames: demoBands.map((b) => b.name),
    bandWavelengthsNm: demoBands.map((b) => b.centreNm),
  });
  return [
    { name: `pan${suffix}.tif`, role: `panchromatic, ${key} date`, bytes: pan, epsg: DEMO_EPSG, date },
    { name: `ms${suffix}.tif`, role: `multispectral (${BAND_COUNT} bands), ${key} date`, bytes: ms, epsg: DEMO_EPSG, date },
  ];
}

async function sha256(bytes: Uint8Array): Promise<string> {
  const digest = await crypto.subtle.digest('SHA-256', bytes as Uint8Array<ArrayBuffer>);
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

/** Encodes the scene; `onFile` hears each file's name as it is made. Raster files of a
 * date made elsewhere (another worker) can be handed in as `prepared`. */
export async function demoFiles(
  scene: DemoScene,
  onFile: (name: string) => void = () => {},
  prepared: Partial<Record<DateKey, DemoFile[]>> = {},
): Promise<DemoFile[]> {
  const files: DemoFile[] = [];
  for (const key of DATE_KEYS) {
    files.push(...(prepared[key] ?? demoRasterFiles(scene, key, onFile)));
  }
  files.push({ name: 'field.geojson', role: 'field polygons (GPS, with a systematic shift)', bytes: text(scene.field, 3), epsg: 4326 });
  files.push({ name: 'truth.json', role: 'truth: species per crown, the true offset, pure-pixel guarantee', bytes: text(scene.truth), epsg: DEMO_EPSG });
  files.push({ name: 'roster.json', role: 'species roster', bytes: text({ kind: 'fellfield roster', species: demoRoster }), epsg: null });

  const listed = [];
  for (const f of files) {
    listed.push({ name: f.name, role: f.role, epsg: f.epsg, ...(f.date ? { date: f.date } : {}), bytes: f.bytes.length, sha256: await sha256(f.bytes) });
  }
  const { grid } = scene;
  const manifest = {
    kind: 'fellfield demo manifest',
    version: 1,
    seed: scene.seed,
    basin: BASIN_NAME,
    crs: { epsg: DEMO_EPSG, name: DEMO_CRS_NAME },
    extent: [grid.originX, grid.originY - grid.sideM, grid.originX + grid.sideM, grid.originY],
    dates: DATE_KEYS.map((k) => SCENE_DATES[k]),
    bands: demoBands.map((b, i) => ({ index: i + 1, name: b.name, centre_nm: b.centreNm })),
    panchromatic: { centre_nm: panCentreNm, weights: panWeights },
    radiometry: { dn_per_reflectance: DN_PER_REFLECTANCE, dn_max: DN_MAX, bits: 11 },
    crowns: scene.crowns.length,
    fieldPolygons: scene.survey.polygons.length,
    files: listed,
  };
  files.push({ name: 'manifest.json', role: 'manifest', bytes: text(manifest, 2), epsg: null });
  return files;
}
