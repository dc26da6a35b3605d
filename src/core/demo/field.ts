import { transformer } from '../crs.ts';
import type { Position, Ring } from '../geometry/types.ts';
import type { Random } from '../random.ts';
import { crownRadiusAt, type Crown } from './crowns.ts';
import { DEMO_EPSG } from './scene.ts';

// The field crew's polygons: for a subset of crowns, an outline walked around the drip
// line with a GPS. Every vertex carries the receiver's systematic shift (the same for
// the whole survey) plus its own random error. Written as RFC 7946 GeoJSON (WGS 84
// lon/lat, exterior rings counterclockwise).

/** Standard deviation of the per-vertex GPS error, metres, per axis. */
export const GPS_NOISE_SD_M = 0.3;
/** Walked vertices are about this far apart, metres. */
const VERTEX_SPACING_M = 0.8;
/** Crowns smaller than this are not walked (too small to walk around). */
const MIN_WALKED_RADIUS_M = 1.0;
/** Share of a crown's outline area that must be visible (not under a taller crown). */
const MIN_VISIBLE_SHARE = 0.6;
/** Rare-species crowns always walked, at most. */
const RARE_WALKED = 8;
/** Decimal places of the written degrees: 1e-8 degree is about a millimetre. */
const DEGREE_DECIMALS = 8;

export interface FieldPolygon {
  id: string;
  species: string;
  /** The crown it was walked around. */
  crownId: string;
  /** Outline in the scene CRS as recorded (shift and noise included), closed, counterclockwise. */
  ring: Ring;
}

export interface FieldSurvey {
  /** The crew's systematic shift, metres east and north (what the receiver added). */
  shift: [number, number];
  polygons: FieldPolygon[];
}

export interface FieldFeature {
  type: 'Feature';
  properties: { id: string; species: string; recorded: string };
  geometry: { type: 'Polygon'; coordinates: Position[][] };
}

export interface FieldCollection {
  type: 'FeatureCollection';
  features: FieldFeature[];
}

/** How many crowns get walked for a scene with `crownCount` crowns. */
export function walkedCount(crownCount: number): number {
  return Math.min(300, Math.max(3, Math.round(crownCount * 0.045)));
}

/**
 * Walks a subset of crowns. `visibleShare[i]` is the share of crown i's outline area
 * that the imagery shows (from the ownership mask), so crews walk crowns one can see.
 */
export function walkCrowns(
  crowns: readonly Crown[], visibleShare: ArrayLike<number>, rareCode: string, random: Random, chosenShift?: readonly [number, number],
): FieldSurvey {
  const magnitude = random.uniform(1.0, 2.0);
  const direction = random.uniform(0, 2 * Math.PI);
  // A chosen shift replaces the drawn one; the draws still happen, so the rest of the
  // survey (which crowns, every vertex's error) is the same as without it.
  const shift: [number, number] = chosenShift
    ? [chosenShift[0], chosenShift[1]]
    : [magnitude * Math.cos(direction), magnitude * Math.sin(direction)];

  const eligible = crowns.filter((c) => c.radius >= MIN_WALKED_RADIUS_M && visibleShare[c.index] >= MIN_VISIBLE_SHARE);
  const rare = eligible.filter((c) => c.species === rareCode).slice(0, RARE_WALKED);
  const others = random.shuffle(eligible.filter((c) => c.species !== rareCode));
  const chosen = [...rare, ...others.slice(0, Math.max(0, walkedCount(crowns.length) - rare.length))];
  chosen.sort((a, b) => a.index - b.index);

  const polygons = chosen.map((crown, i) => ({
    id: `F${String(i + 1).padStart(3, '0')}`,
    species: crown.species,
    crownId: crown.id,
    ring: walkOutline(crown, shift, random),
  }));
  return { shift, polygons };
}

/** One walked outline: vertices at rising angles around the crown, just outside its
 * edge, each with GPS error; redrawn until the angles still rise, which keeps the ring
 * star-shaped about the crown centre and so simple (no self-intersection). */
function walkOutline(crown: Crown, shift: [number, number], random: Random): Ring {
  const count = Math.min(24, Math.max(8, Math.round((2 * Math.PI * crown.radius) / VERTEX_SPACING_M)));
  const step = (2 * Math.PI) / count;
  const start = random.uniform(0, step);
  // A redraw is rare (vertices lie about 0.8 m apart, errors 0.3 m); the bound only
  // keeps a wrong constant from spinning for ever.
  for (let attempt = 0; attempt < 10000; attempt++) {
    const offsets: Position[] = [];
    for (let i = 0; i < count; i++) {
      const theta = start + i * step + random.uniform(-0.25, 0.25) * step;
      const r = crownRadiusAt(crown, theta) * random.uniform(1.0, 1.08);
      offsets.push([
        r * Math.cos(theta) + random.normal(0, GPS_NOISE_SD_M),
        r * Math.sin(theta) + random.normal(0, GPS_NOISE_SD_M),
      ]);
    }
    if (!anglesRise(offsets)) continue;
    const ring: Ring = offsets.map(([dx, dy]) => [crown.cx + dx + shift[0], crown.cy + dy + shift[1]]);
    ring.push([ring[0][0], ring[0][1]]);
    return ring;
  }
  throw new Error(`could not walk a simple outline around crown ${crown.id}`);
}

/** True when the points' polar angles about the origin go once around, strictly rising. */
function anglesRise(points: readonly Position[]): boolean {
  const angles = points.map(([x, y]) => Math.atan2(y, x));
  let turns = 0;
  for (let i = 0; i < angles.length; i++) {
    let d = angles[(i + 1) % angles.length] - angles[i];
    if (d <= -Math.PI) d += 2 * Math.PI;
    if (d <= 0 || d >= Math.PI) return false;
    turns += d;
  }
  return Math.abs(turns - 2 * Math.PI) < 1e-9;
}

const roundTo = (value: number, decimals: number) => Number(value.toFixed(decimals));

/** The survey as RFC 7946 GeoJSON in WGS 84 lon/lat. */
export function fieldGeoJson(survey: FieldSurvey): FieldCollection {
  const toLonLat = transformer(DEMO_EPSG, 4326);
  // The crew walked the basin a few days before the early image.
  const recorded = '2025-07-21';
  return {
    type: 'FeatureCollection',
    features: survey.polygons.map((p) => ({
      type: 'Feature',
      properties: { id: p.id, species: p.species, recorded },
      geometry: {
        type: 'Polygon',
        coordinates: [p.ring.map((xy) => {
          const [lon, lat] = toLonLat(xy);
          return [roundTo(lon, DEGREE_DECIMALS), roundTo(lat, DEGREE_DECIMALS)] as Position;
        })],
      },
    })),
  };
}
