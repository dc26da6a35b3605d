import { readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { transformer } from '../../src/core/crs.ts';
import { DEMO_EPSG } from '../../src/core/demo/scene.ts';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';
import { writeDemoScene, type DemoSite } from '../core/offset/demoSite.ts';

// `fellfield offset` against the demo generator's truth (src/core/demo/truth.ts: add
// truth.offset to the field polygons to put them on the imagery), which the estimator
// never sees. Tolerance: a quarter of the 0.3 m panchromatic pixel, as issue 9 asks.
// The method's sources: the maximum of a contrast score as template matching is common
// practice; the quadratic sub-pixel peak fit as in PIV and image registration (Raffel
// et al. 2007, from memory); the uncertainty by the bootstrap over polygons (Efron &
// Tibshirani 1993); NDVI (Rouse et al. 1974); outliers by a median-based robust scale
// (Iglewicz & Hoaglin 1993); "no reliable shift" by a randomization test (Manly 2007).

const TOLERANCE = 0.3 / 4;
const sites: DemoSite[] = [];
afterAll(() => sites.forEach((s) => rmSync(s.dir, { recursive: true, force: true })));

async function offset(site: DemoSite, field = site.field, ...extra: string[]) {
  const stdout: string[] = [];
  const stderr: string[] = [];
  const code = await main(['offset', field, '--scene', `${site.pan},${site.ms}`, '--json', ...extra], {
    stdout: (t) => stdout.push(t), stderr: (t) => stderr.push(t),
  });
  return { code, stderr: stderr.join('\n'), json: stdout.length ? JSON.parse(stdout.join('\n')) : null };
}

function expectTruth(json: { dx_m: number; dy_m: number; uncertainty_m: number; reliable: boolean; reasons: string[] }, truth: { dx: number; dy: number }) {
  expect(json.reliable, json.reasons.join('; ')).toBe(true);
  const error = Math.hypot(json.dx_m - truth.dx, json.dy_m - truth.dy);
  expect(error).toBeLessThan(TOLERANCE);
  expect(error).toBeLessThanOrEqual(json.uncertainty_m);
}

describe('fellfield offset recovers the demo generator\'s known shift', () => {
  it('on the demo scene itself (seed 1, 4096 pixels)', async () => {
    const site = writeDemoScene({ seed: 1, size: 4096 });
    sites.push(site);
    const { code, json } = await offset(site);
    expect(code).toBe(0);
    expect(json.polygons).toBe(site.truth.field.length);
    expectTruth(json, site.truth.offset);
  }, 600_000);

  const cases: { label: string; seed: number; fieldShift?: [number, number] }[] = [
    { label: 'a drawn shift, seed 2', seed: 2 },
    { label: 'a drawn shift, seed 3', seed: 3 },
    { label: 'no shift at all', seed: 5, fieldShift: [0, 0] },
    { label: 'a shift near the 3 m radius (2.75 m)', seed: 6, fieldShift: [-2.2, 1.65] },
  ];
  for (const c of cases) {
    it(c.label, async () => {
      const site = writeDemoScene({ seed: c.seed, size: 2048, fieldShift: c.fieldShift });
      sites.push(site);
      if (c.fieldShift) expect(site.truth.offset).toEqual({ dx: -c.fieldShift[0] || 0, dy: -c.fieldShift[1] || 0, units: 'm' });
      const { code, json } = await offset(site);
      expect(code).toBe(0);
      expectTruth(json, site.truth.offset);
    }, 300_000);
  }

  it('stays within tolerance with a fifth of the polygons misplaced onto bare ground, and flags them', async () => {
    const site = writeDemoScene({ seed: 2, size: 2048 });
    sites.push(site);
    const crowns = site.truth.crowns;
    const doc = JSON.parse(readFileSync(site.field, 'utf8'));
    const toUtm = transformer(4326, DEMO_EPSG);
    const toLonLat = transformer(DEMO_EPSG, 4326);
    const misplaced: string[] = [];
    doc.features.forEach((feature: { properties: { id: string }; geometry: { coordinates: number[][][] } }, i: number) => {
      if (i % 5 !== 0) return;
      const crown = site.crownOf.get(feature.properties.id)!;
      // The first of eight directions, 4 m away, where no crown comes within 1.5 m of the moved one.
      for (let k = 0; k < 8; k++) {
        const dx = 4 * Math.cos((k * Math.PI) / 4);
        const dy = 4 * Math.sin((k * Math.PI) / 4);
        const [x, y] = [crown.centre[0] + dx, crown.centre[1] + dy];
        if (crowns.every((c) => c === crown || Math.hypot(c.centre[0] - x, c.centre[1] - y) > c.radius * 1.2 + crown.radius * 1.2 + 1.5)) {
          feature.geometry.coordinates = feature.geometry.coordinates.map((ring) => ring.map((p) => {
            const [u, v] = toUtm([p[0], p[1]]);
            return toLonLat([u + dx, v + dy]);
          }));
          misplaced.push(feature.properties.id);
          break;
        }
      }
    });
    expect(misplaced.length).toBeGreaterThanOrEqual(Math.floor(doc.features.length / 5) - 2);
    const field = join(site.dir, 'field-misplaced.geojson');
    writeFileSync(field, JSON.stringify(doc));
    const { code, json } = await offset(site, field);
    expect(code).toBe(0);
    expectTruth(json, site.truth.offset);
    for (const id of misplaced) expect(json.outliers).toContain(id);
  }, 300_000);
});

describe('fellfield offset on a flat scene', () => {
  it('says there is no reliable shift, and gives no number', async () => {
    const site = writeDemoScene({ seed: 7, size: 1024 });
    sites.push(site);
    // The same grids, every pixel one value: no signal at all.
    const common = { sampleType: 'uint16' as const, epsg: DEMO_EPSG, origin: [493000, 4430000] as [number, number], tileSize: 256 };
    writeFileSync(site.pan, writeGeoTiff({ ...common, width: 1024, height: 1024, pixelSize: [0.3, 0.3], bands: [new Uint16Array(1024 * 1024).fill(400)] }));
    const ms = Array.from({ length: 8 }, (_, b) => new Uint16Array(256 * 256).fill(b === 4 ? 150 : b === 6 ? 500 : 300));
    writeFileSync(site.ms, writeGeoTiff({ ...common, width: 256, height: 256, pixelSize: [1.2, 1.2], bands: ms, bandNames: ['coastal', 'blue', 'green', 'yellow', 'red', 'red edge', 'NIR1', 'NIR2'] }));
    const { code, json } = await offset(site);
    expect(code).toBe(0);
    expect(json.reliable).toBe(false);
    expect(json.dx_m).toBeNull();
    expect(json.dy_m).toBeNull();
    expect(json.uncertainty_m).toBeNull();
    expect(json.reasons.join(' ')).toMatch(/flat/);
    const applied = await offset(site, site.field, '--apply', join(site.dir, 'out.geojson'));
    expect(applied.code).toBe(1);
    expect(applied.stderr).toMatch(/no reliable shift, so nothing was written/);
  }, 120_000);
});
