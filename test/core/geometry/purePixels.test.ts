import GeometryFactory from 'jsts/org/locationtech/jts/geom/GeometryFactory.js';
import GeoJSONReader from 'jsts/org/locationtech/jts/io/GeoJSONReader.js';
import RelateOp from 'jsts/org/locationtech/jts/operation/relate/RelateOp.js';
import { describe, expect, it } from 'vitest';
import { countPurePixels } from '../../../src/core/geometry/purePixels.ts';
import type { RasterGrid } from '../../../src/core/geometry/rasterGrid.ts';
import type { MultiPolygonRings, Ring } from '../../../src/core/geometry/types.ts';
import { Random } from '../../../src/core/random.ts';

// Pure pixels against a brute-force reference: every cell of the grid tested with JSTS
// 2.12.1's relate (npm), DE-9IM "covers": a cell is pure when the patch covers its square.

const reader = new GeoJSONReader(new GeometryFactory());

function bruteForce(parts: MultiPolygonRings, grid: RasterGrid): number {
  const patch = reader.read({ type: 'MultiPolygon', coordinates: parts });
  let count = 0;
  for (let r = 0; r < grid.height; r++) {
    for (let c = 0; c < grid.width; c++) {
      const x0 = grid.originX + c * grid.pixelWidth, x1 = grid.originX + (c + 1) * grid.pixelWidth;
      const y1 = grid.originY - r * grid.pixelHeight, y0 = grid.originY - (r + 1) * grid.pixelHeight;
      const cell = reader.read({ type: 'Polygon', coordinates: [[[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]]] });
      if (RelateOp.relate(patch, cell).isCovers()) count++;
    }
  }
  return count;
}

const square = (x: number, y: number, s: number): Ring => [[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]];
const grid: RasterGrid = { originX: 600000, originY: 5100020, pixelWidth: 1.2, pixelHeight: 1.2, width: 17, height: 17 };

describe('countPurePixels', () => {
  it('counts a pixel whose edges the outline follows exactly', () => {
    const g: RasterGrid = { originX: 0, originY: 10, pixelWidth: 1, pixelHeight: 1, width: 10, height: 10 };
    expect(countPurePixels([[square(0, 0, 1)]], g)).toBe(1);
    expect(countPurePixels([[square(0, 0, 2)]], g)).toBe(4);
    expect(countPurePixels([[square(0.5, 0.5, 2)]], g)).toBe(1);
    expect(countPurePixels([[square(0.5, 0.5, 1.4)]], g)).toBe(0);
    expect(countPurePixels([[square(0.5, 0.5, 1.9)]], g)).toBe(1);
    // Pixels off the raster do not exist: a patch covering it all counts the raster's 100.
    expect(countPurePixels([[square(-5, -5, 30)]], g)).toBe(100);
    expect(countPurePixels([[square(20, 20, 3)]], g)).toBe(0);
  });

  it('leaves out pixels under a hole', () => {
    const g: RasterGrid = { originX: 0, originY: 10, pixelWidth: 1, pixelHeight: 1, width: 10, height: 10 };
    expect(countPurePixels([[square(0, 0, 6), square(2, 2, 2).reverse()]], g)).toBe(32);
  });

  it('stops early once it has enough', () => {
    const g: RasterGrid = { originX: 0, originY: 10, pixelWidth: 1, pixelHeight: 1, width: 10, height: 10 };
    expect(countPurePixels([[square(0, 0, 10)]], g, 3)).toBe(3);
  });

  // The brute force relates every cell with JSTS: slow on a busy machine, so a wide limit.
  it('matches a brute-force JSTS covers test on random crown outlines', { timeout: 60_000 }, () => {
    const random = new Random(42);
    for (let t = 0; t < 60; t++) {
      const cx = 600010 + random.uniform(-2, 2);
      const cy = 5100010 + random.uniform(-2, 2);
      const r = random.uniform(0.5, 7);
      const k = 5 + Math.floor(random.next() * 20);
      const ring: Ring = [];
      for (let i = 0; i < k; i++) {
        const a = (2 * Math.PI * i) / k;
        const rr = r * random.uniform(0.6, 1.2);
        ring.push([cx + rr * Math.cos(a), cy + rr * Math.sin(a)]);
      }
      ring.push(ring[0]);
      expect(countPurePixels([[ring]], grid), `outline ${t}`).toBe(bruteForce([[ring]], grid));
    }
  });

  it('matches brute force on outlines drawn along pixel edges', { timeout: 60_000 }, () => {
    const random = new Random(7);
    for (let t = 0; t < 30; t++) {
      // Rectilinear outlines on the grid lines (and half-way between), the hardest ties.
      // Positions are computed as the reference computes cell corners, so both see the
      // same numbers: at(k) is the k-th half-pixel line.
      const atX = (k: number) => grid.originX + (k / 2) * grid.pixelWidth;
      const atY = (k: number) => grid.originY - (k / 2) * grid.pixelHeight;
      const kx = Math.floor(random.next() * 10), ky = 4 + Math.floor(random.next() * 10);
      // An L shape: a kw x kh rectangle of half-pixels with one corner cut out.
      const kw = 2 + Math.floor(random.next() * 8), kh = 2 + Math.floor(random.next() * 8);
      const half = Math.floor(kw / 2), halfH = Math.floor(kh / 2);
      const ring: Ring = [[atX(kx), atY(ky + kh)], [atX(kx + kw), atY(ky + kh)], [atX(kx + kw), atY(ky)],
        [atX(kx + half), atY(ky)], [atX(kx + half), atY(ky + halfH)], [atX(kx), atY(ky + halfH)], [atX(kx), atY(ky + kh)]];
      expect(countPurePixels([[ring]], grid), `outline ${t}`).toBe(bruteForce([[ring]], grid));
    }
  });
});
