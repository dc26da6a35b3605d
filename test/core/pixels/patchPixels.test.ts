import { describe, expect, it } from 'vitest';
import type { RasterGrid } from '../../../src/core/geometry/rasterGrid.ts';
import type { Ring } from '../../../src/core/geometry/types.ts';
import { innerRadius, patchPixels, segmentToBoxDistance } from '../../../src/core/pixels/patchPixels.ts';
import { countPixels } from '../../../src/core/pixels/pixelCounts.ts';
import { ruleProblem } from '../../../src/core/pixels/rule.ts';
import { Random } from '../../../src/core/random.ts';

// The three rules on shapes whose answer follows from elementary geometry: a convex
// polygon shrunk by b is the set of points at least b from every edge line, so a pixel
// lies in a shrunk rectangle exactly when its four corners do (convexity).

const unit: RasterGrid = { originX: 0, originY: 10, pixelWidth: 1, pixelHeight: 1, width: 10, height: 10 };
const square = (x: number, y: number, s: number): Ring => [[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]];
const cells = (p: { rows: Int32Array; cols: Int32Array }) => Array.from(p.rows, (r, i) => `${r},${p.cols[i]}`);

describe('wholly inside, with and without a buffer', () => {
  it('keeps the pixels of a square shrunk by the buffer, touching allowed', () => {
    const patch = [[square(0, 0, 4)]];
    expect(patchPixels(patch, unit, { kind: 'inside', buffer: 0 }).rows.length).toBe(16);
    // Shrunk by 0.5: [0.5, 3.5]², which holds pixels [1, 3]² whole.
    expect(cells(patchPixels(patch, unit, { kind: 'inside', buffer: 0.5 }))).toEqual(['7,1', '7,2', '8,1', '8,2']);
    // Shrunk by exactly 1: [1, 3]², the same four pixels, their edges on the shrunk edge.
    expect(patchPixels(patch, unit, { kind: 'inside', buffer: 1 }).rows.length).toBe(4);
    expect(patchPixels(patch, unit, { kind: 'inside', buffer: 1.01 }).rows.length).toBe(0);
  });

  it('rounds the shrink at a reflex corner: distance to the corner point counts', () => {
    // An L: [0,6]² less [3,6]²; the reflex corner is (3, 3). Pixel [1,2]x[3.., ] etc.
    const ring: Ring = [[0, 0], [6, 0], [6, 3], [3, 3], [3, 6], [0, 6], [0, 0]];
    const kept = new Set(cells(patchPixels([[ring]], unit, { kind: 'inside', buffer: 0.9 })));
    // Pixel x [2,3], y [2,3] touches the reflex corner: out. Pixel x [1,2], y [1,2] is
    // 1 from the corner, at least 1 from every edge: in.
    expect(kept.has(`${10 - 3},2`)).toBe(false);
    expect(kept.has(`${10 - 2},1`)).toBe(true);
    // Pixel x [4,5], y [1,2]: 1 from y = 3, 1 from x = 6, 1 from y = 0: in.
    expect(kept.has(`${10 - 2},4`)).toBe(true);
  });

  it('agrees with the corner test on random rotated rectangles', () => {
    const random = new Random(5);
    const g: RasterGrid = { originX: 500000, originY: 4200040, pixelWidth: 1.2, pixelHeight: 1.2, width: 40, height: 40 };
    let kept = 0;
    for (let t = 0; t < 80; t++) {
      const cx = 500024 + random.uniform(-3, 3), cy = 4200016 + random.uniform(-3, 3);
      const a = random.uniform(2, 15), b = random.uniform(2, 15), angle = random.uniform(0, Math.PI);
      const buffer = random.uniform(0, 1);
      const ca = Math.cos(angle), sa = Math.sin(angle);
      const ring: Ring = [[-a / 2, -b / 2], [a / 2, -b / 2], [a / 2, b / 2], [-a / 2, b / 2], [-a / 2, -b / 2]]
        .map(([u, v]) => [cx + u * ca - v * sa, cy + u * sa + v * ca]);
      const ours = new Set(cells(patchPixels([[ring]], g, { kind: 'inside', buffer })));
      // Reference: every corner of the pixel in the rectangle's own frame within a/2 - b, b/2 - b.
      for (let r = 0; r < g.height; r++) {
        for (let c = 0; c < g.width; c++) {
          const x0 = g.originX + c * 1.2, y1 = g.originY - r * 1.2;
          const inside = [[x0, y1], [x0 + 1.2, y1], [x0, y1 - 1.2], [x0 + 1.2, y1 - 1.2]].every(([x, y]) => {
            const u = (x - cx) * ca + (y - cy) * sa, v = -(x - cx) * sa + (y - cy) * ca;
            return Math.abs(u) <= a / 2 - buffer + 1e-9 && Math.abs(v) <= b / 2 - buffer + 1e-9;
          });
          expect(ours.has(`${r},${c}`), `rectangle ${t} pixel ${r},${c}`).toBe(inside);
          if (inside) kept++;
        }
      }
    }
    expect(kept).toBeGreaterThan(500);
  });

  it('measures segment-to-box distance at the nearest vertex', () => {
    expect(segmentToBoxDistance([3, 0], [3, 5], 0, 0, 1, 1)).toBe(2);
    expect(segmentToBoxDistance([2, 3], [3, 2], 0, 0, 1, 1)).toBeCloseTo(3 / Math.SQRT2, 12) // corner (1, 1) to the line x + y = 5;
    expect(segmentToBoxDistance([0.5, 0.5], [0.5, 0.5], 0, 0, 1, 1)).toBe(0);
  });
});

describe('centre inside and least cover', () => {
  it('takes the pixels whose centres are below a triangle\'s hypotenuse', () => {
    // Triangle (0,0) (4.2,0) (0,4.2): centre (c + 0.5, y + 0.5) inside when c + y + 1 < 4.2
    // (no centre lies on the hypotenuse, so no tie decides).
    const tri: Ring = [[0, 0], [4.2, 0], [0, 4.2], [0, 0]];
    const got = cells(patchPixels([[tri]], unit, { kind: 'centre' })).sort();
    const want: string[] = [];
    for (let c = 0; c < 5; c++) for (let y = 0; y < 5; y++) if (c + y + 1 < 4.2) want.push(`${9 - y},${c}`);
    expect(want).toHaveLength(10);
    expect(got).toEqual(want.sort());
  });

  it('takes pixels at or above the least cover, none of the untouched', () => {
    const tri: Ring = [[0, 0], [4, 0], [0, 4], [0, 0]];
    expect(patchPixels([[tri]], unit, { kind: 'cover', minCover: 0.5 }).rows.length).toBe(10); // 6 whole + 4 halves
    expect(patchPixels([[tri]], unit, { kind: 'cover', minCover: 0.6 }).rows.length).toBe(6);
    expect(patchPixels([[tri]], unit, { kind: 'cover', minCover: 1 }).rows.length).toBe(6);
    const half = patchPixels([[square(0.5, 0.5, 1)]], unit, { kind: 'cover', minCover: 0.25 });
    expect(Array.from(half.fractions)).toEqual([0.25, 0.25, 0.25, 0.25]);
  });

  it('refuses rules that make no sense', () => {
    expect(ruleProblem({ kind: 'inside', buffer: -1 })).toMatch(/buffer/);
    expect(ruleProblem({ kind: 'cover', minCover: 0 })).toMatch(/share/);
    expect(ruleProblem({ kind: 'cover', minCover: 1.5 })).toMatch(/share/);
    expect(ruleProblem({ kind: 'centre' })).toBeNull();
  });
});

describe('counts per patch and per species', () => {
  const patches = [
    { id: 'a', species: 'pice', rings: [[square(0, 0, 4)]] },
    { id: 'b', species: 'pice', rings: [[square(5, 5, 3)]] },
    { id: 'c', species: 'salx', rings: [[square(0, 6, 0.8)]] },
    { id: 'd', species: 'salx', rings: [[square(30, 30, 2)]] },
  ];

  it('sums per species and says why a patch has none', () => {
    const report = countPixels(patches, unit, { kind: 'inside', buffer: 0.5 });
    expect(report.patches.map((p) => p.pure)).toEqual([4, 1, 0, 0]);
    expect(report.classes).toEqual({ pice: 5, salx: 0 });
    expect(report.messages).toHaveLength(2);
    expect(report.messages[0]).toMatch(/^patch c: the 0.5 m buffer is wider than the patch \(its widest inner circle has a radius of 0.40 m\)/);
    expect(report.messages[1]).toBe('patch d: lies off the raster grid: no pixels');
  });

  it('does not blame the buffer when the patch is wide enough but misaligned', () => {
    // A 1.4 m square, shrunk by 0.1 to 1.2 m: wider than the buffer, but holding no whole pixel.
    const report = countPixels([{ id: 'e', species: 'x', rings: [[square(0.3, 0.3, 1.4)]] }], unit, { kind: 'inside', buffer: 0.1 });
    expect(report.patches[0].pure).toBe(0);
    expect(report.messages).toEqual([]);
    expect(innerRadius([[square(0.3, 0.3, 1.4)]])).toBeCloseTo(0.7, 2);
  });

  it('leaves out no-data pixels and reports them', () => {
    const noData = (row: number, col: number) => row === 7 && col === 1;
    const report = countPixels(patches.slice(0, 1), unit, { kind: 'inside', buffer: 0.5 }, noData);
    expect(report.patches[0]).toMatchObject({ pure: 3, noData: 1 });
    expect(report.classes).toEqual({ pice: 3 });
    expect(report.messages).toEqual(['patch a: 1 of its 4 chosen pixel(s) hold no data in the scene and are left out']);
  });
});
