import ConvexHull from 'jsts/org/locationtech/jts/algorithm/ConvexHull.js';
import { describe, expect, it } from 'vitest';
import { convexHull, hullsApart, simpleRingHull } from '../../../src/core/geometry/hull.ts';
import { factory, jstsPolygon } from '../../../src/core/geometry/jstsBridge.ts';
import { ringSignedArea } from '../../../src/core/geometry/measure.ts';
import type { Position, Ring } from '../../../src/core/geometry/types.ts';
import { Random } from '../../../src/core/random.ts';

// The one-pass hull of a simple ring (Melkman's algorithm) against the convex hull of
// JSTS (a port of JTS's ConvexHull, Graham scan) and against our sorting monotone chain:
// the same corners, counter-clockwise.

const key = (p: Position) => `${p[0]} ${p[1]}`;

/** JSTS's hull corners, as a set of "x y" keys. */
function jstsCorners(ring: Ring): Set<string> {
  const hull = new ConvexHull(jstsPolygon([ring]).getCoordinates(), factory).getConvexHull();
  const coordinates = hull.getCoordinates() as { x: number; y: number }[];
  return new Set(coordinates.map((c) => key([c.x, c.y])));
}

/** A crown-like ring, some with deep notches so it is far from convex, either winding. */
function crown(random: Random, notched: boolean, clockwise: boolean): Ring {
  const k = 5 + Math.floor(random.next() * 40);
  const cx = 600000 + random.uniform(0, 1000), cy = 5100000 + random.uniform(0, 1000);
  const r = random.uniform(0.5, 6);
  const ring: Ring = [];
  for (let i = 0; i < k; i++) {
    const a = (2 * Math.PI * i) / k;
    const rr = r * (notched && i % 3 === 1 ? random.uniform(0.1, 0.5) : random.uniform(0.85, 1.15));
    ring.push([cx + rr * Math.cos(a), cy + rr * Math.sin(a)]);
  }
  if (clockwise) ring.reverse();
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

function expectSameHull(ring: Ring) {
  const hull = simpleRingHull(ring);
  expect(hull).not.toBeNull();
  const closed = [...hull!, hull![0]];
  expect(ringSignedArea(closed)).toBeGreaterThan(0);
  expect(new Set(hull!.map(key))).toEqual(jstsCorners(ring));
  expect(new Set(hull!.map(key))).toEqual(new Set(convexHull(ring).map(key)));
}

describe('simpleRingHull', () => {
  it('finds the corners JSTS finds, counter-clockwise, on 2,000 seeded crowns', () => {
    const random = new Random(11);
    for (let i = 0; i < 2000; i++) expectSameHull(crown(random, i % 2 === 0, i % 3 === 0));
  });

  it('on a comb (a simple ring that folds back many times) and a hook', () => {
    const comb: Ring = [[0, 0], [10, 0], [10, 5]];
    for (let x = 9; x >= 1; x -= 2) comb.push([x, 5], [x, 1], [x - 1, 1], [x - 1, 5]);
    comb.push([0, 5], [0, 0]);
    expectSameHull(comb);
    expectSameHull([[0, 0], [10, 0], [10, 10], [1, 10], [1, 9], [9, 9], [9, 1], [0, 1], [0, 0]]);
  });

  it('leaves rings that start with three collinear positions to the sorting hull', () => {
    expect(simpleRingHull([[0, 0], [1, 0], [2, 0], [2, 2], [0, 2], [0, 0]])).toBeNull();
  });

  it('tells two halves of a crown split along a chord apart (they only touch)', () => {
    const random = new Random(3);
    const ring = crown(random, false, false).slice(0, -1);
    const half = Math.floor(ring.length / 2);
    const left = [...ring.slice(0, half + 1), ring[0]];
    const right = [...ring.slice(half), ring[0], ring[half]];
    expect(hullsApart(simpleRingHull(left)!, simpleRingHull(right)!, 1e-7)).toBe(true);
    expect(hullsApart(simpleRingHull(left)!, simpleRingHull(ring.concat([ring[0]]))!, 1e-7)).toBe(false);
  });
});
