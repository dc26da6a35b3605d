import type { Position, Ring } from '../geometry/types.ts';
import type { Random } from '../random.ts';
import { BAND_COUNT, DN_PER_REFLECTANCE } from './bands.ts';
import { smoothstep } from './noise.ts';
import { demoRoster } from './roster.ts';
import type { DateKey, SceneGrid } from './scene.ts';
import { brownFoliage, speciesSpectra } from './spectra.ts';
import { groundAt, type Terrain } from './terrain.ts';

// Crowns of the demo basin: where they stand, their shape, height and colour. Denser on
// the basin floor, thinning to scattered low krummholz towards the rim (a treeline);
// some come in clumps whose crowns touch or overlap.

export type CrownCondition = 'healthy' | 'stressed' | 'brown';

export interface Crown {
  index: number;
  id: string;
  /** Roster code. */
  species: string;
  /** Centre in the scene CRS, metres. */
  cx: number;
  cy: number;
  /** Mean radius, metres; the outline wobbles around it by the harmonics. */
  radius: number;
  /** Relative amplitudes and phases of the outline's harmonics 2, 3 and 4. */
  wobble: readonly { k: number; amplitude: number; phase: number }[];
  /** Height above ground, metres (casts the shadow; the taller crown is seen on top). */
  height: number;
  condition: CrownCondition;
  /** Share of the spectrum mixed towards brown foliage (0 healthy, up to 0.9). */
  browning: number;
  /** Whole-crown brightness factor, 0.85-1.15. */
  brightness: number;
  /** Per-band relative deviation from the species spectrum, within +-4 %. */
  jitter: readonly number[];
}

/** Bounds of the within-species variation (stated in the truth file). */
export const CROWN_VARIATION = {
  brightness: [0.85, 1.15],
  bandJitter: 0.04,
  stressedBrowning: [0.15, 0.4],
  brownBrowning: [0.6, 0.9],
  maxWobble: 0.2,
} as const;

interface SpeciesHabit {
  radius: [number, number];
  /** Relative abundance at an elevation (0 floor - 1 rim) and dryness (0-1). */
  weight(elevation: number, dryness: number): number;
  height(radius: number, elevation: number, random: Random): number;
}

const conifer = (radius: number, elevation: number, random: Random) =>
  radius * random.uniform(2.4, 3.6) * (1 - 0.55 * smoothstep(0.35, 0.75, elevation));
const shrub = (radius: number, _elevation: number, random: Random) => random.uniform(0.3, 0.9) * (0.6 + 0.4 * radius);

const habits: Record<string, SpeciesHabit> = {
  ABFI: { radius: [1.0, 2.6], weight: (e) => 1.2 * smoothstep(0.6, 0.2, e), height: conifer },
  PISI: { radius: [1.1, 2.8], weight: (e, d) => smoothstep(0.55, 0.15, e) * (1 - 0.5 * d), height: conifer },
  PIEX: { radius: [0.9, 2.4], weight: (e) => 0.2 + 0.9 * smoothstep(0.2, 0.45, e) * smoothstep(0.75, 0.55, e), height: conifer },
  SAIN: { radius: [0.8, 3.0], weight: (e, d) => 1.3 * (1 - d) * smoothstep(0.45, 0.1, e), height: shrub },
  BEFA: { radius: [0.7, 2.2], weight: (e) => 0.8 * smoothstep(0.15, 0.35, e) * smoothstep(0.7, 0.5, e), height: shrub },
  VAFI: { radius: [0.5, 1.6], weight: (e, d) => 0.9 * d * smoothstep(0.3, 0.6, e), height: shrub },
  RHPE: { radius: [0.6, 1.4], weight: () => 0, height: (_r, _e, random) => random.uniform(0.5, 1.5) },
};

const RARE = 'RHPE';
const RARE_SHARE = 0.012;
/** Crowns per square metre of scene (about 5000 over the full 4096-pixel scene). */
const CROWNS_PER_M2 = 5000 / (4096 * 0.3) ** 2;

/** The outline radius at angle theta (radians, counterclockwise from east). */
export function crownRadiusAt(crown: Crown, theta: number): number {
  let f = 1;
  for (const w of crown.wobble) f += w.amplitude * Math.cos(w.k * theta + w.phase);
  return crown.radius * f;
}

/** The largest distance of the outline from the centre. */
export function crownMaxRadius(crown: Crown): number {
  return crown.radius * (1 + crown.wobble.reduce((s, w) => s + w.amplitude, 0));
}

/** Whether a point (scene CRS) lies inside the crown's outline curve. */
export function crownContains(crown: Crown, x: number, y: number): boolean {
  const dx = x - crown.cx;
  const dy = y - crown.cy;
  const d2 = dx * dx + dy * dy;
  const rMax = crownMaxRadius(crown);
  if (d2 > rMax * rMax) return false;
  const r = crownRadiusAt(crown, Math.atan2(dy, dx));
  return d2 < r * r;
}

/** The outline as a closed counterclockwise ring of `vertices` points (scene CRS). */
export function crownOutline(crown: Crown, vertices = 32): Ring {
  const ring: Position[] = [];
  for (let i = 0; i < vertices; i++) {
    const theta = (2 * Math.PI * i) / vertices;
    const r = crownRadiusAt(crown, theta);
    ring.push([crown.cx + r * Math.cos(theta), crown.cy + r * Math.sin(theta)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/** The crown's spectrum in digital numbers under unit illumination on a date. */
export function crownSpectrum(crown: Crown, date: DateKey): number[] {
  const base = speciesSpectra[crown.species][date];
  const out: number[] = [];
  for (let b = 0; b < BAND_COUNT; b++) {
    const mixed = (1 - crown.browning) * base[b] + crown.browning * brownFoliage[b];
    out.push(DN_PER_REFLECTANCE * crown.brightness * (1 + crown.jitter[b]) * mixed);
  }
  return out;
}

/** A neighbour index over crown centres, cell by cell. */
class CrownGrid {
  private readonly cells = new Map<number, Crown[]>();
  constructor(private readonly cell: number) {}
  private key(i: number, j: number) {
    return i * 100003 + j;
  }
  add(crown: Crown) {
    const k = this.key(Math.floor(crown.cx / this.cell), Math.floor(crown.cy / this.cell));
    const list = this.cells.get(k);
    if (list) list.push(crown);
    else this.cells.set(k, [crown]);
  }
  /** True when a crown of radius r at (x, y) keeps at least factor * (r1 + r2) + gap from all others. */
  clear(x: number, y: number, r: number, factor: number, gap: number): boolean {
    const ci = Math.floor(x / this.cell);
    const cj = Math.floor(y / this.cell);
    for (let i = ci - 1; i <= ci + 1; i++) {
      for (let j = cj - 1; j <= cj + 1; j++) {
        for (const other of this.cells.get(this.key(i, j)) ?? []) {
          if (Math.hypot(other.cx - x, other.cy - y) < factor * (other.radius + r) + gap) return false;
        }
      }
    }
    return true;
  }
}

/** Places the demo crowns over the terrain. Deterministic for a given random stream. */
export function placeCrowns(grid: SceneGrid, terrain: Terrain, random: Random): Crown[] {
  const target = Math.max(12, Math.round(CROWNS_PER_M2 * grid.sideM * grid.sideM));
  const crowns: Crown[] = [];
  const index = new CrownGrid(8);
  const groundOf = (x: number, y: number) =>
    groundAt(terrain, 'early', (x - grid.originX) / grid.msPixel, (grid.originY - y) / grid.msPixel);

  const tryAdd = (x: number, y: number, species: string | null, factor: number, gap: number): Crown | null => {
    const ground = groundOf(x, y);
    if (ground.material !== 'tundra') return null;
    const code = species ?? pickSpecies(random, ground.elevation, ground.dryness);
    const habit = habits[code];
    const radius = random.uniform(habit.radius[0], habit.radius[1]) * (1 - 0.3 * smoothstep(0.4, 0.8, ground.elevation));
    const rMax = radius * (1 + CROWN_VARIATION.maxWobble);
    const left = x - grid.originX;
    const top = grid.originY - y;
    if (left < rMax || top < rMax || left > grid.sideM - rMax || top > grid.sideM - rMax) return null;
    if (!index.clear(x, y, radius, factor, gap)) return null;
    const crown = makeCrown(crowns.length, code, x, y, radius, habit.height(radius, ground.elevation, random), random);
    crowns.push(crown);
    index.add(crown);
    return crown;
  };

  for (let attempt = 0; attempt < target * 60 && crowns.length < target; attempt++) {
    const x = grid.originX + random.next() * grid.sideM;
    const y = grid.originY - random.next() * grid.sideM;
    const ground = groundOf(x, y);
    if (ground.material !== 'tundra') continue;
    // Treeline: dense on the floor, sparse towards the rim.
    if (!random.chance(0.06 + 0.94 * smoothstep(0.7, 0.25, ground.elevation))) continue;
    const parent = tryAdd(x, y, null, 1, 0.2);
    if (!parent || !random.chance(0.3)) continue;
    // A clump: crowns touching or overlapping the parent.
    const children = 1 + random.int(4);
    for (let c = 0; c < children && crowns.length < target; c++) {
      const species = random.chance(0.7) ? parent.species : null;
      const angle = random.uniform(0, 2 * Math.PI);
      const distance = (parent.radius + habits[species ?? parent.species].radius[1] * 0.6) * random.uniform(0.75, 1.0);
      tryAdd(parent.cx + distance * Math.cos(angle), parent.cy + distance * Math.sin(angle), species, 0.72, 0);
    }
  }
  return crowns;
}

function pickSpecies(random: Random, elevation: number, dryness: number): string {
  if (random.chance(RARE_SHARE)) return RARE;
  const codes = demoRoster.map((s) => s.code).filter((c) => c !== RARE);
  const weights = codes.map((c) => habits[c].weight(elevation, dryness) + 0.01);
  return codes[random.weighted(weights)];
}

function makeCrown(index: number, species: string, cx: number, cy: number, radius: number, height: number, random: Random): Crown {
  const wobble = [2, 3, 4].map((k) => ({ k, amplitude: random.uniform(0, 0.2 / 3), phase: random.uniform(0, 2 * Math.PI) }));
  const roll = random.next();
  const condition: CrownCondition = roll < 0.05 ? 'brown' : roll < 0.18 ? 'stressed' : 'healthy';
  const range = condition === 'brown' ? CROWN_VARIATION.brownBrowning : CROWN_VARIATION.stressedBrowning;
  const browning = condition === 'healthy' ? 0 : random.uniform(range[0], range[1]);
  const brightness = Math.min(1.15, Math.max(0.85, random.normal(1, 0.06)));
  const jitter = Array.from({ length: BAND_COUNT }, () => random.uniform(-CROWN_VARIATION.bandJitter, CROWN_VARIATION.bandJitter));
  return {
    index,
    id: `C${String(index + 1).padStart(4, '0')}`,
    species,
    cx,
    cy,
    radius,
    wobble,
    height,
    condition,
    browning,
    brightness,
    jitter,
  };
}
