import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';

// fellfield pixels end to end on files written here: a 2 m multispectral grid whose
// pixel counts follow from the squares' positions (worked by hand in the comments).

const dir = mkdtempSync(join(tmpdir(), 'fellfield-pixels-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const square = (x: number, y: number, s: number) => [[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]];
const feature = (id: string, species: string, coordinates: unknown) => ({ type: 'Feature', id, properties: { species }, geometry: { type: 'Polygon', coordinates } });
const utm = { crs: { type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::32632' } } };

function write(name: string, content: string | Uint8Array): string {
  const path = join(dir, name);
  writeFileSync(path, content);
  return path;
}

/** 20 x 20 pixels of 2 m over 600000-600040 E, 5100000-5100040 N; band 2 holds no data (0) at pixel (row 17, col 11). */
function scene(noData?: number): string {
  const bands = [new Uint16Array(400).fill(100), new Uint16Array(400).fill(200)];
  if (noData !== undefined) bands[1][17 * 20 + 11] = noData;
  return write(`ms-${noData ?? 'full'}.tif`, writeGeoTiff({ width: 20, height: 20, sampleType: 'uint16', bands, epsg: 32632, origin: [600000, 5100040], pixelSize: [2, 2], overviewFactors: [], noData }));
}

const patches = write('patches.geojson', JSON.stringify({
  type: 'FeatureCollection', ...utm,
  features: [
    // 8 m square on pixel lines: 16 whole pixels; shrunk by 0.5 m to 600002.5-600009.5
    // it holds only the pixels starting at 600004 and 600006 each way: 2 x 2 = 4.
    feature('a', 'pice', square(600002, 5100002, 8)),
    // 6 m square at 600021-600027, 5100003-5100009: whole pixels start at 600022, 600024
    // and 5100004, 5100006: 4, the same after a 0.5 m shrink (600021.5-600026.5). It
    // touches 4 x 4 pixels: 4 whole, 8 half (edges), 4 quarter (corners).
    feature('b', 'pice', square(600021, 5100003, 6)),
    // 0.8 m across: a 0.5 m buffer leaves nothing.
    feature('c', 'salx', square(600030.1, 5100030.1, 0.8)),
  ],
}));

async function run(...args: string[]) {
  let stdout = '';
  let stderr = '';
  const code = await main(['pixels', ...args], { stdout: (t) => { stdout += `${t}\n`; }, stderr: (t) => { stderr += `${t}\n`; } });
  return { code, stdout, stderr };
}

describe('fellfield pixels', () => {
  it('counts per patch and per species with the default rule (inside, 0.5 m buffer)', async () => {
    const { code, stdout } = await run(patches, '--scene', scene(), '--json');
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    expect(doc.patches.map((p: { id: string; pure: number }) => [p.id, p.pure])).toEqual([['a', 4], ['b', 4], ['c', 0]]);
    expect(doc.classes).toEqual({ pice: 8, salx: 0 });
    expect(doc.rule).toMatchObject({ kind: 'inside', buffer: 0.5 });
    expect(doc.messages).toEqual(['patch c: the 0.5 m buffer is wider than the patch (its widest inner circle has a radius of 0.40 m), so nothing is left to hold pure pixels']);
  });

  it('follows --rule, --buffer and --min-cover', async () => {
    const ms = scene();
    const count = async (...rule: string[]) => JSON.parse((await run(patches, '--scene', ms, '--json', ...rule)).stdout).classes.pice;
    expect(await count('--buffer', '0')).toBe(16 + 4);
    expect(await count('--rule', 'cover', '--min-cover', '1')).toBe(16 + 4);
    expect(await count('--rule', 'cover', '--min-cover', '0.25')).toBe(16 + 16);
    expect(await count('--rule', 'cover', '--min-cover', '0.3')).toBe(16 + 12);
    expect(await count('--rule', 'cover')).toBe(16 + 12); // default least cover 0.5
    // Centres: a holds its 16 (b's edges run through pixel centres, a tie left to the
    // GDAL-checked reference test).
    const centre = JSON.parse((await run(patches, '--scene', ms, '--json', '--rule', 'centre')).stdout);
    expect(centre.patches[0].pure).toBe(16);
    expect(centre.rule).toEqual({ kind: 'centre', text: 'pixel centre inside the patch' });
  });

  it('leaves out no-data pixels inside a patch, says which patch, and counts the rest', async () => {
    const { code, stdout } = await run(patches, '--scene', scene(0), '--json');
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    const b = doc.patches.find((p: { id: string }) => p.id === 'b');
    expect(b).toMatchObject({ pure: 3, noData: 1 });
    expect(doc.messages).toContain('patch b: 1 of its 4 chosen pixel(s) hold no data in the scene and are left out');
    expect(doc.classes.pice).toBe(7);
  });

  it('prints a table by default', async () => {
    const { code, stdout } = await run(patches, '--scene', scene());
    expect(code).toBe(0);
    expect(stdout).toMatch(/3 patch\(es\), 8 pure pixel\(s\); rule: footprint wholly inside the patch shrunk by 0.5 m/);
    expect(stdout).toMatch(/pice\s+8\s+2/);
    expect(stdout).toMatch(/notes\n {2}patch c: the 0.5 m buffer is wider/);
  });

  it('writes the samples and the chips of the pure pixels', async () => {
    // Bands by place: band b at (row, col) holds 1000 (b + 1) + 20 row + col; pan 0.5 m
    // pixels hold 4 (row mod 4) + (col mod 4), so each 2 m pixel's sixteen are 0..15:
    // mean 7.5, population sd sqrt(255 / 12) (discrete uniform, handbook formula).
    const value = (b: number, i: number) => 1000 * (b + 1) + 20 * Math.floor(i / 20) + (i % 20);
    const ms = write('ms-values.tif', writeGeoTiff({
      width: 20, height: 20, sampleType: 'uint16', epsg: 32632, origin: [600000, 5100040], pixelSize: [2, 2], overviewFactors: [],
      bands: [0, 1, 2, 3].map((b) => Uint16Array.from({ length: 400 }, (_, i) => value(b, i))), bandNames: ['blue', 'green', 'red', 'NIR'],
    }));
    const pan = write('pan-values.tif', writeGeoTiff({
      width: 80, height: 80, sampleType: 'uint16', epsg: 32632, origin: [600000, 5100040], pixelSize: [0.5, 0.5], overviewFactors: [],
      bands: [Uint16Array.from({ length: 6400 }, (_, i) => 4 * (Math.floor(i / 80) % 4) + (i % 4))],
    }));
    const samples = join(dir, 'samples.csv');
    const chips = join(dir, 'chips');
    const { code, stdout } = await run(patches, '--scene', ms, '--pan', pan, '--samples', samples, '--chips', chips, '--chip-size', '3', '--json');
    expect(code).toBe(0);
    expect(JSON.parse(stdout).written).toEqual([`${samples}: 8 sample(s)`, `${chips}: 4 chip file(s) and index.csv`]);
    const rows = Papa.parse<Record<string, string>>(readFileSync(samples, 'utf8').trimEnd(), { header: true }).data;
    expect(rows).toHaveLength(8);
    const first = rows[0];
    const i = Number(first.row) * 20 + Number(first.col);
    expect(Number(first.band_3_red)).toBe(value(2, i));
    expect(Number(first.ndvi)).toBeCloseTo((value(3, i) - value(2, i)) / (value(3, i) + value(2, i)), 12);
    expect(Number(first.pan_mean)).toBe(7.5);
    expect(Number(first.pan_sd)).toBeCloseTo(Math.sqrt(255 / 12), 12);
    const index = Papa.parse<Record<string, string>>(readFileSync(join(chips, 'index.csv'), 'utf8').trimEnd(), { header: true }).data;
    expect(index.map((r) => r.file)).toEqual(['a_001_ms.npy', 'a_001_pan.npy', 'b_001_ms.npy', 'b_001_pan.npy']);
    // numpy 1.24.2 (Debian) reads the chip: 4 bands of 3 x 3 around the centre pixel.
    const r = Number(index[0].centre_row), c = Number(index[0].centre_col);
    const out = execFileSync('/usr/bin/python3', ['-c', `import numpy as np; a = np.load(${JSON.stringify(join(chips, 'a_001_ms.npy'))}); print(a.shape, a.dtype, a[1, 1, 1])`], { encoding: 'utf8' });
    expect(out.trim()).toBe(`(4, 3, 3) uint16 ${value(1, r * 20 + c)}`);
  });

  it('names the file and the problem on bad input, exit 2', async () => {
    const ms = scene();
    const cases: [string[], RegExp][] = [
      [[patches], /--scene MS.tif is needed/],
      [[patches, '--scene', ms, '--rule', 'corner'], /--rule: expected one of inside, centre, cover, got 'corner'/],
      [[patches, '--scene', ms, '--buffer=-1'], /--buffer: expected a distance in metres \(0 or more\), got '-1'/],
      [[patches, '--scene', ms, '--rule', 'centre', '--buffer', '1'], /--buffer: only the inside rule/],
      [[patches, '--scene', ms, '--rule', 'cover', '--min-cover', '2'], /--min-cover: expected a share in \(0, 1\]/],
      [[join(dir, 'missing.geojson'), '--scene', ms], /missing.geojson: cannot read the file \(no such file\)/],
      [[patches, '--scene', join(dir, 'none.tif')], /none.tif: cannot open the file \(no such file\)/],
      [[write('bad.geojson', '{"type": "Feature"}'), '--scene', ms], /bad.geojson: expected a GeoJSON FeatureCollection/],
      [[patches, '--scene', ms, '--samples', join(dir, 'out.xlsx')], /--samples: expected a file name ending in .csv or .parquet/],
      [[patches, '--scene', ms, '--chips', dir, '--chip-format', 'png'], /--chip-format: expected npy or geotiff, got 'png'/],
      [[patches, '--scene', ms, '--samples', join(dir, 'no', 'such', 'x.csv')], /x.csv: cannot write the file \(ENOENT\)/],
    ];
    for (const [args, message] of cases) {
      const { code, stderr } = await run(...args);
      expect(code, args.join(' ')).toBe(2);
      expect(stderr).toMatch(message);
      expect(stderr.trim().split('\n')).toHaveLength(1);
    }
  });
});
