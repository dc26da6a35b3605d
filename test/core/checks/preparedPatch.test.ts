import { describe, expect, it } from 'vitest';
import { preparePatch, type PatchInput } from '../../../src/core/checks/preparedPatch.ts';
import { resolveSettings } from '../../../src/core/checks/settings.ts';
import { extentOfRings, multiPolygonArea } from '../../../src/core/geometry/measure.ts';
import type { Ring } from '../../../src/core/geometry/types.ts';
import { validityIssues } from '../../../src/core/geometry/validity.ts';
import { testSite } from './testSite.ts';

// preparePatch settles the commonest outline (one plain ring drawn round its middle) in
// two passes of its own. Its verdict and figures must be those of the general path
// (validityIssues, multiPolygonArea, extentOfRings) to the last bit, so no finding
// depends on which path a patch took.

const settings = resolveSettings();

function longWay(input: PatchInput) {
  const issues = validityIssues(input.rings, settings.maxVertices);
  return issues.length
    ? null
    : { issues, area: multiPolygonArea(input.rings), extent: extentOfRings(input.rings) };
}

function expectSameAsLongWay(input: PatchInput) {
  const expected = longWay(input);
  const patch = preparePatch(input, settings);
  if (!expected) {
    expect(patch.issues.length).toBeGreaterThan(0);
    return;
  }
  expect(patch.issues).toEqual([]);
  expect(patch.shape).toBe(input.rings);
  expect(Object.is(patch.area, expected.area)).toBe(true);
  expect(patch.extent).toEqual(expected.extent);
}

describe('preparePatch: the quick path agrees with the general one', () => {
  for (const seed of [1, 2, 3]) {
    it(`on every patch of a seeded site of 1,000 (seed ${seed})`, () => {
      for (const input of testSite(1000, seed)) expectSameAsLongWay(input);
    });
  }

  it('on clockwise, reversed-start, repeated, open and non-finite rings', () => {
    const square: Ring = [[600000, 5100000], [600004, 5100000], [600004, 5100003], [600000, 5100003], [600000, 5100000]];
    const clockwise = [...square].reverse();
    const repeated: Ring = [square[0], square[1], square[1], square[2], square[3], square[0]];
    const open = square.slice(0, 4);
    const nan: Ring = [square[0], [NaN, 5100000], square[2], square[3], square[0]];
    // A concave ring not star-shaped around its vertex mean: valid, but the general path decides.
    const hook: Ring = [[0, 0], [10, 0], [10, 10], [1, 10], [1, 9], [9, 9], [9, 1], [0, 1], [0, 0]];
    for (const ring of [square, clockwise, repeated, open, nan, hook]) {
      expectSameAsLongWay({ id: 1, species: 'pice', rings: [[ring]] });
    }
  });

  it('leaves outlines over the vertex limit to the general path', () => {
    const ring: Ring = [];
    for (let i = 0; i < 40; i++) ring.push([Math.cos((i / 40) * 2 * Math.PI), Math.sin((i / 40) * 2 * Math.PI)]);
    ring.push(ring[0]);
    const patch = preparePatch({ id: 1, species: 'pice', rings: [[ring]] }, { ...settings, maxVertices: 30 });
    expect(patch.issues.map((issue) => issue.reason)).toEqual(['vertex-limit']);
    expect(patch.shape).toBeNull();
  });
});
