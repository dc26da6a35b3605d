import { execFile } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import proj4 from 'proj4';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readTiff } from '../core/demo/sceneUnderTest.ts';

// The full-size demo site as written by `npm run demo:data`, read by GDAL's own tools
// (Debian gdal-bin 3.6: gdalinfo -json, ogrinfo -so) as the reference reader. Two runs
// with the same seed, side by side, also prove the real-size output is deterministic.

const run = promisify(execFile);
const repo = resolve(import.meta.dirname, '../..');
const tsx = join(repo, 'node_modules/.bin/tsx');
const hasGdal = (() => {
  try {
    return existsSync('/usr/bin/gdalinfo') && existsSync('/usr/bin/ogrinfo');
  } catch {
    return false;
  }
})();

let work: string;
let dirA: string;
let dirB: string;
let manifest: {
  seed: number;
  fieldPolygons: number;
  extent: number[];
  files: { name: string; sha256: string; bytes: number }[];
  bands: { name: string; centre_nm: number }[];
  panchromatic: { centre_nm: number };
};

// eslint-disable-next-line @typescript-eslint/no-explicit-any
async function gdalinfo(file: string): Promise<any> {
  const { stdout } = await run('gdalinfo', ['-json', '-mm', file], { maxBuffer: 64 << 20 });
  return JSON.parse(stdout);
}

const rasters = [
  { name: 'pan.tif', size: 4096, pixel: 0.3, bands: 1, overviews: 4 },
  { name: 'ms.tif', size: 1024, pixel: 1.2, bands: 8, overviews: 2 },
  { name: 'pan-late.tif', size: 4096, pixel: 0.3, bands: 1, overviews: 4 },
  { name: 'ms-late.tif', size: 1024, pixel: 1.2, bands: 8, overviews: 2 },
];

describe.skipIf(!hasGdal)('demo site read by GDAL (gdal-bin 3.6)', () => {
  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'fellfield-demo-'));
    dirA = join(work, 'a');
    dirB = join(work, 'b');
    const generate = (dir: string) => run(tsx, [join(repo, 'src/cli/demo-data.ts'), '--out', dir, '--seed', '1', '--quiet'], { cwd: repo });
    await Promise.all([generate(dirA), generate(dirB)]);
    manifest = JSON.parse(readFileSync(join(dirA, 'manifest.json'), 'utf8'));
  }, 900_000);

  afterAll(() => {
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('writes the same bytes in two full-size runs with the same seed', () => {
    const again = readFileSync(join(dirB, 'manifest.json'), 'utf8');
    expect(again).toBe(readFileSync(join(dirA, 'manifest.json'), 'utf8'));
    for (const f of manifest.files) {
      expect(readFileSync(join(dirB, f.name)).equals(readFileSync(join(dirA, f.name))), f.name).toBe(true);
    }
  });

  for (const r of rasters) {
    it(`${r.name}: size, bands, type, EPSG, geotransform, tiling, compression and overviews`, async () => {
      const info = await gdalinfo(join(dirA, r.name));
      expect(info.driverShortName).toBe('GTiff');
      expect(info.size).toEqual([r.size, r.size]);
      expect(info.bands).toHaveLength(r.bands);
      expect(info.stac['proj:epsg']).toBe(32608);
      expect(info.coordinateSystem.wkt).toContain('WGS 84 / UTM zone 8N');
      expect(info.geoTransform).toEqual([493000, r.pixel, 0, 4430000, 0, -r.pixel]);
      expect(info.metadata.IMAGE_STRUCTURE).toMatchObject({ COMPRESSION: 'DEFLATE', PREDICTOR: '2', INTERLEAVE: 'BAND' });
      const names = r.bands === 1 ? ['panchromatic'] : manifest.bands.map((b) => b.name);
      const wavelengths = r.bands === 1 ? [manifest.panchromatic.centre_nm] : manifest.bands.map((b) => b.centre_nm);
      info.bands.forEach((band: { type: string; block: number[]; overviews?: unknown[]; description: string; metadata: Record<string, Record<string, string>>; computedMax: number; noDataValue?: number }, i: number) => {
        expect(band.type).toBe('UInt16');
        expect(band.block).toEqual([256, 256]);
        expect(band.overviews ?? []).toHaveLength(r.overviews);
        expect(band.description).toBe(names[i]);
        expect(Number(band.metadata[''].wavelength_nm)).toBe(wavelengths[i]);
        expect(band.computedMax).toBeLessThanOrEqual(2047); // 11-bit values
        expect(band.noDataValue).toBeUndefined();
      });
      // The extent agrees with the manifest.
      expect(info.cornerCoordinates.upperLeft).toEqual([manifest.extent[0], manifest.extent[3]]);
      expect(info.cornerCoordinates.lowerRight).toEqual([manifest.extent[2], manifest.extent[1]]);
    }, 60_000);
  }

  it('reads the same minimum and maximum as geotiff.js (3.0.5, npm) on the multispectral file', async () => {
    const info = await gdalinfo(join(dirA, 'ms.tif'));
    const image = await readTiff(new Uint8Array(readFileSync(join(dirA, 'ms.tif'))));
    image.bands.forEach((band, i) => {
      let min = Infinity;
      let max = -Infinity;
      for (const v of band) {
        if (v < min) min = v;
        if (v > max) max = v;
      }
      expect([min, max]).toEqual([info.bands[i].computedMin, info.bands[i].computedMax]);
    });
  }, 60_000);

  it('field.geojson: ogrinfo reads polygons in EPSG:4326, one per field polygon', async () => {
    const { stdout } = await run('ogrinfo', ['-so', '-al', join(dirA, 'field.geojson')]);
    expect(stdout).toMatch(/Geometry: Polygon/);
    const count = Number(/Feature Count: (\d+)/.exec(stdout)?.[1]);
    expect(count).toBe(manifest.fieldPolygons);
    expect(count).toBeGreaterThanOrEqual(150);
    expect(count).toBeLessThanOrEqual(300);
    expect(stdout).toMatch(/ID\["EPSG",4326\]\]\s*Data axis/);
    expect(stdout).toMatch(/^species: String/m);
    expect(stdout).toMatch(/^id: String/m);
  });

  it('puts the full-size field polygons back on their crowns with the true offset', () => {
    // proj4 2.22.0 (npm) with the UTM zone 8N definition written here; polygon centroids
    // by the shoelace formula (common practice).
    const truth = JSON.parse(readFileSync(join(dirA, 'truth.json'), 'utf8'));
    const field = JSON.parse(readFileSync(join(dirA, 'field.geojson'), 'utf8'));
    const utm = '+proj=utm +zone=8 +datum=WGS84 +units=m +no_defs';
    const crowns = new Map(truth.crowns.map((c: { id: string; fieldId: string | null }) => [c.fieldId, c]));
    let far = 0;
    for (const f of field.features) {
      // Centroid about the first vertex: in raw UTM metres the cross products lose digits.
      const projected: number[][] = f.geometry.coordinates[0].map((p: number[]) => proj4('EPSG:4326', utm, p));
      const [ox, oy] = projected[0];
      const ring = projected.map(([x, y]) => [x - ox, y - oy]);
      let a = 0, cx = 0, cy = 0;
      for (let i = 0; i + 1 < ring.length; i++) {
        const cross = ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
        a += cross;
        cx += (ring[i][0] + ring[i + 1][0]) * cross;
        cy += (ring[i][1] + ring[i + 1][1]) * cross;
      }
      const crown = crowns.get(f.properties.id) as { centre: number[]; species: string };
      expect(crown.species).toBe(f.properties.species);
      const d = Math.hypot(ox + cx / (3 * a) + truth.offset.dx - crown.centre[0], oy + cy / (3 * a) + truth.offset.dy - crown.centre[1]);
      expect(d).toBeLessThan(2 * truth.gpsNoiseSd);
      if (d > truth.gpsNoiseSd) far++;
    }
    expect(far / field.features.length).toBeLessThan(0.1);
    expect(truth.crowns.length).toBeGreaterThanOrEqual(2000);
    expect(truth.purity.purePixels).toBeGreaterThan(5000);
  });

  const infoVerb = join(repo, 'src/cli/verbs/info.ts');
  it.skipIf(!existsSync(infoVerb))('fellfield info --json agrees with gdalinfo on every demo raster', async () => {
    for (const r of rasters) {
      const file = join(dirA, r.name);
      const gdal = await gdalinfo(file);
      const { stdout } = await run(process.execPath, [join(repo, 'bin/fellfield.mjs'), 'info', file, '--json'], { cwd: repo });
      const ours = JSON.parse(stdout);
      const [x0, sx, , y0, , sy] = gdal.geoTransform;
      const [w, h] = gdal.size;
      expect(ours.width, r.name).toBe(w);
      expect(ours.height, r.name).toBe(h);
      expect(ours.bands, r.name).toBe(gdal.bands.length);
      expect(String(ours.dtype).toLowerCase(), r.name).toBe(gdal.bands[0].type.toLowerCase());
      expect(ours.epsg, r.name).toBe(gdal.stac['proj:epsg']);
      expect(ours.pixel_size, r.name).toEqual([sx, -sy]);
      expect(ours.extent, r.name).toEqual([x0, y0 + sy * h, x0 + sx * w, y0]);
      expect(ours.tiled, r.name).toBe(true);
      const tile = Array.isArray(ours.tile_size) ? ours.tile_size : [ours.tile_size, ours.tile_size];
      expect(tile, r.name).toEqual(gdal.bands[0].block);
      expect(String(ours.compression).toLowerCase(), r.name).toBe(gdal.metadata.IMAGE_STRUCTURE.COMPRESSION.toLowerCase());
      expect(ours.overviews, r.name).toBe((gdal.bands[0].overviews ?? []).length);
      expect(ours.nodata ?? null, r.name).toBe(gdal.bands[0].noDataValue ?? null);
    }
  }, 120_000);
});
