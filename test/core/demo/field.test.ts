import proj4 from 'proj4';
import { beforeAll, describe, expect, it } from 'vitest';
import Coordinate from 'jsts/org/locationtech/jts/geom/Coordinate.js';
import GeometryFactory from 'jsts/org/locationtech/jts/geom/GeometryFactory.js';
import IsValidOp from 'jsts/org/locationtech/jts/operation/valid/IsValidOp.js';
import 'jsts/org/locationtech/jts/monkey.js';
import type { FieldCollection } from '../../../src/core/demo/field.ts';
import { demoRoster } from '../../../src/core/demo/roster.ts';
import type { Truth } from '../../../src/core/demo/truth.ts';
import { sceneUnderTest, type SceneUnderTest } from './sceneUnderTest.ts';

// field.geojson against RFC 7946 (Butler et al. 2016, "The GeoJSON Format") and against
// the truth: shifted back by the true offset, each walked polygon sits on its crown.
// Lon/lat go back to UTM with proj4 (2.22.0, npm) from its own definition string, and
// validity and centroids come from JSTS (2.12.1, npm), not from the generator's code.

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Geometry = any;
const factory = new GeometryFactory();
const polygon = (ring: number[][]): Geometry => factory.createPolygon(factory.createLinearRing(ring.map(([x, y]) => new Coordinate(x, y))), []);
// WGS 84 / UTM zone 8N, written out here rather than taken from src/core/crs.ts.
const utm8n = '+proj=utm +zone=8 +datum=WGS84 +units=m +no_defs';

let under: SceneUnderTest;
let field: FieldCollection;
let truth: Truth;

beforeAll(async () => {
  under = await sceneUnderTest(9, 2048);
  field = under.json<FieldCollection>('field.geojson');
  truth = under.json<Truth>('truth.json');
}, 120_000);

const signedArea = (ring: number[][]) => {
  let s = 0;
  for (let i = 0; i + 1 < ring.length; i++) s += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  return s / 2;
};

describe('field.geojson', () => {
  it('is an RFC 7946 FeatureCollection of closed, counterclockwise lon/lat polygons', () => {
    const raw = JSON.parse(new TextDecoder().decode(under.files.get('field.geojson')!.bytes));
    expect(raw.type).toBe('FeatureCollection');
    expect(raw.crs).toBeUndefined(); // RFC 7946 section 4: no "crs" member, WGS 84 implied
    expect(field.features.length).toBeGreaterThanOrEqual(40);
    for (const f of field.features) {
      expect(f.type).toBe('Feature');
      expect(f.geometry.type).toBe('Polygon');
      const [ring, ...holes] = f.geometry.coordinates;
      expect(holes).toEqual([]);
      expect(ring.length).toBeGreaterThanOrEqual(4); // section 3.1.6: four or more positions
      expect(ring[0]).toEqual(ring[ring.length - 1]); // closed
      expect(signedArea(ring)).toBeGreaterThan(0); // exterior ring counterclockwise (right-hand rule)
      for (const [lon, lat] of ring) {
        expect(lon).toBeGreaterThan(-180);
        expect(lon).toBeLessThan(180);
        expect(Math.abs(lat)).toBeLessThan(90);
      }
    }
  });

  it('carries an id and a roster species code on every polygon, ids unique', () => {
    const codes = new Set(demoRoster.map((s) => s.code));
    const ids = field.features.map((f) => f.properties.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const f of field.features) expect(codes.has(f.properties.species)).toBe(true);
    // The rare species is walked too, when the scene has one big enough.
    expect(field.features.some((f) => f.properties.species === 'RHPE')).toBe(true);
  });

  it('holds only valid polygons (JSTS IsValidOp, OGC simple features rules)', () => {
    for (const f of field.features) {
      const op = new IsValidOp(polygon(f.geometry.coordinates[0]));
      expect(op.isValid(), f.properties.id).toBe(true);
    }
  });

  it('sits on its crowns once shifted back by the true offset, within the GPS noise', () => {
    const { dx, dy } = truth.offset;
    expect(Math.hypot(dx, dy)).toBeGreaterThanOrEqual(1);
    expect(Math.hypot(dx, dy)).toBeLessThanOrEqual(2);
    const crowns = new Map(truth.crowns.map((c) => [c.id, c]));
    const links = new Map(truth.field.map((l) => [l.id, l]));
    const errors: number[] = [];
    const rawErrors: number[] = [];
    for (const f of field.features) {
      const link = links.get(f.properties.id)!;
      const crown = crowns.get(link.crownId)!;
      expect(crown.fieldId).toBe(f.properties.id);
      expect(crown.species).toBe(f.properties.species);
      const ring = f.geometry.coordinates[0].map((p) => proj4('EPSG:4326', utm8n, p) as number[]);
      const c = polygon(ring).getCentroid();
      errors.push(Math.hypot(c.getX() + dx - crown.centre[0], c.getY() + dy - crown.centre[1]));
      rawErrors.push(Math.hypot(c.getX() - crown.centre[0], c.getY() - crown.centre[1]));
    }
    // GPS error sd 0.3 m per vertex and axis; averaged over 8-24 vertices the centroid
    // error shrinks, though uneven vertex spacing adds a little: all polygons land within
    // two sd of their crown centre and nine in ten within one.
    expect(Math.max(...errors)).toBeLessThan(2 * truth.gpsNoiseSd);
    expect(errors.filter((e) => e < truth.gpsNoiseSd).length / errors.length).toBeGreaterThanOrEqual(0.9);
    // Unshifted, they are off by the systematic shift (this is what the offset fixes).
    expect(Math.min(...rawErrors)).toBeGreaterThan(Math.hypot(dx, dy) - truth.gpsNoiseSd);
  });

  it('lets the offset be recovered as the mean displacement of the walked polygons', () => {
    const crowns = new Map(truth.crowns.map((c) => [c.id, c]));
    let sx = 0;
    let sy = 0;
    for (const f of field.features) {
      const crown = crowns.get(truth.field.find((l) => l.id === f.properties.id)!.crownId)!;
      const ring = f.geometry.coordinates[0].map((p) => proj4('EPSG:4326', utm8n, p) as number[]);
      const c = polygon(ring).getCentroid();
      sx += crown.centre[0] - c.getX();
      sy += crown.centre[1] - c.getY();
    }
    const n = field.features.length;
    expect(Math.hypot(sx / n - truth.offset.dx, sy / n - truth.offset.dy)).toBeLessThan(0.05);
  });
});
