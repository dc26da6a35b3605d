import { describe, expect, it } from 'vitest';
import { sharedArea } from '../../../src/core/agreement/sharedArea.ts';
import { intersectionArea } from '../../../src/core/geometry/overlay.ts';
import type { MultiPolygonRings, Position, Ring } from '../../../src/core/geometry/types.ts';
import { seeded } from '../../../bench/harness.ts';

const random = seeded(23);

/** A star-shaped ring (simple by construction) around (cx, cy). */
function star(cx: number, cy: number, radius: number, vertices: number, clockwise = false): Ring {
  const ring: Position[] = [];
  const turn = random() * Math.PI * 2;
  for (let v = 0; v < vertices; v++) {
    const angle = turn + ((clockwise ? -v : v) / vertices) * Math.PI * 2;
    const r = radius * (0.5 + random());
    ring.push([cx + r * Math.cos(angle), cy + r * Math.sin(angle)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

describe('sharedArea', () => {
  it('agrees with the polygon-clipping library on random concave outlines', () => {
    for (let trial = 0; trial < 300; trial++) {
      const a: MultiPolygonRings = [[star(500000, 5100000, 5, 3 + Math.floor(random() * 12), random() < 0.5)]];
      const b: MultiPolygonRings = [[star(500000 + (random() - 0.5) * 8, 5100000 + (random() - 0.5) * 8, 5, 3 + Math.floor(random() * 12))]];
      const expected = intersectionArea(a, b);
      expect(sharedArea(a, b)).toBeCloseTo(expected, 6);
      expect(sharedArea(b, a)).toBeCloseTo(expected, 6);
    }
  });

  it('agrees with the library on outlines with holes and several parts', () => {
    for (let trial = 0; trial < 100; trial++) {
      const holed: MultiPolygonRings = [[star(0, 0, 8, 12), star(0, 0, 1.5, 6)], [star(30, 0, 3, 7)]];
      const other: MultiPolygonRings = [[star((random() - 0.5) * 10, (random() - 0.5) * 10, 4, 9)], [star(28 + random() * 4, random() * 2, 2, 5)]];
      const expected = intersectionArea(holed, other);
      expect(sharedArea(holed, other)).toBeCloseTo(expected, 6);
      expect(sharedArea(other, holed)).toBeCloseTo(expected, 6);
    }
  });

  it('hands touching and collinear cases to the library and gets them right', () => {
    const square = (x: number, y: number, s: number): MultiPolygonRings => [[[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]]];
    expect(sharedArea(square(0, 0, 10), square(0, 0, 10))).toBeCloseTo(100, 9);
    expect(sharedArea(square(0, 0, 10), square(10, 0, 10))).toBeCloseTo(0, 9);
    expect(sharedArea(square(0, 0, 10), square(5, 0, 10))).toBeCloseTo(50, 9);
    expect(sharedArea(square(0, 0, 10), square(10, 10, 3))).toBeCloseTo(0, 9);
  });

  it('is zero for empty outlines and unchanged by a shift of both', () => {
    expect(sharedArea([], [[star(0, 0, 1, 5)]])).toBe(0);
    const a: MultiPolygonRings = [[star(3, 4, 5, 9)]];
    const b: MultiPolygonRings = [[star(5, 2, 5, 8)]];
    const shift = (s: MultiPolygonRings): MultiPolygonRings => s.map((p) => p.map((r) => r.map(([x, y]) => [x + 600000, y + 7000000] as Position)));
    expect(sharedArea(shift(a), shift(b))).toBeCloseTo(sharedArea(a, b), 6);
  });
});
