import IsValidOp from 'jsts/org/locationtech/jts/operation/valid/IsValidOp.js';
import { describe, expect, it } from 'vitest';
import { splitIntoLoops } from '../../../src/core/geometry/ringLoops.ts';
import { jstsShape } from '../../../src/core/geometry/jstsBridge.ts';
import { multiPolygonArea } from '../../../src/core/geometry/measure.ts';
import { repairOutline } from '../../../src/core/geometry/repair.ts';
import type { Ring } from '../../../src/core/geometry/types.ts';

// The split into loops against the general repair (JSTS 2.12.1 noding and
// polygonizing, npm), reached by giving the same ring one repeated position, which the
// clean-up removes before the general rebuild. JSTS's IsValidOp judges the result.

function crown(k: number, cx: number, cy: number, r: number, wobble: (i: number) => number): Ring {
  const ring: Ring = [];
  for (let i = 0; i < k; i++) {
    const a = (2 * Math.PI * i) / k;
    ring.push([cx + r * wobble(i) * Math.cos(a), cy + r * wobble(i) * Math.sin(a)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/** Swaps vertices `at` and `at + 2`, as a slip of the hand does: the ring crosses itself. */
function twisted(ring: Ring, at = 0): Ring {
  const out = ring.slice(0, -1);
  [out[at], out[at + 2]] = [out[at + 2], out[at]];
  return [...out, out[0]];
}

describe('splitIntoLoops', () => {
  for (const twists of [1, 2]) {
    it(`splits a crown twisted ${twists === 1 ? 'once' : 'in two places'} into the loops the general repair finds`, () => {
      let split = 0;
      for (let k = 8; k < 40; k += 2) {
        let ring = twisted(crown(k, 600000 + k, 5100000, 2 + k / 10, (i) => 0.9 + 0.2 * ((i * 7) % 5) / 5));
        if (twists === 2) ring = twisted(ring, Math.floor(k / 2));
        const loops = splitIntoLoops(ring);
        const withRepeat = [[[ring[0], ...ring]]];
        const general = repairOutline(withRepeat);
        if (loops === null) continue;
        split++;
        expect(new IsValidOp(jstsShape(loops)).isValid()).toBe(true);
        expect(loops.length).toBe(general.rings.length);
        expect(Math.abs(multiPolygonArea(loops) - general.areaAfter)).toBeLessThan(1e-9 * general.areaAfter + 1e-9);
        // The repair through the quick path says what it did in the same words.
        const quick = repairOutline([[ring]], true);
        expect(quick.changes).toEqual(general.changes.filter((c) => !c.startsWith('removed 1 repeated')));
      }
      expect(split).toBeGreaterThan(5);
    });
  }

  it('leaves a simple ring and a curl to the general repair', () => {
    const simple = crown(12, 0, 0, 5, () => 1);
    expect(splitIntoLoops(simple)).toBeNull();
    // Loops that cross each other: a ring drawn twice round (a double loop).
    const twice: Ring = [[0, 0], [4, 0], [4, 4], [0, 4], [0, 1], [3, 1], [3, 3], [1, 3], [1, -1], [0, 0]];
    expect(splitIntoLoops(twice)).toBeNull();
    // A curl: one crossing at (4, 5), and the small loop lies inside the big one, so it
    // is a hole, not a part.
    const curl: Ring = [[0, 0], [10, 0], [10, 10], [0, 10], [0, 5], [6, 5], [6, 7], [4, 7], [4, 2], [0, 0]];
    expect(splitIntoLoops(curl)).toBeNull();
    const repaired = repairOutline([[curl]], true);
    expect(new IsValidOp(jstsShape(repaired.rings)).isValid()).toBe(true);
    expect(repaired.areaAfter).toBeCloseTo(100 - 16 - 4, 9); // the square less the cut-off quadrilateral (16 m²) and the hole (4 m²)
  });
});
