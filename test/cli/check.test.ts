import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { rmSync } from 'node:fs';
import { main } from '../../src/cli/main.ts';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';

const dir = mkdtempSync(join(tmpdir(), 'fellfield-check-'));
// Reading a scene starts a worker and the last test a whole process: generous limits, so
// a busy machine does not fail them (nothing here measures time).
const SLOW = { timeout: 60_000 };
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const square = (x: number, y: number, s: number) => [[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]];
const feature = (id: string | number, species: string, coordinates: unknown, properties: Record<string, unknown> = {}) => ({
  type: 'Feature', id, properties: { species, ...properties }, geometry: { type: 'Polygon', coordinates },
});
const utm = { crs: { type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::32632' } } };

function write(name: string, content: string | Uint8Array): string {
  const path = join(dir, name);
  writeFileSync(path, content);
  return path;
}

function collection(features: unknown[], extra: Record<string, unknown> = utm): string {
  return write(`site-${Math.random().toString(36).slice(2)}.geojson`, JSON.stringify({ type: 'FeatureCollection', ...extra, features }));
}

async function run(...args: string[]) {
  let stdout = '';
  let stderr = '';
  const code = await main(['check', ...args], { stdout: (t) => { stdout += `${t}\n`; }, stderr: (t) => { stderr += `${t}\n`; } });
  return { code, stdout, stderr };
}

// A scene of 0.5 m panchromatic and 2 m multispectral pixels over 600000-600040 E,
// 5100000-5100040 N (EPSG:32632).
function scene(): string {
  const pan = writeGeoTiff({ width: 80, height: 80, sampleType: 'uint8', bands: [new Uint8Array(6400)], epsg: 32632, origin: [600000, 5100040], pixelSize: [0.5, 0.5], overviewFactors: [] });
  const ms = writeGeoTiff({ width: 20, height: 20, sampleType: 'uint8', bands: [new Uint8Array(400), new Uint8Array(400)], epsg: 32632, origin: [600000, 5100040], pixelSize: [2, 2], overviewFactors: [] });
  return `${write('pan.tif', pan)},${write('ms.tif', ms)}`;
}

const site = [
  feature('a', 'pice', square(600002, 5100002, 4)),
  feature('b', 'lari', square(600005, 5100002, 4)), // overlaps a by 1 x 4 m
  feature('c', 'pice', square(600020, 5100020, 4), { tags: ['pice', { species: 'alnu', interpreter: 'second' }] }),
  feature('d', 'pice', square(600020.5, 5100010.5, 3.4)), // 11.56 m² but no whole 2 m pixel
  feature('e', 'pinu', square(600038, 5100030, 4)), // half off the east edge
  feature('f', 'pinu', [[[600030, 5100002], [600034, 5100006], [600034, 5100002], [600030, 5100006], [600030, 5100002]]]),
];

describe('fellfield check', () => {
  it('prints the findings as one JSON document and exits 0', async () => {
    const { code, stdout } = await run(collection(site), '--json');
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    expect(doc.crs).toBe('EPSG:32632');
    expect(doc.counts).toEqual({
      invalid: 1, 'overlap-same': 0, 'overlap-mixed': 1, 'near-duplicate': 0, 'mixed-tag': 1, undersized: 0, 'off-image': 0,
    });
    const overlap = doc.findings.find((f: { kind: string }) => f.kind === 'overlap-mixed');
    expect(overlap.patches).toEqual(['a', 'b']);
    expect(overlap.area_m2).toBeCloseTo(4, 9);
    expect(overlap.shares).toEqual([0.25, 0.25]);
    const invalid = doc.findings.find((f: { kind: string }) => f.kind === 'invalid');
    expect(invalid.patches).toEqual(['f']);
    expect(invalid.geometry).toEqual({ type: 'Point', coordinates: [600032, 5100004] });
  });

  it('uses the scene grids for pure pixels and the image edge', SLOW, async () => {
    const { code, stdout } = await run(collection(site), '--scene', scene(), '--json');
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    // d holds no whole 2 m pixel; f, repaired into two triangles of 8 m² in all, neither.
    const small = doc.findings.filter((f: { kind: string }) => f.kind === 'undersized');
    expect(small.map((f: { patches: string[] }) => f.patches[0])).toEqual(['d', 'f']);
    expect(small.map((f: { details: { purePixels: number } }) => f.details.purePixels)).toEqual([0, 0]);
    expect(doc.counts['off-image']).toBe(1);
    const off = doc.findings.find((f: { kind: string }) => f.kind === 'off-image');
    expect(off.patches).toEqual(['e']);
    expect(off.area_m2).toBeCloseTo(8, 9);
    expect(off.shares).toEqual([0.5]);
  });

  it('exits 1 when a --fail-on kind is found, 0 when none is', async () => {
    const file = collection(site);
    expect((await run(file, '--fail-on', 'overlap-mixed')).code).toBe(1);
    expect((await run(file, '--fail-on', 'near-duplicate,overlap-same')).code).toBe(0);
    expect((await run(file, '--fail-on', 'all')).code).toBe(1);
  });

  it('prints findings grouped by kind as text', async () => {
    const { stdout } = await run(collection(site));
    expect(stdout).toContain('6 patch(es), measured in EPSG:32632; 3 finding(s)');
    expect(stdout).toMatch(/overlap-mixed \(1\)\n {2}error {3}patches a \(pice\) and b \(lari\) overlap by 4 m²/);
    expect(stdout).toContain('fix: cut the overlap out of patch a');
  });

  it('measures lon/lat input in the UTM zone', async () => {
    const lonLat = [feature(1, 'pice', [[[10.5, 46.5], [10.50005, 46.5], [10.50005, 46.50004], [10.5, 46.50004], [10.5, 46.5]]])];
    const { code, stdout } = await run(collection(lonLat, {}), '--json');
    expect(code).toBe(0);
    expect(JSON.parse(stdout).crs).toBe('EPSG:32632');
  });

  it('names the file and the problem on bad input, exit 2', SLOW, async () => {
    const cases: [string[], RegExp][] = [
      [[join(dir, 'missing.geojson')], /missing\.geojson: cannot read the file \(no such file\)$/],
      [[write('bad.geojson', '{"type":')], /bad\.geojson: not valid JSON/],
      [[collection([feature('x', '', square(0, 0, 1))])], /feature 0 \(id "x"\): has no "species"/],
      [[collection(site), '--fail-on', 'overlaps'], /--fail-on: unknown kind 'overlaps'/],
      [[collection(site), '--iou', '2'], /--iou: expected a number in \(0, 1\], got '2'/],
      [[collection(site), '--scene', write('not.tif', 'hello')], /not\.tif: /],
      [[collection(site), collection(site)], /expected one PATCHES\.geojson, got 2/],
      [[], /expected one PATCHES\.geojson, got 0/],
    ];
    for (const [args, message] of cases) {
      const { code, stderr } = await run(...args);
      expect(code, args.join(' ')).toBe(2);
      expect(stderr.trim().split('\n')).toHaveLength(1);
      expect(stderr.trim()).toMatch(message);
      expect(stderr).not.toMatch(/\n\s+at /);
    }
  });

  it('refuses a scene whose two rasters are in different CRSs', SLOW, async () => {
    const other = writeGeoTiff({ width: 4, height: 4, sampleType: 'uint8', bands: [new Uint8Array(16)], epsg: 32633, origin: [0, 40], pixelSize: [10, 10], overviewFactors: [] });
    const pan = scene().split(',')[0];
    const { code, stderr } = await run(collection(site), '--scene', `${pan},${write('other.tif', other)}`);
    expect(code).toBe(2);
    expect(stderr).toMatch(/other\.tif: its CRS \(EPSG:32633\) differs/);
  });

  it('runs as the installed command with the same exit codes', SLOW, () => {
    const bin = join(process.cwd(), 'bin/fellfield.mjs');
    const file = collection(site);
    let status = 0;
    try {
      execFileSync(process.execPath, [bin, 'check', file, '--fail-on', 'invalid', '--json'], { stdio: 'pipe' });
    } catch (error) {
      status = (error as { status: number }).status;
    }
    expect(status).toBe(1);
  });
});
