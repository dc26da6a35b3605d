import GeometryFactory from 'jsts/org/locationtech/jts/geom/GeometryFactory.js';
import GeoJSONReader from 'jsts/org/locationtech/jts/io/GeoJSONReader.js';
import OverlayOp from 'jsts/org/locationtech/jts/operation/overlay/OverlayOp.js';
import { describe, expect, it } from 'vitest';
import type { RasterGrid } from '../../../src/core/geometry/rasterGrid.ts';
import { multiPolygonArea } from '../../../src/core/geometry/measure.ts';
import type { MultiPolygonRings, Ring } from '../../../src/core/geometry/types.ts';
import { coverageWindow, type CoverageWindow } from '../../../src/core/pixels/coverage.ts';
import { Random } from '../../../src/core/random.ts';

// Exact coverage fractions against cases worked by hand (area formulas of squares,
// triangles and rectangles: elementary geometry) and against JSTS 2.12.1 (npm)
// polygon intersection areas, pixel by pixel.

const unit: RasterGrid = { originX: 0, originY: 10, pixelWidth: 1, pixelHeight: 1, width: 10, height: 10 };
const square = (x: number, y: number, s: number): Ring => [[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]];
/** Fraction of the pixel at grid row r, column c, or 0 outside the window. */
const at = (w: CoverageWindow, r: number, c: number) =>
  r < w.row0 || c < w.col0 || r >= w.row0 + w.height || c >= w.col0 + w.width ? 0 : w.fraction[(r - w.row0) * w.width + (c - w.col0)];
const sum = (w: CoverageWindow) => w.fraction.reduce((a, b) => a + b, 0);

function rotatedRectangle(cx: number, cy: number, a: number, b: number, angle: number): Ring {
  const ca = Math.cos(angle), sa = Math.sin(angle);
  const corners = [[-a / 2, -b / 2], [a / 2, -b / 2], [a / 2, b / 2], [-a / 2, b / 2]];
  const ring = corners.map(([u, v]) => [cx + u * ca - v * sa, cy + u * sa + v * ca] as [number, number]);
  ring.push(ring[0]);
  return ring;
}

describe('coverage fractions, worked by hand', () => {
  it('gives a square offset by half a pixel quarters, halves and wholes', () => {
    // Square [1.5, 4.5]²: corner pixels a quarter, edge pixels half, inner pixels whole.
    const w = coverageWindow([[square(1.5, 1.5, 3)]], unit);
    expect([w.width, w.height]).toEqual([4, 4]);
    // y = 4.5 is 5.5 rows below the top at 10: rows 5..8, columns 1..4.
    expect(at(w, 5, 1)).toBeCloseTo(0.25, 12);
    expect(at(w, 5, 2)).toBeCloseTo(0.5, 12);
    expect(at(w, 6, 2)).toBe(1);
    expect(at(w, 8, 4)).toBeCloseTo(0.25, 12);
    expect(sum(w)).toBeCloseTo(9, 10);
  });

  it('halves the pixels along a right triangle\'s hypotenuse', () => {
    // Triangle (0,0) (4,0) (0,4): the line x + y = 4 runs through pixel corners, so the
    // pixels it crosses are cut in half along their diagonal; those below it are whole.
    const w = coverageWindow([[[[0, 0], [4, 0], [0, 4], [0, 0]]]], unit);
    for (let r = 6; r <= 9; r++) {
      for (let c = 0; c <= 3; c++) {
        const yBottom = 10 - r - 1;
        const expected = c + yBottom < 3 ? 1 : c + yBottom === 3 ? 0.5 : 0;
        expect(at(w, r, c), `row ${r} col ${c}`).toBeCloseTo(expected, 12);
      }
    }
    expect(sum(w)).toBeCloseTo(8, 12);
  });

  it('cuts a corner off a pixel as a triangle of area 1/2 · 0.5²', () => {
    // The line x + y = 1.5 across pixel [0,1]²: the corner above it is a right triangle
    // with legs 0.5, so the pixel is 1 - 0.125 covered.
    const w = coverageWindow([[[[0, 0], [1.5, 0], [0, 1.5], [0, 0]]]], unit);
    expect(at(w, 9, 0)).toBeCloseTo(0.875, 12);
    expect(at(w, 9, 1)).toBeCloseTo(0.125, 12);
    expect(at(w, 8, 0)).toBeCloseTo(0.125, 12);
  });

  it('gives a rotated rectangle inside one pixel its area, at any angle', () => {
    const g: RasterGrid = { ...unit, pixelWidth: 2, pixelHeight: 2, originY: 20 };
    for (const angle of [0, 0.3, Math.PI / 4, 1.2, 2.9]) {
      const w = coverageWindow([[rotatedRectangle(3, 13, 1.2, 0.5, angle)]], g);
      expect(at(w, 3, 1)).toBeCloseTo((1.2 * 0.5) / 4, 12);
    }
  });

  it('splits a diamond centred on a pixel corner into four equal halves', () => {
    // |x - 5| + |y - 5| <= 1 has area 2; each of the four pixels meeting at (5, 5) holds a quarter.
    const w = coverageWindow([[[[4, 5], [5, 4], [6, 5], [5, 6], [4, 5]]]], unit);
    for (const [r, c] of [[4, 4], [4, 5], [5, 4], [5, 5]]) expect(at(w, r, c)).toBeCloseTo(0.5, 12);
    expect(sum(w)).toBeCloseTo(2, 12);
  });

  it('leaves a hole empty, whatever the windings', () => {
    const shell = square(0, 0, 6), hole = square(2, 2, 2);
    for (const rings of [[shell, hole], [shell, [...hole].reverse()], [[...shell].reverse(), hole]]) {
      const w = coverageWindow([rings], unit);
      expect(at(w, 6, 2)).toBe(0);
      expect(at(w, 7, 3)).toBe(0);
      expect(at(w, 9, 0)).toBe(1);
      expect(sum(w)).toBeCloseTo(32, 12);
    }
  });

  it('counts only the pixels that exist: a patch over the grid edge', () => {
    const w = coverageWindow([[square(-5, -5, 30)]], unit);
    expect([w.row0, w.col0, w.width, w.height]).toEqual([0, 0, 10, 10]);
    expect(sum(w)).toBe(100);
    expect(coverageWindow([[square(20, 20, 3)]], unit).width).toBe(0);
    // Partly off to the left: the pixels left inside still get their share.
    const part = coverageWindow([[square(-0.5, 2.25, 1)]], unit);
    // Half its width lies on the grid: rows 6 and 7 hold 0.25 and 0.75 of its height.
    expect(at(part, 6, 0)).toBeCloseTo(0.5 * 0.25, 12);
    expect(at(part, 7, 0)).toBeCloseTo(0.5 * 0.75, 12);
  });
});

const reader = new GeoJSONReader(new GeometryFactory());

/** JSTS intersection area of the outline with one pixel square, over the pixel's area. */
function jstsFraction(parts: MultiPolygonRings, grid: RasterGrid, r: number, c: number): number {
  const patch = reader.read({ type: 'MultiPolygon', coordinates: parts });
  const x0 = grid.originX + c * grid.pixelWidth, y1 = grid.originY - r * grid.pixelHeight;
  const cell = reader.read({ type: 'Polygon', coordinates: [square(x0, y1 - grid.pixelHeight, grid.pixelWidth).map((p) => [p[0], p[1]])] });
  return OverlayOp.intersection(patch, cell).getArea() / (grid.pixelWidth * grid.pixelHeight);
}

function crown(random: Random, cx: number, cy: number, r: number): Ring {
  const k = 5 + Math.floor(random.next() * 20);
  const ring: Ring = [];
  for (let i = 0; i < k; i++) {
    const a = (2 * Math.PI * i) / k;
    const rr = r * random.uniform(0.6, 1.2);
    ring.push([cx + rr * Math.cos(a), cy + rr * Math.sin(a)]);
  }
  ring.push(ring[0]);
  return ring;
}

describe('coverage fractions against JSTS intersection areas', () => {
  const grid: RasterGrid = { originX: 600000, originY: 5100030, pixelWidth: 1.2, pixelHeight: 1.2, width: 25, height: 25 };

  it('matches on random crown outlines with and without holes, to 1e-9 of a pixel', () => {
    const random = new Random(11);
    for (let t = 0; t < 25; t++) {
      const cx = 600015 + random.uniform(-2, 2), cy = 5100015 + random.uniform(-2, 2);
      const r = random.uniform(1, 8);
      const rings: Ring[] = [crown(random, cx, cy, r)];
      if (t % 3 === 0) rings.push(crown(random, cx, cy, r * 0.3).reverse());
      const w = coverageWindow([rings], grid);
      for (let i = 0; i < w.fraction.length; i++) {
        const row = w.row0 + Math.floor(i / w.width), col = w.col0 + (i % w.width);
        expect(Math.abs(w.fraction[i] - jstsFraction([rings], grid, row, col)), `outline ${t} pixel ${row},${col}`).toBeLessThan(1e-9);
      }
      expect(sum(w) * 1.44).toBeCloseTo(multiPolygonArea([rings]), 6);
    }
  });

  it('is unchanged by reversing the rings or starting them elsewhere', () => {
    const random = new Random(3);
    const ring = crown(random, 600012, 5100012, 6);
    const base = coverageWindow([[ring]], grid).fraction;
    const reversed = coverageWindow([[[...ring].reverse()]], grid).fraction;
    const open = ring.slice(0, -1);
    const shifted = [...open.slice(5), ...open.slice(0, 5)];
    shifted.push(shifted[0]);
    const restarted = coverageWindow([[shifted]], grid).fraction;
    for (let i = 0; i < base.length; i++) {
      expect(reversed[i]).toBeCloseTo(base[i], 12);
      expect(restarted[i]).toBeCloseTo(base[i], 12);
    }
  });
});
