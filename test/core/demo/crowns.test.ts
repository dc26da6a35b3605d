import { describe, expect, it } from 'vitest';
import { ringSignedArea } from '../../../src/core/geometry/measure.ts';
import { Random } from '../../../src/core/random.ts';
import { crownContains, crownOutline, crownSpectrum, placeCrowns, type Crown } from '../../../src/core/demo/crowns.ts';
import { fractalNoise, valueNoise } from '../../../src/core/demo/noise.ts';
import { purityCounts } from '../../../src/core/demo/purity.ts';
import { crownOwnership, panPixelCentre, shadowLength, shadowMask } from '../../../src/core/demo/rasterize.ts';
import { SCENE_DATES, sceneGrid, sunDirection } from '../../../src/core/demo/scene.ts';
import { speciesSpectra } from '../../../src/core/demo/spectra.ts';
import { buildTerrain, groundAt } from '../../../src/core/demo/terrain.ts';

// The pieces under the demo scene: crown shapes, masks, purity counting and placement.

const grid = sceneGrid(256);
const [x0, y0] = [grid.originX, grid.originY];

function crown(index: number, over: Partial<Crown> = {}): Crown {
  return {
    index, id: `C${index + 1}`, species: 'ABFI', cx: x0 + 30, cy: y0 - 30, radius: 2,
    wobble: [{ k: 2, amplitude: 0.05, phase: 0.3 }, { k: 3, amplitude: 0.04, phase: 1 }, { k: 4, amplitude: 0.02, phase: 2 }],
    height: 6, condition: 'healthy', browning: 0, brightness: 1, jitter: new Array(8).fill(0), ...over,
  };
}

describe('crown shapes', () => {
  it('has the area of its polar curve, (pi r^2)(1 + sum a_k^2 / 2)', () => {
    // Area inside r(theta) = (1/2) * integral of r^2 d theta over a turn (calculus,
    // common practice); the harmonic cross terms integrate to zero.
    const c = crown(0);
    const expected = Math.PI * 4 * (1 + (0.05 ** 2 + 0.04 ** 2 + 0.02 ** 2) / 2);
    const ring = crownOutline(c, 2048);
    expect(ringSignedArea(ring)).toBeCloseTo(expected, 4);
    expect(ringSignedArea(crownOutline(c))).toBeGreaterThan(0); // counterclockwise
  });

  it('contains exactly the points inside its outline curve', () => {
    const c = crown(0);
    expect(crownContains(c, c.cx, c.cy)).toBe(true);
    expect(crownContains(c, c.cx + 2.5, c.cy)).toBe(false);
    // Along each direction, inside just short of r(theta) and outside just past it.
    for (const [x, y] of crownOutline(c, 64).slice(0, 64)) {
      const dx = x - c.cx;
      const dy = y - c.cy;
      expect(crownContains(c, c.cx + dx * 0.999, c.cy + dy * 0.999)).toBe(true);
      expect(crownContains(c, c.cx + dx * 1.001, c.cy + dy * 1.001)).toBe(false);
    }
  });

  it('mixes towards brown foliage with browning and scales by brightness', () => {
    const healthy = crownSpectrum(crown(0), 'early');
    expect(healthy[6]).toBeCloseTo(1900 * speciesSpectra.ABFI.early[6], 9);
    const brighter = crownSpectrum(crown(0, { brightness: 1.1 }), 'early');
    brighter.forEach((v, b) => expect(v).toBeCloseTo(1.1 * healthy[b], 9));
    const brown = crownSpectrum(crown(0, { browning: 0.8, condition: 'brown' }), 'early');
    expect(brown[4]).toBeGreaterThan(healthy[4]); // more red
    expect(brown[6]).toBeLessThan(healthy[6]); // less NIR
  });
});

describe('crown masks', () => {
  it('puts the taller of two overlapping crowns on top, whatever the order given', () => {
    const low = crown(0, { height: 2 });
    const tall = crown(1, { cx: x0 + 32, height: 9 });
    for (const list of [[low, tall], [tall, low]]) {
      const owner = crownOwnership(grid, list);
      // A pixel in the overlap, at x0 + 31 m.
      const px = Math.floor(31 / grid.panPixel);
      const py = Math.floor(30 / grid.panPixel);
      expect(owner[py * grid.size + px]).toBe(2);
      // Far left of the low crown only.
      expect(owner[py * grid.size + Math.floor(28.6 / grid.panPixel)]).toBe(1);
      expect(owner[0]).toBe(0);
    }
  });

  it('casts shadows away from the sun, never on the sunward side', () => {
    const c = crown(0);
    const date = SCENE_DATES.late;
    const mask = shadowMask(grid, [c], date);
    const [sx, sy] = sunDirection(date);
    const length = shadowLength(c, date);
    expect(length).toBeCloseTo(6 / Math.tan((43 * Math.PI) / 180), 9);
    let sunward = 0;
    let farthest = 0;
    for (let py = 0; py < grid.size; py++) {
      for (let px = 0; px < grid.size; px++) {
        if (!mask[py * grid.size + px]) continue;
        const [x, y] = panPixelCentre(grid, px, py);
        const along = -((x - c.cx) * sx + (y - c.cy) * sy);
        if (along < 0 && !crownContains(c, x, y)) sunward++;
        farthest = Math.max(farthest, along);
      }
    }
    expect(sunward).toBe(0);
    expect(farthest).toBeGreaterThan(length);
    expect(farthest).toBeLessThan(length + 1);
  });

  it('counts pure multispectral pixels as those whose 16 sub-pixels share one crown', () => {
    const small = sceneGrid(64);
    const owner = new Int32Array(64 * 64);
    // Crown 1 fills multispectral pixel (0, 0) and one sub-pixel of (1, 0).
    for (let y = 0; y < 4; y++) for (let x = 0; x < 4; x++) owner[y * 64 + x] = 1;
    owner[4] = 1;
    // Crown 2 fills pixel (2, 0) except one sub-pixel, which crown 1 holds.
    for (let y = 0; y < 4; y++) for (let x = 8; x < 12; x++) owner[y * 64 + x] = 2;
    owner[8] = 1;
    const counts = purityCounts(small, owner, 2);
    expect(counts.pure).toBe(1);
    expect(Array.from(counts.pureByCrown)).toEqual([1, 0]);
    expect(Array.from(counts.touchedByCrown)).toEqual([3, 1]);
    expect(counts.touched).toBe(3);
  });
});

describe('crown placement', () => {
  const big = sceneGrid(1024);
  const terrain = buildTerrain(big, 77);
  const crowns = placeCrowns(big, terrain, new Random(77));

  it('stands every crown on tundra, wholly inside the scene', () => {
    expect(crowns.length).toBeGreaterThan(200);
    for (const c of crowns) {
      const ground = groundAt(terrain, 'early', (c.cx - big.originX) / big.msPixel, (big.originY - c.cy) / big.msPixel);
      expect(ground.material).toBe('tundra');
      expect(c.cx - c.radius * 1.2).toBeGreaterThanOrEqual(big.originX);
      expect(c.cy + c.radius * 1.2).toBeLessThanOrEqual(big.originY);
    }
  });

  it('clumps some crowns so they touch or overlap, and keeps the rest apart', () => {
    let touching = 0;
    let closest = Infinity;
    for (let i = 0; i < crowns.length; i++) {
      for (let j = i + 1; j < crowns.length; j++) {
        const ratio = Math.hypot(crowns[i].cx - crowns[j].cx, crowns[i].cy - crowns[j].cy) / (crowns[i].radius + crowns[j].radius);
        closest = Math.min(closest, ratio);
        if (ratio < 1) touching++;
      }
    }
    // No two crowns closer than 0.72 of their summed radii: clumps, not stacks.
    expect(closest).toBeGreaterThanOrEqual(0.72 - 1e-9);
    expect(touching).toBeGreaterThan(crowns.length * 0.05);
  });

  it('varies crowns within a species: stressed and brown ones among the healthy', () => {
    const conditions = new Set(crowns.map((c) => c.condition));
    expect([...conditions].sort()).toEqual(['brown', 'healthy', 'stressed']);
    expect(crowns.filter((c) => c.condition === 'healthy').length / crowns.length).toBeGreaterThan(0.7);
  });
});

describe('value noise', () => {
  it('stays in [0, 1), is continuous and repeats for the same inputs', () => {
    let worstStep = 0;
    for (let i = 0; i < 2000; i++) {
      const x = i * 0.013;
      const v = valueNoise(5, x, 3.3);
      expect(v >= 0 && v < 1).toBe(true);
      worstStep = Math.max(worstStep, Math.abs(valueNoise(5, x + 1e-4, 3.3) - v));
    }
    expect(worstStep).toBeLessThan(1e-3);
    expect(fractalNoise(5, 0.2, 0.7, 0.1, 4)).toBe(fractalNoise(5, 0.2, 0.7, 0.1, 4));
  });
});
