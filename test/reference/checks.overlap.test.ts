import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import GeometryFactory from 'jsts/org/locationtech/jts/geom/GeometryFactory.js';
import GeoJSONReader from 'jsts/org/locationtech/jts/io/GeoJSONReader.js';
import OverlayOp from 'jsts/org/locationtech/jts/operation/overlay/OverlayOp.js';
import { intersection as polyclipIntersection } from 'polyclip-ts';
import { describe, expect, it } from 'vitest';
import { CheckSession } from '../../src/core/checks/CheckSession.ts';
import { multiPolygonArea } from '../../src/core/geometry/measure.ts';
import type { MultiPolygonRings } from '../../src/core/geometry/types.ts';

// Overlap areas and IoU of the checks against three independent computations:
// - Shapely 1.8.5 / GEOS 3.11.1 (Debian python3-shapely), committed fixture made by
//   fixtures/checks/make_fixtures.py (66 pairs: random star polygons near the origin and
//   at UTM magnitudes, shared edges and corners, nesting, identical outlines, a hole, a sliver);
// - polyclip-ts 0.16.8 (npm), an exact-arithmetic sweep-line overlay, at test time;
// - JSTS 2.12.1 (npm) OverlayOp read from GeoJSON at test time. Our checks run JSTS's overlay
//   too, so this third one checks our pipeline (cheap rejections, ring conversion, rounding),
//   while GEOS and polyclip-ts check the overlay itself.
// Tolerance: 1e-9 relative plus 1e-9 m² absolute against the reference libraries; the
// findings carry areas rounded to 0.001 m², so those are compared within 0.0005 m².

interface OverlapCase {
  desc: string;
  a: MultiPolygonRings;
  b: MultiPolygonRings;
  areaA: number;
  areaB: number;
  intersectionArea: number;
  iou: number;
}

const here = dirname(fileURLToPath(import.meta.url));
const fixture = JSON.parse(readFileSync(join(here, 'fixtures/checks/shapely-checks.json'), 'utf8')) as { overlaps: OverlapCase[] };
const close = (actual: number, expected: number, rel = 1e-9, abs = 1e-9) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(abs + rel * Math.abs(expected));

const reader = new GeoJSONReader(new GeometryFactory());
const jstsArea = (a: MultiPolygonRings, b: MultiPolygonRings) =>
  OverlayOp.intersection(reader.read({ type: 'MultiPolygon', coordinates: a }), reader.read({ type: 'MultiPolygon', coordinates: b })).getArea();

/** The overlap finding the checks give for a pair, with no sliver tolerance. */
function checkedOverlap(c: OverlapCase, sliverAreaM2 = 0) {
  const session = new CheckSession({ settings: { sliverAreaM2, minAreaInMsPixels: 0 } });
  session.load([{ id: 'a', species: 'pice', rings: c.a }, { id: 'b', species: 'lari', rings: c.b }]);
  const findings = session.findings();
  return { overlap: findings.find((f) => f.kind === 'overlap-mixed'), duplicate: findings.find((f) => f.kind === 'near-duplicate') };
}

describe('overlap areas against Shapely/GEOS, polyclip-ts and JSTS', () => {
  it('the fixture has overlapping and touching pairs', () => {
    expect(fixture.overlaps.filter((c) => c.intersectionArea > 0).length).toBeGreaterThan(50);
    expect(fixture.overlaps.filter((c) => c.intersectionArea === 0).length).toBeGreaterThanOrEqual(2);
  });

  for (const c of fixture.overlaps) {
    it(`${c.desc}: ${c.intersectionArea.toFixed(4)} m²`, () => {
      close(multiPolygonArea(c.a), c.areaA);
      close(multiPolygonArea(c.b), c.areaB);
      // The references agree with each other first.
      close(multiPolygonArea(polyclipIntersection(c.a as never, c.b as never) as unknown as MultiPolygonRings), c.intersectionArea, 1e-9, 1e-8);
      close(jstsArea(c.a, c.b), c.intersectionArea, 1e-9, 1e-8);

      const { overlap, duplicate } = checkedOverlap(c);
      if (c.intersectionArea === 0) {
        expect(overlap).toBeUndefined();
        return;
      }
      expect(overlap).toBeDefined();
      expect(Math.abs(overlap!.area_m2! - c.intersectionArea)).toBeLessThanOrEqual(0.0005 + 1e-9);
      // The overlap polygon itself has the reference area.
      const geometry = overlap!.geometry as { type: 'MultiPolygon'; coordinates: MultiPolygonRings };
      close(multiPolygonArea(geometry.coordinates), c.intersectionArea, 1e-9, 1e-8);
      expect(Math.abs(overlap!.shares![0] - c.intersectionArea / c.areaA)).toBeLessThanOrEqual(5e-5);
      expect(Math.abs(overlap!.shares![1] - c.intersectionArea / c.areaB)).toBeLessThanOrEqual(5e-5);
      expect(Math.abs((overlap!.details!.iou as number) - c.iou)).toBeLessThanOrEqual(5e-5);
      expect(duplicate !== undefined).toBe(c.iou > 0.9);
    });
  }

  it('a sliver at or under the tolerance is not a finding; just over it is', () => {
    const sliver = fixture.overlaps.find((c) => c.desc === 'sliver overlap')!;
    expect(sliver.intersectionArea).toBeCloseTo(0.04, 9);
    expect(checkedOverlap(sliver, 0.05).overlap).toBeUndefined();
    expect(checkedOverlap(sliver, 0.039).overlap).toBeDefined();
  });
});
