import type { MultiPolygonRings, Position } from '../../../src/core/geometry/types.ts';
import type { OffsetPatch } from '../../../src/core/offset/estimateShift.ts';
import type { SignalGrid } from '../../../src/core/offset/signalGrid.ts';
import { Random } from '../../../src/core/random.ts';

// A small synthetic scene for the estimator's unit checks: round crowns of high signal
// on a lower, noisy ground, each pixel the mean of 4 x 4 sub-samples (so edges blur
// as in a real multispectral pixel), and circular field polygons around the crowns,
// recorded off by a known shift.

export interface SyntheticScene {
  grid: SignalGrid;
  crowns: { x: number; y: number; r: number }[];
}

export function syntheticScene(options: { seed: number; size?: number; pixel?: number; crowns?: number; contrast?: number; noise?: number }): SyntheticScene {
  const { seed, size = 160, pixel = 1.2, crowns: count = 60, contrast = 0.3, noise = 0.03 } = options;
  const random = new Random(seed);
  const originX = 500000;
  const originY = 4400000;
  const side = size * pixel;
  const crowns: SyntheticScene['crowns'] = [];
  while (crowns.length < count) {
    const r = random.uniform(1, 2.5);
    const x = originX + random.uniform(10, side - 10);
    const y = originY - random.uniform(10, side - 10);
    if (crowns.every((c) => Math.hypot(c.x - x, c.y - y) > c.r + r + 4)) crowns.push({ x, y, r });
  }
  const values = new Float32Array(size * size);
  for (let row = 0; row < size; row++) {
    for (let col = 0; col < size; col++) {
      let sum = 0;
      for (let sy = 0; sy < 4; sy++) {
        for (let sx = 0; sx < 4; sx++) {
          const x = originX + (col + (sx + 0.5) / 4) * pixel;
          const y = originY - (row + (sy + 0.5) / 4) * pixel;
          sum += crowns.some((c) => (c.x - x) ** 2 + (c.y - y) ** 2 < c.r * c.r) ? 0.5 + contrast : 0.5;
        }
      }
      values[row * size + col] = sum / 16 + random.normal(0, noise);
    }
  }
  return { grid: { values, width: size, height: size, originX, originY, pixelX: pixel, pixelY: pixel }, crowns };
}

/** A circle of `vertices` points, closed. */
export function circle(x: number, y: number, r: number, vertices = 20): MultiPolygonRings {
  const ring: Position[] = [];
  for (let i = 0; i < vertices; i++) {
    const a = (2 * Math.PI * i) / vertices;
    ring.push([x + r * Math.cos(a), y + r * Math.sin(a)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return [[ring]];
}

/** Field polygons around the crowns, recorded so that adding `shift` puts them back. */
export function fieldPolygons(scene: SyntheticScene, shift: [number, number], seed: number, gpsSd = 0.1): OffsetPatch[] {
  const random = new Random(seed);
  return scene.crowns.map((c, i) => {
    const parts = circle(c.x - shift[0], c.y - shift[1], c.r * 1.04);
    const ring = parts[0][0];
    for (let k = 0; k < ring.length - 1; k++) {
      ring[k][0] += random.normal(0, gpsSd);
      ring[k][1] += random.normal(0, gpsSd);
    }
    ring[ring.length - 1] = [ring[0][0], ring[0][1]];
    return { id: `P${i + 1}`, rings: parts };
  });
}
