import { spawnSync } from 'node:child_process';
import { readFileSync, rmSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { GEOJSON_DECIMALS } from '../../src/core/export/options.ts';
import { geometrySite, writtenExport } from './exportSites.ts';

// The GeoJSON export against RFC 7946 (Butler et al. 2016, "The GeoJSON Format"):
// §3.1.1 positions of two numbers, longitude first; §3.1.6 linear rings closed, of four
// or more positions, exteriors counterclockwise and holes clockwise; §4 WGS 84 and no
// "crs" member (it was removed from the format); §11.2 coordinate precision, here a
// stated 8 decimals. Orientation is also asked of Shapely 2.0 (Debian python3-shapely,
// LinearRing.is_ccw on GEOS), an outside implementation of the same test.

let out: Awaited<ReturnType<typeof writtenExport>>;
let text: string;
let doc: { type: string; features: { type: string; id: string; geometry: { type: string; coordinates: number[][][][] }; properties: Record<string, unknown> }[] } & Record<string, unknown>;

beforeAll(async () => {
  out = await writtenExport(await geometrySite(), 'geojson');
  text = readFileSync(out.data, 'utf8');
  doc = JSON.parse(text);
});
afterAll(() => rmSync(out.dir, { recursive: true, force: true }));

/** Twice the signed area in lon/lat (positive: counterclockwise). */
function shoelace(ring: number[][]): number {
  let s = 0;
  for (let i = 0; i + 1 < ring.length; i++) s += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  return s;
}

describe('RFC 7946', () => {
  it('has no "crs" member anywhere (§4)', () => {
    expect(Object.keys(doc)).not.toContain('crs');
    expect(text).not.toMatch(/"crs"\s*:/);
    for (const f of doc.features) expect(Object.keys(f)).not.toContain('crs');
  });

  it('is a FeatureCollection of MultiPolygon features with string ids (§3.2, §3.3)', () => {
    expect(doc.type).toBe('FeatureCollection');
    expect(doc.features.length).toBe(8);
    for (const f of doc.features) {
      expect(f.type).toBe('Feature');
      expect(typeof f.id).toBe('string');
      expect(f.geometry.type).toBe('MultiPolygon');
    }
  });

  it('positions are [longitude, latitude] within range (§3.1.1, §4)', () => {
    for (const f of doc.features) for (const rings of f.geometry.coordinates) for (const ring of rings) for (const p of ring) {
      expect(p).toHaveLength(2);
      expect(p[0]).toBeGreaterThanOrEqual(-180);
      expect(p[0]).toBeLessThanOrEqual(180);
      expect(p[1]).toBeGreaterThanOrEqual(-90);
      expect(p[1]).toBeLessThanOrEqual(90);
      // The demo basin's zone 8N: longitudes near -135, latitudes near 40 (not swapped).
      expect(p[0]).toBeCloseTo(-135, 0);
      expect(p[1]).toBeCloseTo(40, 0);
    }
  });

  it('rings are closed with four or more positions; exteriors counterclockwise, holes clockwise (§3.1.6)', () => {
    let holes = 0;
    for (const f of doc.features) for (const rings of f.geometry.coordinates) rings.forEach((ring, i) => {
      expect(ring.length).toBeGreaterThanOrEqual(4);
      expect(ring[ring.length - 1]).toEqual(ring[0]);
      if (i === 0) expect(shoelace(ring)).toBeGreaterThan(0);
      else { expect(shoelace(ring)).toBeLessThan(0); holes++; }
    });
    expect(holes).toBe(1);
    expect(doc.features.find((f) => f.id === 'M1')!.geometry.coordinates).toHaveLength(2);
  });

  it(`every coordinate has at most the stated ${GEOJSON_DECIMALS} decimals, and the file says so (§11.2)`, () => {
    const coordinateText = [...text.matchAll(/"coordinates":(\[[^a-z"]*\])\}/g)].map((m) => m[1]).join(',');
    const numbers = coordinateText.match(/-?\d+(\.\d+)?(e-?\d+)?/g)!;
    // Six squares and the holed patch (5 positions a ring) and the two-part patch: 50 positions.
    expect(numbers.length).toBe(100);
    for (const n of numbers) {
      expect(n).not.toMatch(/e/);
      expect((n.split('.')[1] ?? '').length).toBeLessThanOrEqual(GEOJSON_DECIMALS);
    }
    // The precision is used, not just capped: most values need every decimal.
    expect(numbers.filter((n) => (n.split('.')[1] ?? '').length === GEOJSON_DECIMALS).length).toBeGreaterThan(50);
    expect((doc.fellfield as { coordinate_decimals: number }).coordinate_decimals).toBe(GEOJSON_DECIMALS);
  });

  it('Shapely agrees on the orientation of every ring', () => {
    const script = `
import json, sys
from shapely.geometry import LinearRing
doc = json.load(open(sys.argv[1]))
out = []
for f in doc["features"]:
    for rings in f["geometry"]["coordinates"]:
        out.append([LinearRing(r).is_ccw for r in rings])
print(json.dumps(out))
`;
    const r = spawnSync('/usr/bin/python3', ['-c', script, out.data], { encoding: 'utf8' });
    expect(r.stderr).toBe('');
    const flags = JSON.parse(r.stdout) as boolean[][];
    for (const rings of flags) expect(rings).toEqual(rings.map((_, i) => i === 0));
  });
});
