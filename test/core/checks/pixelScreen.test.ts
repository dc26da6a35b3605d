import { describe, expect, it } from 'vitest';
import { middlePixelIsPure, noPixelFitsInBox } from '../../../src/core/checks/pixelScreen.ts';
import { extentOfRings } from '../../../src/core/geometry/measure.ts';
import { coverageWindow } from '../../../src/core/pixels/coverage.ts';
import type { RasterGrid } from '../../../src/core/geometry/rasterGrid.ts';
import type { Ring } from '../../../src/core/geometry/types.ts';
import { Random } from '../../../src/core/random.ts';

// The quick pure-pixel screen may only say "pure" for a pixel the exact coverage
// (src/core/pixels/coverage.ts, itself checked against GDAL and JSTS in
// test/reference/pixels.fixtures.test.ts) finds wholly covered.

const grid: RasterGrid = { originX: 600000, originY: 5100100, pixelWidth: 1.2, pixelHeight: 1.2, width: 100, height: 100 };

function crown(random: Random, r: number): Ring {
  const k = 5 + Math.floor(random.next() * 20);
  const cx = 600000 + random.uniform(20, 100), cy = 5100000 + random.uniform(20, 80);
  const ring: Ring = [];
  for (let i = 0; i < k; i++) {
    const a = (2 * Math.PI * i) / k;
    const rr = r * random.uniform(0.6, 1.2);
    ring.push([cx + rr * Math.cos(a), cy + rr * Math.sin(a)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

describe('middlePixelIsPure', () => {
  it('says pure only where the exact coverage finds the middle pixel wholly covered', () => {
    const random = new Random(5);
    let said = 0;
    for (let t = 0; t < 2000; t++) {
      const ring = crown(random, random.uniform(0.5, 5));
      const box = extentOfRings([ring]);
      if (!middlePixelIsPure([[ring]], box, grid)) continue;
      said++;
      const col = Math.floor(((box[0] + box[2]) / 2 - grid.originX) / grid.pixelWidth);
      const row = Math.floor((grid.originY - (box[1] + box[3]) / 2) / grid.pixelHeight);
      const cover = coverageWindow([[ring]], grid);
      expect(cover.fraction[(row - cover.row0) * cover.width + (col - cover.col0)]).toBeGreaterThanOrEqual(1 - 1e-9);
    }
    expect(said).toBeGreaterThan(800);
  });

  it('does not call a pixel with a hole over it, or off the grid, pure', () => {
    const shell: Ring = [[600010, 5100010], [600030, 5100010], [600030, 5100030], [600010, 5100030], [600010, 5100010]];
    // A hole round the middle (600020, 5100020) covering its pixel.
    const hole: Ring = [[600018, 5100018], [600018, 5100022], [600022, 5100022], [600022, 5100018], [600018, 5100018]];
    expect(middlePixelIsPure([[shell]], extentOfRings([shell]), grid)).toBe(true);
    expect(middlePixelIsPure([[shell, hole]], extentOfRings([shell]), grid)).toBe(false);
    const off = shell.map(([x, y]) => [x - 1000, y] as [number, number]);
    expect(middlePixelIsPure([[off]], extentOfRings([off]), grid)).toBe(false);
  });
});

describe('noPixelFitsInBox', () => {
  it('says "none" only for patches whose exact coverage has no wholly covered pixel', () => {
    const random = new Random(8);
    let said = 0;
    for (let t = 0; t < 3000; t++) {
      const ring = crown(random, random.uniform(0.4, 2.5));
      if (!noPixelFitsInBox(extentOfRings([ring]), grid)) continue;
      said++;
      const cover = coverageWindow([[ring]], grid);
      expect(cover.fraction.every((f) => f < 1 - 1e-9)).toBe(true);
    }
    expect(said).toBeGreaterThan(600);
  });

  it('leaves a patch that covers one pixel exactly, or all but a sliver of it, to the exact count', () => {
    const x = grid.originX + 12 * grid.pixelWidth, y = grid.originY - 20 * grid.pixelHeight;
    const pixel: Ring = [[x, y], [x + 1.2, y], [x + 1.2, y + 1.2], [x, y + 1.2], [x, y]];
    expect(noPixelFitsInBox(extentOfRings([pixel]), grid)).toBe(false);
    const short: Ring = pixel.map(([px, py]) => [px === x ? x + 1e-6 : px, py] as [number, number]);
    expect(noPixelFitsInBox(extentOfRings([short]), grid)).toBe(false);
    // Short by a tenth of the pixel: nothing fits.
    const shorter: Ring = pixel.map(([px, py]) => [px === x ? x + 0.12 : px, py] as [number, number]);
    expect(noPixelFitsInBox(extentOfRings([shorter]), grid)).toBe(true);
  });
});
