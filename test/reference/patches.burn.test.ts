import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { burnOutline, packColour, type PixelFrame } from '../../src/ui/map/rasterOutlines.ts';
import type { MultiPolygonRings } from '../../src/core/geometry/types.ts';

// The far view's pixel burning against GDAL 3.6.2's gdal_rasterize (default rule: a
// pixel is burnt when its centre is inside; holes left out), computed once by
// fixtures/patches/make_burn.sh into burn.json: three outlines on a 20 x 20 grid of
// 1 m pixels, one with a hole. Every pixel must agree.

const fixture = JSON.parse(readFileSync(join(import.meta.dirname, 'fixtures', 'patches', 'burn.json'), 'utf8')) as {
  frame: PixelFrame;
  outlines: MultiPolygonRings[number][];
  mask: number[][];
};

describe('burnOutline against gdal_rasterize', () => {
  it('burns the same pixels as GDAL for each outline', () => {
    const { frame } = fixture;
    const pixels = new Uint32Array(frame.width * frame.height);
    fixture.outlines.forEach((rings, i) => burnOutline(pixels, frame, [rings], i + 1));
    const ours = [...Array(frame.height).keys()].map((r) => [...pixels.slice(r * frame.width, (r + 1) * frame.width)]);
    expect(ours).toEqual(fixture.mask);
  });

  it('marks a crown too small for any pixel centre with the pixel under its middle', () => {
    const frame: PixelFrame = { left: 0, top: 10, resolution: 1, width: 10, height: 10 };
    const pixels = new Uint32Array(100);
    const tiny: MultiPolygonRings = [[[[3.6, 6.6], [3.9, 6.6], [3.9, 6.9], [3.6, 6.9], [3.6, 6.6]]]];
    expect(burnOutline(pixels, frame, tiny, 7)).toBe(1);
    expect(pixels[3 * 10 + 3]).toBe(7);
  });

  it('draws a rim round the box and packs colours as RGBA words', () => {
    const frame: PixelFrame = { left: 0, top: 10, resolution: 1, width: 10, height: 10 };
    const pixels = new Uint32Array(100);
    const square: MultiPolygonRings = [[[[2, 2], [7, 2], [7, 7], [2, 7], [2, 2]]]];
    expect(burnOutline(pixels, frame, square, 5, 9)).toBe(25);
    expect(pixels[2 * 10 + 1]).toBe(9);
    expect(pixels[5 * 10 + 5]).toBe(5);
    // Little-endian RGBA: red in the low byte, alpha in the high byte.
    expect(packColour('#0072B2', 255)).toBe((255 << 24 | 0xb2 << 16 | 0x72 << 8 | 0x00) >>> 0);
    expect(packColour('not a colour', 0)).toBe((187 << 16 | 187 << 8 | 187) >>> 0);
  });
});
