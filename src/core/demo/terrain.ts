import { hashUnit } from '../random.ts';
import { fractalNoise, smoothstep, valueNoise } from './noise.ts';
import type { SceneGrid, DateKey } from './scene.ts';

// The basin's ground: a bowl-shaped elevation field with a tarn on its floor, rock and
// scree on the high rim, snow patches up high (smaller by the late date) and tundra
// elsewhere, drier or wetter by place. The large fields live on the multispectral grid
// and are interpolated to panchromatic pixels; fine texture is added per pixel.
// Field scales are fractions of the scene side, so a reduced test scene is the same
// basin in miniature; textures are in metres.

// Imported helpers bound once: the renderer calls into this module for every pixel.
const hash = hashUnit;
const vnoise = valueNoise;
const smooth = smoothstep;

export interface Terrain {
  /** Grid the fields are sampled on: one value per multispectral pixel centre. */
  n: number;
  elevation: Float32Array;
  rockiness: Float32Array;
  snowiness: Float32Array;
  dryness: Float32Array;
  seed: number;
}

/** Elevation below which the basin floor holds water. */
export const TARN_LEVEL = 0.045;
const ROCK_LEVEL = 0.84;
const SCREE_LEVEL = 0.73;
const OUTCROP_LEVEL = 0.75;
const SNOW_MIN_ELEVATION = 0.58;
/** Snow lies where the snow field plus height passes this; higher by the late date (melt). */
const SNOW_THRESHOLD: Record<DateKey, number> = { early: 0.8, late: 0.88 };

export function buildTerrain(grid: SceneGrid, seed: number): Terrain {
  const n = grid.msSize;
  const elevation = new Float32Array(n * n);
  const rockiness = new Float32Array(n * n);
  const snowiness = new Float32Array(n * n);
  const dryness = new Float32Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const u = (i + 0.5) / n;
      const v = (j + 0.5) / n;
      // Bowl around a floor south of centre, with a higher headwall to the north.
      const d = Math.hypot((u - 0.46) / 0.8, (v - 0.64) / 0.7);
      const bowl = Math.pow(Math.min(1.2, d), 1.25) + 0.22 * (0.6 - v);
      const rough = fractalNoise(seed + 1, u, v, 0.22, 5) - 0.5;
      const k = j * n + i;
      elevation[k] = Math.min(1, Math.max(0, 0.86 * bowl + 0.42 * rough));
      rockiness[k] = fractalNoise(seed + 2, u, v, 0.035, 4);
      snowiness[k] = fractalNoise(seed + 3, u, v, 0.05, 4);
      dryness[k] = fractalNoise(seed + 4, u, v, 0.02, 3);
    }
  }
  return { n, elevation, rockiness, snowiness, dryness, seed };
}

/** Bilinear sample of a terrain field at a point in multispectral-pixel units. */
export function sampleField(terrain: Terrain, field: Float32Array, mx: number, my: number): number {
  const n = terrain.n;
  const x = Math.min(n - 1, Math.max(0, mx - 0.5));
  const y = Math.min(n - 1, Math.max(0, my - 0.5));
  const x0 = Math.min(n - 2, Math.floor(x));
  const y0 = Math.min(n - 2, Math.floor(y));
  const fx = x - x0;
  const fy = y - y0;
  const k = y0 * n + x0;
  const top = field[k] + (field[k + 1] - field[k]) * fx;
  const bottom = field[k + n] + (field[k + n + 1] - field[k + n]) * fx;
  return top + (bottom - top) * fy;
}

export type GroundKind = 'tundra' | 'rock' | 'scree' | 'snow' | 'water';

/** The ground at one point: its material and, for tundra, how dry it is (0-1). */
export interface Ground {
  material: GroundKind;
  dryness: number;
  elevation: number;
}

/** Ground at a point given in multispectral-pixel units. */
export function groundAt(terrain: Terrain, date: DateKey, mx: number, my: number): Ground {
  const elevation = sampleField(terrain, terrain.elevation, mx, my);
  if (elevation < TARN_LEVEL) return { material: 'water', dryness: 0, elevation };
  const rockiness = sampleField(terrain, terrain.rockiness, mx, my);
  const rock = elevation + 0.7 * (rockiness - 0.5);
  // High on the rim, or an outcrop wherever the rock field peaks.
  if (rock > ROCK_LEVEL || rockiness > OUTCROP_LEVEL) {
    return { material: snowAt(terrain, date, mx, my, elevation) ? 'snow' : 'rock', dryness: 0, elevation };
  }
  if (snowAt(terrain, date, mx, my, elevation)) return { material: 'snow', dryness: 0, elevation };
  if (rock > SCREE_LEVEL) return { material: 'scree', dryness: 0, elevation };
  // Wetter near the tarn, drier with height and by patch.
  const patch = sampleField(terrain, terrain.dryness, mx, my);
  const dryness = Math.min(1, Math.max(0, 2 * (patch - 0.5) + 1.1 * smooth(0.1, 0.7, elevation) - 0.1));
  return { material: 'tundra', dryness, elevation };
}

function snowAt(terrain: Terrain, date: DateKey, mx: number, my: number, elevation: number): boolean {
  if (elevation < SNOW_MIN_ELEVATION) return false;
  const s = sampleField(terrain, terrain.snowiness, mx, my) + 0.5 * (elevation - SNOW_MIN_ELEVATION);
  return s > SNOW_THRESHOLD[date];
}

/** Relative texture amplitude of each ground material. */
const TEXTURE_AMPLITUDE: Record<GroundKind, number> = {
  tundra: 0.14,
  rock: 0.22,
  scree: 0.32,
  snow: 0.03,
  water: 0.04,
};

/** Lattice spacing of each material's texture, in panchromatic pixels. */
const TEXTURE_CELL: Record<GroundKind, number> = {
  tundra: 4,
  rock: 6,
  scree: 2,
  snow: 12,
  water: 16,
};

/** Brightness factor of the ground texture at a panchromatic pixel (same on every date). */
export function groundTexture(seed: number, material: GroundKind, px: number, py: number): number {
  const cell = TEXTURE_CELL[material];
  const soft = vnoise(seed + 11, px / cell, py / cell) * 2 - 1;
  const grain = hash(seed + 12, px, py) * 2 - 1;
  return 1 + TEXTURE_AMPLITUDE[material] * (0.7 * soft + 0.3 * grain);
}
