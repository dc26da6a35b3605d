import type { PatchInput } from '../../../src/core/checks/preparedPatch.ts';
import type { Ring } from '../../../src/core/geometry/types.ts';
import { Random } from '../../../src/core/random.ts';

// Small seeded sites for the engine tests: crowns on a jittered lattice, some
// overlapping, some split in two along a shared chord, a few bowties and tag quarrels.

export const SPECIES = ['pice', 'lari', 'pinu', 'alnu'];

export function crownRing(random: Random, cx: number, cy: number, r: number, k: number): Ring {
  const ring: Ring = [];
  for (let i = 0; i < k; i++) {
    const a = (2 * Math.PI * i) / k;
    const rr = r * random.uniform(0.85, 1.15);
    ring.push([cx + rr * Math.cos(a), cy + rr * Math.sin(a)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

export function testSite(n: number, seed: number): PatchInput[] {
  const random = new Random(seed);
  const side = Math.ceil(Math.sqrt(n));
  const patches: PatchInput[] = [];
  const species = () => SPECIES[Math.floor(random.next() * SPECIES.length)];
  for (let cell = 0; patches.length < n; cell++) {
    const r = random.uniform(0.5, 4);
    const cx = 600000 + (cell % side) * 10 + random.uniform(-0.5, 0.5);
    const cy = 5100000 + Math.floor(cell / side) * 10 + random.uniform(-0.5, 0.5);
    const k = 6 + Math.floor(random.next() * 10);
    const ring = crownRing(random, cx, cy, r, k);
    const roll = random.next();
    const id = patches.length % 3 === 0 ? `p${patches.length}` : patches.length;
    if (roll < 0.15) {
      const half = Math.floor(k / 2);
      patches.push({ id, species: species(), rings: [[[...ring.slice(0, half + 1), ring[0]]]] });
      patches.push({ id: `s${patches.length}`, species: species(), rings: [[[...ring.slice(half, k), ring[0], ring[half]]]] });
      continue;
    }
    if (roll > 0.95) ring.splice(0, 3, ring[2], ring[1], ring[0]);
    if (roll > 0.95) ring[ring.length - 1] = [ring[0][0], ring[0][1]];
    const tags = roll > 0.15 && roll < 0.2 ? [{ species: species() }] : undefined;
    patches.push({ id, species: roll > 0.9 && roll < 0.92 ? 'mixed' : species(), tags, rings: [[ring]] });
    if (roll > 0.4 && roll < 0.45) {
      // A near-copy: the same outline nudged by a few centimetres.
      const copy = ring.map(([x, y]) => [x + 0.03, y - 0.02] as [number, number]);
      patches.push({ id: `d${patches.length}`, species: species(), rings: [[copy]] });
    }
    if (roll > 0.2 && roll < 0.4) {
      const shift = r * random.uniform(0.05, 1.2);
      patches.push({ id: `o${patches.length}`, species: species(), rings: [[crownRing(random, cx + shift, cy + shift / 2, r * 0.9, k)]] });
    }
  }
  return patches.slice(0, n);
}
