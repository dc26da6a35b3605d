import { existsSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { transformer } from '../../src/core/crs.ts';
import { DEMO_EPSG } from '../../src/core/demo/scene.ts';
import { writeDemoScene, type DemoSite } from '../core/offset/demoSite.ts';

// fellfield offset end to end on a small generated scene: the JSON contract, the
// shifted file --apply writes, and every bad input told in one line with exit 2.

let site: DemoSite;
beforeAll(() => {
  site = writeDemoScene({ seed: 1, size: 1024 });
}, 120_000);
afterAll(() => rmSync(site.dir, { recursive: true, force: true }));

async function cli(...args: string[]) {
  const stdout: string[] = [];
  const stderr: string[] = [];
  const code = await main(args, { stdout: (t) => stdout.push(t), stderr: (t) => stderr.push(t) });
  return { code, stdout: stdout.join('\n'), stderr: stderr.join('\n'), stderrLines: stderr };
}

const scene = () => `${site.pan},${site.ms}`;

function fieldWith(name: string, edit: (doc: { features: { properties: Record<string, unknown>; geometry: { coordinates: number[][][] } }[] }) => void): string {
  const doc = JSON.parse(readFileSync(site.field, 'utf8'));
  edit(doc);
  const path = join(site.dir, name);
  writeFileSync(path, JSON.stringify(doc));
  return path;
}

describe('fellfield offset', () => {
  it('prints the contract keys with --json and shifts nothing', async () => {
    const { code, stdout, stderr } = await cli('offset', site.field, '--scene', scene(), '--json');
    expect(stderr).toBe('');
    expect(code).toBe(0);
    const json = JSON.parse(stdout);
    expect(json).toMatchObject({ reliable: true, polygons: site.truth.field.length, signal: 'ndvi', applied: null });
    for (const key of ['dx_m', 'dy_m', 'uncertainty_m']) expect(typeof json[key]).toBe('number');
    expect(Array.isArray(json.outliers)).toBe(true);
    expect(json.dx_px).toBeCloseTo(json.dx_m / 0.3, 9);
    expect(json.patches).toHaveLength(site.truth.field.length);
    expect(json.surface.values).toHaveLength((2 * json.surface.half + 1) ** 2);
    // The generator's truth, loosely here (the reference checks hold it to 0.075 m on bigger scenes).
    expect(Math.hypot(json.dx_m - site.truth.offset.dx, json.dy_m - site.truth.offset.dy)).toBeLessThan(0.25);
  }, 60_000);

  it('prints a readable report with a heat map', async () => {
    const { code, stdout } = await cli('offset', site.field, '--scene', scene());
    expect(code).toBe(0);
    expect(stdout).toMatch(/shift +-?\d+\.\d+ m east, -?\d+\.\d+ m north \(-?\d+(\.\d+)? , ?-?\d+(\.\d+)? panchromatic pixels\)|shift .* panchromatic pixels/);
    expect(stdout).toMatch(/uncertainty \d\.\d+ m \(95 % radius/);
    expect(stdout).toContain('score surface (north up');
    expect(stdout).toContain('nothing shifted');
  }, 60_000);

  it('--apply writes every polygon moved by the shift, properties kept and the shift recorded', async () => {
    const out = join(site.dir, 'shifted.geojson');
    const { code, stdout } = await cli('offset', site.field, '--scene', scene(), '--json', '--apply', out);
    expect(code).toBe(0);
    const json = JSON.parse(stdout);
    expect(json.applied).toBe(out);
    const before = JSON.parse(readFileSync(site.field, 'utf8'));
    const after = JSON.parse(readFileSync(out, 'utf8'));
    const toUtm = transformer(4326, DEMO_EPSG);
    expect(after.features).toHaveLength(before.features.length);
    after.features.forEach((feature: { properties: Record<string, unknown>; geometry: { coordinates: number[][][] } }, i: number) => {
      const original = before.features[i];
      expect(feature.properties).toMatchObject(original.properties);
      expect(feature.properties.offset).toMatchObject({ dx_m: Number(json.dx_m.toFixed(4)), crs: `EPSG:${DEMO_EPSG}` });
      feature.geometry.coordinates[0].forEach((p, k) => {
        const [x0, y0] = toUtm(original.geometry.coordinates[0][k] as [number, number]);
        const [x1, y1] = toUtm(p as [number, number]);
        expect(x1 - x0).toBeCloseTo(json.dx_m, 3);
        expect(y1 - y0).toBeCloseTo(json.dy_m, 3);
      });
    });
  }, 60_000);

  it('--areas reports a shift per cell and whether one shift fits them all', async () => {
    const { code, stdout } = await cli('offset', site.field, '--scene', scene(), '--json', '--areas', '1');
    expect(code).toBe(0);
    const json = JSON.parse(stdout);
    expect(json.areas.cellsAcross).toBe(1);
    expect(json.areas.cells).toHaveLength(1);
    // One cell holding every polygon gives the common estimate again.
    expect(json.areas.cells[0]).toMatchObject({ polygons: json.polygons, dx: json.dx_m, dy: json.dy_m, agrees: true });
    expect(json.areas.oneShiftFits).toBeNull();
  }, 60_000);

  const bad: [string, () => string[], RegExp][] = [
    ['a bad --areas', () => [site.field, '--scene', scene(), '--areas', '2.5'], /--areas takes a whole number of cells across from 1 to 8, got '2\.5'/],
    ['polygons outside the scene', () => [fieldWith('far.geojson', (d) => d.features[0].geometry.coordinates.forEach((r) => r.forEach((p) => { p[0] += 0.5; }))), '--scene', scene()], /far\.geojson: 1 of \d+ polygons lie outside the scene/],
    ['a set of one polygon', () => [fieldWith('one.geojson', (d) => d.features.splice(1)), '--scene', scene()], /one\.geojson: holds 1 polygon; a common shift needs at least two/],
    ['a radius as large as the scene', () => [site.field, '--scene', scene(), '--radius', '200'], /--radius 200 m: must be above 0 and under half the scene's side \(153\.6 m\)/],
    ['a bad radius', () => [site.field, '--scene', scene(), '--radius', 'wide'], /--radius must be a positive number of metres, got 'wide'/],
    ['a missing scene file', () => [site.field, '--scene', `${site.pan},${join(site.dir, 'nope.tif')}`], /nope\.tif: cannot open the file \(no such file\)/],
    ['a scene file that is not a TIFF', () => [site.field, '--scene', `${site.field},${site.ms}`], /field\.geojson: .*(not a TIFF|TIFF)/i],
    ['the scene files swapped', () => [site.field, '--scene', `${site.ms},${site.pan}`], /the panchromatic file has 8 bands, expected 1/],
    ['one scene file', () => [site.field, '--scene', site.ms], /--scene takes two files, PAN\.tif,MS\.tif; got 1/],
    ['no scene', () => [site.field], /give the scene: --scene PAN\.tif,MS\.tif/],
    ['a field file that is not JSON', () => [join(site.dir, 'truth.json').replace('truth.json', 'pan.tif'), '--scene', scene()], /pan\.tif: not valid JSON/],
    ['a missing field file', () => [join(site.dir, 'none.geojson'), '--scene', scene()], /none\.geojson: cannot read the file \(no such file\)/],
    ['an unknown signal', () => [site.field, '--scene', scene(), '--signal', 'lidar'], /--signal takes ndvi or pan, got 'lidar'/],
  ];
  for (const [label, args, message] of bad) {
    it(`exits 2 with one line on ${label}`, async () => {
      const out = join(site.dir, `never-${label.replace(/\W+/g, '-')}.geojson`);
      const { code, stdout, stderrLines } = await cli('offset', ...args(), '--apply', out);
      expect(code).toBe(2);
      expect(stdout).toBe('');
      expect(stderrLines).toHaveLength(1);
      expect(stderrLines[0]).toMatch(/^fellfield offset: /);
      expect(stderrLines[0]).toMatch(message);
      expect(stderrLines[0]).not.toMatch(/\n|at .*\.ts:\d+/);
      expect(existsSync(out)).toBe(false);
    }, 60_000);
  }
});
