import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { RasterGrid } from '../../src/core/geometry/rasterGrid.ts';
import type { Ring } from '../../src/core/geometry/types.ts';
import { coverageWindow } from '../../src/core/pixels/coverage.ts';
import { patchPixels } from '../../src/core/pixels/patchPixels.ts';

// Pixel verdicts against reference tools, computed once by
// fixtures/pixels/make-fixtures.py (its header says how) and stored in pixels.json:
// - GDAL 3.6.2 gdal_rasterize, default: burns pixels whose centre is inside → our "centre" rule.
// - GDAL 3.6.2 gdal_rasterize -at (all touched) → pixels with coverage above 0.
// - Shapely 1.8.5 (GEOS) intersection areas → our coverage fractions.
// - Shapely contains + exact boundary distance ≥ 0.5 m → our "inside" rule with a 0.5 m buffer;
//   Shapely buffer(-0.5, 64 segments per quarter circle) as a second opinion.

interface Case {
  name: string;
  rings: Ring[];
  centre: [number, number][];
  allTouched: [number, number][];
  areas: [number, number, number][];
  insideBuffered: [number, number][];
  insideBufferedChords: [number, number][];
}
const fixture = JSON.parse(readFileSync(new URL('./fixtures/pixels/pixels.json', import.meta.url), 'utf8')) as {
  grid: RasterGrid;
  buffer: number;
  cases: Case[];
};
const { grid } = fixture;
const key = (r: number, c: number) => `${r},${c}`;
const keys = (list: [number, number][] | [number, number, number][]) => list.map(([r, c]) => key(r, c)).sort();
const chosen = (p: { rows: Int32Array; cols: Int32Array }) => Array.from(p.rows, (r, i) => key(r, p.cols[i])).sort();

describe('pixel rules against GDAL rasterize and Shapely', () => {
  it('holds enough cases of each shape to mean something', () => {
    const kinds = new Set(fixture.cases.map((c) => c.name.split('-')[0]));
    expect([...kinds].sort()).toEqual(['crown', 'holed', 'rectangle', 'triangle']);
    expect(fixture.cases.reduce((n, c) => n + c.areas.length, 0)).toBeGreaterThan(1000);
  });

  for (const c of fixture.cases) {
    it(`${c.name}: centre rule burns what gdal_rasterize burns`, () => {
      expect(chosen(patchPixels([c.rings], grid, { kind: 'centre' }))).toEqual(keys(c.centre));
    });

    it(`${c.name}: pixels with any cover are what gdal_rasterize -at burns`, () => {
      const w = coverageWindow([c.rings], grid);
      const touched: string[] = [];
      w.fraction.forEach((f, i) => { if (f > 0) touched.push(key(w.row0 + Math.floor(i / w.width), w.col0 + (i % w.width))); });
      expect(touched.sort()).toEqual(keys(c.allTouched));
    });

    it(`${c.name}: coverage fractions match Shapely intersection areas`, () => {
      const w = coverageWindow([c.rings], grid);
      const area = grid.pixelWidth * grid.pixelHeight;
      const ours = new Map<string, number>();
      w.fraction.forEach((f, i) => { if (f > 0) ours.set(key(w.row0 + Math.floor(i / w.width), w.col0 + (i % w.width)), f); });
      expect(ours.size).toBe(c.areas.length);
      for (const [r, col, a] of c.areas) expect(Math.abs(ours.get(key(r, col))! - a / area), key(r, col)).toBeLessThan(1e-9);
    });

    it(`${c.name}: wholly inside with a ${fixture.buffer} m buffer matches Shapely`, () => {
      const ours = chosen(patchPixels([c.rings], grid, { kind: 'inside', buffer: fixture.buffer }));
      expect(ours).toEqual(keys(c.insideBuffered));
      // The chord-approximated inner buffer lies inside the true one, so it can only keep fewer.
      expect(keys(c.insideBufferedChords).every((k) => ours.includes(k))).toBe(true);
    });
  }
});
