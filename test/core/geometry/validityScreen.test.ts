import GeometryFactory from 'jsts/org/locationtech/jts/geom/GeometryFactory.js';
import GeoJSONReader from 'jsts/org/locationtech/jts/io/GeoJSONReader.js';
import IsValidOp from 'jsts/org/locationtech/jts/operation/valid/IsValidOp.js';
import { describe, expect, it } from 'vitest';
import { ringIsCertainlySimple } from '../../../src/core/geometry/segments.ts';
import type { Ring } from '../../../src/core/geometry/types.ts';
import { validityIssues } from '../../../src/core/geometry/validity.ts';
import { Random } from '../../../src/core/random.ts';

// The quick simplicity screen may only ever pass rings that JSTS 2.12.1's IsValidOp (npm,
// following OGC 06-103r4) also passes, and the full verdict must equal JSTS's.

const reader = new GeoJSONReader(new GeometryFactory());
const jstsValid = (ring: Ring) => new IsValidOp(reader.read({ type: 'Polygon', coordinates: [ring] })).isValid();

function randomRing(random: Random, k: number, scrambled: boolean, origin: number): Ring {
  const ring: Ring = [];
  for (let i = 0; i < k; i++) {
    // Snap to a coarse lattice now and then, so touching and collinear cases occur.
    const snap = (v: number) => (random.next() < 0.3 ? Math.round(v) : v);
    if (scrambled) ring.push([origin + snap(random.uniform(0, 6)), origin + snap(random.uniform(0, 6))]);
    else {
      const a = (2 * Math.PI * i) / k;
      const r = random.uniform(1, 3);
      ring.push([origin + snap(3 + r * Math.cos(a)), origin + snap(3 + r * Math.sin(a))]);
    }
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

describe('the quick simplicity screen against JSTS IsValidOp', () => {
  for (const origin of [0, 5_100_000]) {
    it(`agrees on 3000 random rings (coordinates near ${origin})`, { timeout: 60_000 }, () => {
      const random = new Random(origin + 1);
      let screened = 0, invalid = 0;
      for (let t = 0; t < 3000; t++) {
        const ring = randomRing(random, 3 + Math.floor(random.next() * 10), random.next() < 0.5, origin);
        const distinct = new Set(ring.slice(0, -1).map((p) => p.join())).size === ring.length - 1;
        if (!distinct || ring.length < 4) continue;
        const reference = jstsValid(ring);
        if (ringIsCertainlySimple(ring)) {
          screened++;
          expect(reference, JSON.stringify(ring)).toBe(true);
        }
        const ours = validityIssues([[ring]]).length === 0;
        expect(ours, JSON.stringify(ring)).toBe(reference);
        if (!reference) invalid++;
      }
      // Both branches are exercised.
      expect(screened).toBeGreaterThan(500);
      expect(invalid).toBeGreaterThan(500);
    });
  }
});
