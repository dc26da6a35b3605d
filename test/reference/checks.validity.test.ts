import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import GeometryFactory from 'jsts/org/locationtech/jts/geom/GeometryFactory.js';
import WKTReader from 'jsts/org/locationtech/jts/io/WKTReader.js';
import IsValidOp from 'jsts/org/locationtech/jts/operation/valid/IsValidOp.js';
import { describe, expect, it } from 'vitest';
import type { MultiPolygonRings } from '../../src/core/geometry/types.ts';
import { validityIssues, type ValidityReason } from '../../src/core/geometry/validity.ts';

// Validity verdicts against the outside world:
// - JTS test suite, TestValid.xml (locationtech/jts, commit 464d5ff), published verdicts;
// - Shapely 1.8.5 / GEOS 3.11.1 (Debian python3-shapely), fixture made by
//   fixtures/checks/make_fixtures.py;
// - JSTS 2.12.1 IsValidOp (npm) at test time, read from the same WKT.
// OGC 06-103r4 (Simple Features Common Architecture 1.2.1): 6.1.7.1 LinearRing is closed
// and simple; 6.1.11.1 Polygon assertions (rings touch only at points, no cut lines,
// spikes or punctures, connected interior); 6.1.14 MultiPolygon (part interiors disjoint,
// boundaries touch at finitely many points). Clause numbers recalled from memory.

interface ValidityCase {
  source: 'jts' | 'own';
  desc: string;
  wkt: string;
  rings: MultiPolygonRings;
  jtsValid?: boolean;
  shapelyValid: boolean;
  shapelyReason: string;
}

const here = dirname(fileURLToPath(import.meta.url));
const fixture = JSON.parse(readFileSync(join(here, 'fixtures/checks/shapely-checks.json'), 'utf8')) as {
  shapely: string; geos: string; validity: ValidityCase[];
};

/** Our verdict in JTS terms: JTS accepts repeated consecutive positions, which we only warn about. */
const topologicallyValid = (rings: MultiPolygonRings) =>
  validityIssues(rings).every((issue) => issue.reason === 'repeated-point');

const reader = new WKTReader(new GeometryFactory());

describe('validity verdicts from the JTS test suite (TestValid.xml)', () => {
  const cases = fixture.validity.filter((c) => c.source === 'jts');
  it('covers the published polygon cases', () => expect(cases.length).toBeGreaterThanOrEqual(50));
  for (const c of cases) {
    it(`${c.desc}: ${c.jtsValid ? 'valid' : 'invalid'}`, () => {
      expect(topologicallyValid(c.rings)).toBe(c.jtsValid);
      // GEOS agrees with the published verdict, and so does JSTS read straight from the WKT.
      expect(c.shapelyValid).toBe(c.jtsValid);
      expect(new IsValidOp(reader.read(c.wkt)).isValid()).toBe(c.jtsValid);
    });
  }
});

describe('OGC Simple Features cases of our own, judged by Shapely/GEOS', () => {
  for (const c of fixture.validity.filter((v) => v.source === 'own')) {
    it(`${c.desc}: ${c.shapelyValid ? 'valid' : `invalid (${c.shapelyReason})`}`, () => {
      expect(topologicallyValid(c.rings)).toBe(c.shapelyValid);
    });
  }
});

describe('the reason given follows the OGC rule broken', () => {
  const reasonsOf = (wkt: string): ValidityReason[] => {
    const c = fixture.validity.find((v) => v.wkt === wkt)!;
    return validityIssues(c.rings).map((i) => i.reason);
  };
  it('6.1.7.1: a bowtie ring is not simple', () => {
    expect(reasonsOf('POLYGON ((0 0, 4 4, 4 0, 0 4, 0 0))')).toEqual(['self-intersection']);
  });
  it('6.1.11.1: a hole outside its shell', () => {
    expect(reasonsOf('POLYGON ((20 180, 20 20, 140 20, 140 180, 20 180), (160 120, 180 100, 160 80, 160 120))')).toEqual(['hole-outside-shell']);
  });
  it('6.1.11.1: nested holes', () => {
    expect(reasonsOf('POLYGON ((0 140, 0 0, 180 0, 180 140, 0 140), (20 20, 160 20, 160 120, 20 120, 20 20), (40 100, 40 40, 140 40, 140 100, 40 100))')).toEqual(['nested-holes']);
  });
  it('6.1.11.1 e: a hole that splits the interior', () => {
    expect(reasonsOf('POLYGON ((0 0, 10 10, 10 0, 0 0), (5 5, 5 0, 10 5, 5 5))')).toEqual(['disconnected-interior']);
  });
  it('6.1.7.1: a ring of collinear points has no area', () => {
    expect(reasonsOf('POLYGON ((0 0, 1 1, 2 2, 0 0))')).toEqual(['zero-area']);
  });
  it('6.1.11.1: too few distinct points', () => {
    expect(reasonsOf('POLYGON ((0 0, 0 0, 0 0, 0 0, 0 0))')).toEqual(['too-few-points']);
  });
  it('6.1.14: overlapping parts of one MultiPolygon', () => {
    expect(reasonsOf('MULTIPOLYGON (((0 0, 3 0, 3 3, 0 3, 0 0)), ((2 2, 5 2, 5 5, 2 5, 2 2)))')).toEqual(['self-intersection']);
  });
  it('repeated positions are reported though JTS and GEOS accept them', () => {
    expect(reasonsOf('POLYGON ((107 246, 107 246, 250 285, 294 137, 151 90, 15 125, 157 174, 107 246))')).toEqual(['repeated-point']);
  });
});

describe('structure JSTS cannot even build is told, not thrown', () => {
  it('an unclosed ring, a two-point ring and a NaN position', () => {
    expect(validityIssues([[[[0, 0], [4, 0], [4, 4], [0, 4]]]]).map((i) => i.reason)).toEqual(['ring-not-closed']);
    expect(validityIssues([[[[0, 0], [4, 0], [0, 0]]]]).map((i) => i.reason)).toEqual(['too-few-points']);
    expect(validityIssues([[[[0, 0], [NaN, 0], [4, 4], [0, 0]]]]).map((i) => i.reason)).toEqual(['invalid-coordinate']);
    expect(validityIssues([[]]).map((i) => i.reason)).toEqual(['too-few-points']);
  });
});
