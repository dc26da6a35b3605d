// Seeded sites of crown-sized patches for the checks benchmarks (Node and the browser page).
import type { PatchInput } from '../../src/core/checks/preparedPatch.ts';
import type { SceneGrids } from '../../src/core/checks/settings.ts';
import type { RasterGrid } from '../../src/core/geometry/rasterGrid.ts';
import type { Ring } from '../../src/core/geometry/types.ts';
import { seeded } from '../harness.ts';

const SPECIES = ['pice', 'lari', 'pinu', 'juni', 'alnu', 'salx'];
const CELL = 12; // m between lattice points; crowns up to 10 m across fit a cell

/** A crown outline: a noisy polygon of `k` vertices, counter-clockwise, closed. */
function crown(random: () => number, cx: number, cy: number, r: number, k: number): Ring {
  const ring: Ring = [];
  for (let i = 0; i < k; i++) {
    const a = (2 * Math.PI * i) / k;
    const rr = r * (0.85 + 0.3 * random());
    ring.push([cx + rr * Math.cos(a), cy + rr * Math.sin(a)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/**
 * A seeded site: one crown (1-10 m across) per lattice cell; 5 % of cells get a second
 * crown overlapping the first, 10 % are split in two patches that touch along a chord,
 * 1 % are digitized twice, 2 % carry disagreeing tags and 0.5 % are drawn as bowties.
 */
export function seededSite(n: number, seed = 1): PatchInput[] {
  const random = seeded(seed);
  const side = Math.ceil(Math.sqrt(n));
  const patches: PatchInput[] = [];
  const species = () => SPECIES[Math.floor(random() * SPECIES.length)];
  for (let cell = 0; patches.length < n; cell++) {
    const r = 0.5 + 4.5 * random();
    const jitter = CELL / 2 - r;
    const cx = 600000 + (cell % side) * CELL + (random() - 0.5) * jitter;
    const cy = 5100000 + Math.floor(cell / side) * CELL + (random() - 0.5) * jitter;
    const k = 12 + Math.floor(random() * 13);
    const ring = crown(random, cx, cy, r, k);
    const roll = random();
    if (roll < 0.1 && patches.length + 1 < n) {
      // Split along the chord from vertex 0 to vertex k/2: two patches sharing an edge.
      const half = Math.floor(k / 2);
      const left = [...ring.slice(0, half + 1), ring[0]];
      const right = [...ring.slice(half, k), ring[0], ring[half]];
      patches.push({ id: patches.length, species: species(), rings: [[left]] });
      patches.push({ id: patches.length, species: species(), rings: [[right]] });
      continue;
    }
    const tags = roll < 0.12 ? [{ species: species() }, { species: species() }] : undefined;
    if (roll > 0.995) {
      ring.splice(0, 3, ring[2], ring[1], ring[0]); // crossing edges near vertex 0
      ring[ring.length - 1] = [ring[0][0], ring[0][1]];
    }
    patches.push({ id: patches.length, species: species(), tags, rings: [[ring]] });
    if (roll > 0.15 && roll < 0.16 && patches.length < n) {
      // A near-copy, as when one crown is digitized twice.
      patches.push({ id: patches.length, species: species(), rings: [[ring.map(([x, y]) => [x + 0.05, y] as [number, number])]] });
    }
    if (roll > 0.1 && roll < 0.15 && patches.length < n) {
      const shift = r * (0.4 + 0.8 * random());
      patches.push({ id: patches.length, species: species(), rings: [[crown(random, cx + shift, cy, r * 0.8, k)]] });
    }
  }
  return patches;
}

/**
 * A scene over the site: 0.3 m panchromatic and 1.2 m multispectral grids whose east
 * edge stops a few metres short of the last column of crowns, so some cross it.
 */
export function sceneFor(n: number): SceneGrids {
  const span = Math.ceil(Math.sqrt(n)) * CELL;
  const grid = (pixel: number): RasterGrid => ({
    originX: 600000 - CELL, originY: 5100000 + span + CELL, pixelWidth: pixel, pixelHeight: pixel,
    width: Math.floor((span + CELL - 8) / pixel), height: Math.ceil((span + 2 * CELL) / pixel),
  });
  return { pan: grid(0.3), ms: grid(1.2) };
}

