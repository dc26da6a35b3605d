import { hashUnit } from '../random.ts';

// Smooth random fields for the demo terrain: value noise on a square lattice with a
// smoothstep blend, summed over octaves (fractal Brownian motion). Every value is a
// pure function of the seed and the position, so any window can be filled in any order.

const hash = hashUnit;

/** Value noise at (x, y) in lattice units, in [0, 1). */
export function valueNoise(seed: number, x: number, y: number): number {
  const x0 = Math.floor(x);
  const y0 = Math.floor(y);
  const fx = x - x0;
  const fy = y - y0;
  const sx = fx * fx * (3 - 2 * fx);
  const sy = fy * fy * (3 - 2 * fy);
  const a = hash(seed, x0, y0);
  const b = hash(seed, x0 + 1, y0);
  const c = hash(seed, x0, y0 + 1);
  const d = hash(seed, x0 + 1, y0 + 1);
  const top = a + (b - a) * sx;
  const bottom = c + (d - c) * sx;
  return top + (bottom - top) * sy;
}

/** Fractal value noise: `octaves` layers, each at twice the frequency and `gain` times
 * the amplitude of the last, normalised to [0, 1). `cell` is the first octave's lattice
 * spacing in the caller's units. */
export function fractalNoise(seed: number, x: number, y: number, cell: number, octaves: number, gain = 0.5): number {
  let sum = 0;
  let norm = 0;
  let amplitude = 1;
  let frequency = 1 / cell;
  for (let o = 0; o < octaves; o++) {
    sum += amplitude * valueNoise(seed + o * 1013, x * frequency, y * frequency);
    norm += amplitude;
    amplitude *= gain;
    frequency *= 2;
  }
  return sum / norm;
}

/** Hermite smoothstep of x between edges e0 and e1 (either order), in [0, 1]. */
export function smoothstep(e0: number, e1: number, x: number): number {
  const t = Math.min(1, Math.max(0, (x - e0) / (e1 - e0)));
  return t * t * (3 - 2 * t);
}
