import { describe, expect, it } from 'vitest';
import { measureOutline } from '../../../src/app/patches/liveMeasure.ts';
import type { RasterGrid } from '../../../src/core/geometry/rasterGrid.ts';
import type { MultiPolygonRings } from '../../../src/core/geometry/types.ts';

// Area and multispectral pixels of an outline while it is drawn, worked by hand on a
// 2 m grid at UTM-sized coordinates: a square on the pixel lines holds its pixels
// wholly; shifted by half a pixel it holds fewer wholly and touches more.

const grid: RasterGrid = { originX: 493000, originY: 4430000, pixelWidth: 2, pixelHeight: 2, width: 100, height: 100 };
const box = (x0: number, y0: number, size: number): MultiPolygonRings => [[[
  [x0, y0], [x0 + size, y0], [x0 + size, y0 + size], [x0, y0 + size], [x0, y0],
]]];

describe('measureOutline', () => {
  it('counts a 6 m square on the pixel lines as 9 whole pixels of 4 m²', () => {
    const m = measureOutline(box(493010, 4429980, 6), grid);
    expect(m.areaM2).toBeCloseTo(36, 9);
    expect(m.pixelAreaM2).toBe(4);
    expect(m.purePixels).toBe(9);
    expect(m.touchedPixels).toBe(9);
  });

  it('counts the same square half a pixel off as 4 whole and 16 touched', () => {
    // Shifted 1 m east and north: the 2 x 2 pixels in the middle lie wholly inside, the
    // ring of 12 around them is cut.
    const m = measureOutline(box(493011, 4429981, 6), grid);
    expect(m.areaM2).toBeCloseTo(36, 9);
    expect(m.purePixels).toBe(4);
    expect(m.touchedPixels).toBe(16);
  });

  it('gives the area alone without a multispectral grid', () => {
    const m = measureOutline(box(0, 0, 3), null);
    expect(m).toEqual({ areaM2: 9, purePixels: null, touchedPixels: null, pixelAreaM2: null });
  });

  it('counts nothing for an outline off the grid', () => {
    const m = measureOutline(box(0, 0, 3), grid);
    expect(m.purePixels).toBe(0);
    expect(m.touchedPixels).toBe(0);
  });
});
