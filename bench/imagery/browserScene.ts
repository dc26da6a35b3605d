import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';
import { transformer } from '../../src/core/crs.ts';
import { seededBand } from './scene.ts';

// The benchmark's own site, generated (seeded) into a temporary folder laid out like the
// demo (manifest, roster, field polygons, two GeoTIFFs), so the app opens it as it opens
// the demo. Kept between runs of the same size; never committed.

export interface BenchSite {
  dir: string;
  panSize: number;
  msSize: number;
  panPixel: number;
  origin: [number, number];
}

const EPSG = 32633;
const ORIGIN: [number, number] = [500000, 5000000];

export function benchSite(panSize: number): BenchSite {
  const msSize = panSize / 4;
  const panPixel = 0.3;
  const dir = join(tmpdir(), `fellfield-bench-imagery-${panSize}`);
  const site: BenchSite = { dir, panSize, msSize, panPixel, origin: ORIGIN };
  if (existsSync(join(dir, 'manifest.json'))) return site;
  mkdirSync(dir, { recursive: true });
  const write = (name: string, bytes: Uint8Array) => {
    writeFileSync(join(dir, name), bytes);
    return { name, bytes: bytes.length, sha256: createHash('sha256').update(bytes).digest('hex') };
  };
  const ms = write('ms.tif', writeGeoTiff({
    width: msSize, height: msSize, sampleType: 'uint16', bands: Array.from({ length: 8 }, (_, b) => seededBand(msSize, msSize, 20 + b)),
    epsg: EPSG, origin: ORIGIN, pixelSize: [panPixel * 4, panPixel * 4], tileSize: 256, compression: 'deflate',
  }));
  const pan = write('pan.tif', writeGeoTiff({
    width: panSize, height: panSize, sampleType: 'uint16', bands: [seededBand(panSize, panSize, 10)],
    epsg: EPSG, origin: ORIGIN, pixelSize: [panPixel, panPixel], tileSize: 256, compression: 'deflate',
  }));
  const side = panSize * panPixel;
  const toLonLat = transformer(EPSG, 4326);
  const corner = (dx: number, dy: number) => toLonLat([ORIGIN[0] + side / 2 + dx, ORIGIN[1] - side / 2 + dy]);
  const field = write('field.geojson', new TextEncoder().encode(JSON.stringify({
    type: 'FeatureCollection',
    features: [{ type: 'Feature', properties: { id: 'B001', species: 'BNCH' }, geometry: { type: 'Polygon', coordinates: [[corner(0, 0), corner(4, 0), corner(4, 4), corner(0, 4), corner(0, 0)]] } }],
  })));
  const roster = write('roster.json', new TextEncoder().encode(JSON.stringify({
    kind: 'fellfield roster',
    species: [{ code: 'BNCH', scientificName: 'Planta metrica', commonName: 'bench plant', group: 'shrub', colour: '#E69F00', key: '1' }],
  })));
  const bands = ['coastal', 'blue', 'green', 'yellow', 'red', 'red edge', 'NIR1', 'NIR2'];
  const centres = [425, 480, 545, 605, 660, 725, 830, 950];
  const date = '2025-07-01';
  const manifest = {
    kind: 'fellfield demo manifest', version: 1, seed: 1, basin: 'Benchmark scene (generated)',
    crs: { epsg: EPSG, name: 'WGS 84 / UTM zone 33N' },
    extent: [ORIGIN[0], ORIGIN[1] - side, ORIGIN[0] + side, ORIGIN[1]],
    dates: [{ key: 'early', date }],
    bands: bands.map((name, i) => ({ index: i + 1, name, centre_nm: centres[i] })),
    files: [
      { ...pan, role: 'panchromatic', epsg: EPSG, date },
      { ...ms, role: 'multispectral (8 bands)', epsg: EPSG, date },
      { ...field, role: 'field polygons', epsg: 4326 },
      { ...roster, role: 'species roster', epsg: null },
    ],
  };
  writeFileSync(join(dir, 'manifest.json'), JSON.stringify(manifest));
  return site;
}

export function siteFile(site: BenchSite, name: string): Uint8Array {
  return readFileSync(join(site.dir, name));
}
