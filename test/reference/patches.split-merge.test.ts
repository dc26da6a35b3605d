import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { mergeOutlines, OutlineEditError, splitOutline } from '../../src/app/patches/outlineEdits.ts';
import { multiPolygonArea } from '../../src/core/geometry/measure.ts';
import { validityIssues } from '../../src/core/geometry/validity.ts';
import type { MultiPolygonRings, PolygonRings, Position } from '../../src/core/geometry/types.ts';

// Cutting a patch with a line and joining two patches, against Shapely 1.8.5 over GEOS
// 3.11.1 (Debian's python3-shapely): shapely.ops.split and unary_union, computed once by
// fixtures/patches/make_split_merge.py into split-merge.json. Areas agree to 1e-6 m² at
// UTM-sized coordinates. The slanted cut is also worked by hand (a trapezoid).

interface SplitCase { name: string; polygon: PolygonRings; line: Position[]; areas: number[] }
interface MergeCase { name: string; a: PolygonRings; b: PolygonRings; area: number; parts: number }
const fixture = JSON.parse(readFileSync(join(import.meta.dirname, 'fixtures', 'patches', 'split-merge.json'), 'utf8')) as {
  split: SplitCase[];
  merge: MergeCase[];
};

const reversed = (rings: PolygonRings): PolygonRings => rings.map((ring) => [...ring].reverse());
const rotated = (rings: PolygonRings): PolygonRings =>
  rings.map((ring) => {
    const open = ring.slice(0, -1);
    const turned = [...open.slice(2), ...open.slice(0, 2)];
    return [...turned, turned[0]];
  });

describe('splitOutline against shapely.ops.split', () => {
  for (const c of fixture.split) {
    it(c.name, () => {
      for (const rings of [c.polygon, reversed(c.polygon), rotated(c.polygon)]) {
        const pieces = splitOutline([rings], c.line);
        expect(pieces.map(multiPolygonArea)).toHaveLength(c.areas.length);
        pieces.forEach((piece, i) => expect(multiPolygonArea(piece)).toBeCloseTo(c.areas[i], 6));
        // Every piece is a valid outline (OGC rules, src/core/geometry/validity.ts).
        for (const piece of pieces) expect(validityIssues(piece)).toEqual([]);
      }
    });
  }

  it('cuts a 10 m square on a slant into trapezoids of 55 and 45 m² (worked by hand)', () => {
    const c = fixture.split.find((s) => s.name === 'square cut on a slant')!;
    // The line rises 5 m over 12 m: at x = 0 it is 2 5/12 m up, at x = 10 it is 6 7/12 m.
    const lower = ((2 + 5 / 12 + (2 + 55 / 12)) / 2) * 10;
    expect(lower).toBeCloseTo(45, 9);
    expect(splitOutline([c.polygon], c.line).map(multiPolygonArea)).toEqual([expect.closeTo(100 - lower, 6), expect.closeTo(lower, 6)]);
  });

  it('refuses a line that does not cross the patch', () => {
    const c = fixture.split[0];
    const [x, y] = c.polygon[0][0];
    expect(() => splitOutline([c.polygon], [[x + 2, y + 2], [x + 4, y + 4]])).toThrow(OutlineEditError);
    expect(() => splitOutline([c.polygon], [[x - 5, y - 5], [x - 5, y + 20]])).toThrow(/cross the patch/);
    expect(() => splitOutline([c.polygon], [[x, y]])).toThrow(/two points/);
  });
});

describe('mergeOutlines against shapely.ops.unary_union', () => {
  for (const c of fixture.merge) {
    it(c.name, () => {
      for (const [a, b] of [[c.a, c.b], [c.b, c.a], [reversed(c.a), rotated(c.b)]]) {
        const merged: MultiPolygonRings = mergeOutlines([a], [b]);
        expect(merged).toHaveLength(c.parts);
        expect(multiPolygonArea(merged)).toBeCloseTo(c.area, 6);
        expect(validityIssues(merged)).toEqual([]);
      }
    });
  }

  it('refuses two patches that neither touch nor overlap', () => {
    const a = fixture.merge[0].a;
    const far = a.map((ring) => ring.map(([x, y]): Position => [x + 100, y]));
    expect(() => mergeOutlines([a], [far])).toThrow(/neither touch nor overlap/);
  });
});
