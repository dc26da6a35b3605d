// pixels.pure: pure pixels of 10,000 crown patches on a 4096 x 4096 multispectral grid
// (1.2 m pixels; the rule needs only the grid, so the band count, 8 here, does not
// enter), by the exact coverage rules, beside the baseline of clipping every pixel
// square of each bounding box against the polygon (Sutherland-Hodgman) for its area.
import type { RasterGrid } from '../src/core/geometry/rasterGrid.ts';
import type { MultiPolygonRings, Position, Ring } from '../src/core/geometry/types.ts';
import { countPixels, type PixelPatch } from '../src/core/pixels/pixelCounts.ts';
import type { PixelRule } from '../src/core/pixels/rule.ts';
import { result, seeded, time, type BenchResult, type Benchmark, type BenchSize } from './harness.ts';

const SIDE = 4096;
const PIXEL = 1.2;
const grid: RasterGrid = { originX: 600000, originY: 5100000 + SIDE * PIXEL, pixelWidth: PIXEL, pixelHeight: PIXEL, width: SIDE, height: SIDE };

/** Crowns 1-10 m across with 12-24 noisy vertices, scattered over the grid. */
function crowns(n: number, seed = 1): PixelPatch[] {
  const random = seeded(seed);
  const span = SIDE * PIXEL - 20;
  return Array.from({ length: n }, (_, i) => {
    const cx = grid.originX + 10 + random() * span, cy = grid.originY - 10 - random() * span;
    const r = 0.5 + 4.5 * random();
    const k = 12 + Math.floor(random() * 13);
    const ring: Ring = [];
    for (let j = 0; j < k; j++) {
      const a = (2 * Math.PI * j) / k, rr = r * (0.8 + 0.3 * random());
      ring.push([cx + rr * Math.cos(a), cy + rr * Math.sin(a)]);
    }
    ring.push([ring[0][0], ring[0][1]]);
    return { id: i, species: `s${i % 6}`, rings: [[ring]] };
  });
}

/** Area of a polygon clipped to the box [x0, x1] x [y0, y1] (convex clip window). */
function clippedArea(ring: Ring, x0: number, y0: number, x1: number, y1: number): number {
  let poly: Position[] = ring.slice(0, -1);
  const edges: [(p: Position) => boolean, (a: Position, b: Position) => Position][] = [
    [(p) => p[0] >= x0, (a, b) => [x0, a[1] + ((x0 - a[0]) * (b[1] - a[1])) / (b[0] - a[0])]],
    [(p) => p[0] <= x1, (a, b) => [x1, a[1] + ((x1 - a[0]) * (b[1] - a[1])) / (b[0] - a[0])]],
    [(p) => p[1] >= y0, (a, b) => [a[0] + ((y0 - a[1]) * (b[0] - a[0])) / (b[1] - a[1]), y0]],
    [(p) => p[1] <= y1, (a, b) => [a[0] + ((y1 - a[1]) * (b[0] - a[0])) / (b[1] - a[1]), y1]],
  ];
  for (const [inside, cut] of edges) {
    const out: Position[] = [];
    for (let i = 0; i < poly.length; i++) {
      const a = poly[(i + poly.length - 1) % poly.length], b = poly[i];
      if (inside(b)) {
        if (!inside(a)) out.push(cut(a, b));
        out.push(b);
      } else if (inside(a)) out.push(cut(a, b));
    }
    poly = out;
    if (poly.length === 0) return 0;
  }
  // Shoelace about the box's corner: products of raw map coordinates would lose the area.
  let area = 0;
  for (let i = 0; i < poly.length; i++) {
    const a = poly[i], b = poly[(i + 1) % poly.length];
    area += (a[0] - x0) * (b[1] - y0) - (b[0] - x0) * (a[1] - y0);
  }
  return Math.abs(area) / 2;
}

/** Baseline: every pixel of the bounding box clipped against the outline; pixels at least `least` covered. */
function boxBaseline(patches: PixelPatch[], least: number): number {
  let total = 0;
  for (const p of patches) {
    const ring = (p.rings as MultiPolygonRings)[0][0];
    let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
    for (const [x, y] of ring) { minX = Math.min(minX, x); maxX = Math.max(maxX, x); minY = Math.min(minY, y); maxY = Math.max(maxY, y); }
    const c0 = Math.floor((minX - grid.originX) / PIXEL), c1 = Math.ceil((maxX - grid.originX) / PIXEL) - 1;
    const r0 = Math.floor((grid.originY - maxY) / PIXEL), r1 = Math.ceil((grid.originY - minY) / PIXEL) - 1;
    for (let r = r0; r <= r1; r++) {
      for (let c = c0; c <= c1; c++) {
        const x0 = grid.originX + c * PIXEL, y1 = grid.originY - r * PIXEL;
        const share = clippedArea(ring, x0, y1 - PIXEL, x0 + PIXEL, y1) / (PIXEL * PIXEL);
        if (share > 0 && share >= least - 1e-9) total++;
      }
    }
  }
  return total;
}

const ours = (patches: PixelPatch[], rule: PixelRule) => countPixels(patches, grid, rule).patches.reduce((n, p) => n + p.pure, 0);

const pure: Benchmark = {
  name: 'pixels.pure',
  async run(size: BenchSize): Promise<BenchResult[]> {
    const n = size === 'large' ? 100000 : 10000;
    const patches = crowns(n);
    const lines: BenchResult[] = [];
    for (const [label, rule, least] of [
      ['cover 0.5', { kind: 'cover', minCover: 0.5 }, 0.5],
      ['inside (cover 1)', { kind: 'inside', buffer: 0 }, 1],
      ['inside, 0.5 m buffer', { kind: 'inside', buffer: 0.5 }, null],
    ] as const) {
      const count = ours(patches, rule);
      const timing = await time(() => ours(patches, rule), { runs: 7, warmup: 1 });
      // The buffer has no box-clip twin; its line is timed against the plain cover baseline.
      const baseLeast = least ?? 1;
      const baseCount = boxBaseline(patches, baseLeast);
      const base = await time(() => boxBaseline(patches, baseLeast), { runs: 5, warmup: 0 });
      lines.push(result('pixels.pure', n, timing, 'clip every bounding-box pixel', base, {
        rule: label, pure_pixels: count, baseline_pixels: baseCount, same_count: least === null ? null : count === baseCount,
        grid: `${SIDE} x ${SIDE} x 8 bands`,
      }));
    }
    return lines;
  },
};

export const benchmarks: Benchmark[] = [pure];
