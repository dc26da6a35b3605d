import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import GeometryFactory from 'jsts/org/locationtech/jts/geom/GeometryFactory.js';
import GeoJSONReader from 'jsts/org/locationtech/jts/io/GeoJSONReader.js';
import IsValidOp from 'jsts/org/locationtech/jts/operation/valid/IsValidOp.js';
import { describe, expect, it } from 'vitest';
import { repairOutline } from '../../src/core/geometry/repair.ts';
import type { MultiPolygonRings } from '../../src/core/geometry/types.ts';

// Make-valid against GEOS 3.11.1 MakeValid (Shapely 1.8.5 make_valid, Debian
// python3-shapely; fixture by fixtures/checks/make_fixtures.py): the repaired area of
// every invalid case, within 1e-6 m². The result must also pass JSTS 2.12.1 IsValidOp.
// Three deliberate differences: GEOS applies the even-odd rule across all parts of a
// MultiPolygon, so overlapping parts cancel and a degenerate part can close a gap
// between others; we apply it within each part and union the parts, because an
// interpreter who draws two overlapping parts means their union. And a hole identical
// to its shell leaves nothing here (even-odd), where GEOS keeps the shell.

interface ValidityCase { desc: string; rings: MultiPolygonRings; shapelyValid: boolean; makeValidArea: number }

const here = dirname(fileURLToPath(import.meta.url));
const fixture = JSON.parse(readFileSync(join(here, 'fixtures/checks/shapely-checks.json'), 'utf8')) as { validity: ValidityCase[] };
const reader = new GeoJSONReader(new GeometryFactory());

const deliberate = new Map([
  ['mA - multipolygon with component with too few points', 19200],
  ['mA - nested overlapping shells', 25600],
  ['mA - nested overlapping shells, all vertices touch (1)', 130400],
  ['mA - nested overlapping shells, all vertices touch (2)', 144000],
  ['two crowns in one patch, overlapping (6.1.14: interiors may not intersect)', 17],
  ['A - hole identical to shell', 0],
]);

describe('repairOutline against GEOS MakeValid', () => {
  const invalid = fixture.validity.filter((c) => !c.shapelyValid);
  it('has the invalid cases', () => expect(invalid.length).toBeGreaterThan(35));
  for (const c of invalid) {
    it(c.desc, () => {
      const result = repairOutline(c.rings);
      const expected = deliberate.get(c.desc) ?? c.makeValidArea;
      expect(Math.abs(result.areaAfter - expected)).toBeLessThanOrEqual(1e-6);
      if (result.rings.length) {
        expect(new IsValidOp(reader.read({ type: 'MultiPolygon', coordinates: result.rings })).isValid()).toBe(true);
      }
      // Never silent: something is always said about an invalid outline's repair.
      expect(result.changes.length).toBeGreaterThan(0);
    });
  }

  it('leaves a valid outline as it is and says nothing', () => {
    const square: MultiPolygonRings = [[[[0, 0], [3, 0], [3, 3], [0, 3], [0, 0]]]];
    const result = repairOutline(square);
    expect(result.changes).toEqual([]);
    expect(result.areaAfter).toBe(9);
  });
});
