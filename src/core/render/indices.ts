import type { BandEntry } from '../bandTable.ts';

// Vegetation indices as normalised differences of two bands. All three are ratios, so
// they hold for digital numbers as for reflectance when the bands share a gain.

export type IndexName = 'ndvi' | 'ndre' | 'gndvi';

/** A spectral role a band can play, by the range its centre wavelength falls in (nm). */
export type BandRole = 'blue' | 'green' | 'red' | 'rededge' | 'nir';

export interface IndexDefinition {
  name: IndexName;
  label: string;
  /** (a - b) / (a + b) */
  a: BandRole;
  b: BandRole;
  source: string;
}

export const indexDefinitions: Record<IndexName, IndexDefinition> = {
  ndvi: {
    name: 'ndvi', label: 'NDVI', a: 'nir', b: 'red',
    source: 'Rouse, Haas, Schell & Deering (1974), Monitoring vegetation systems in the Great Plains with ERTS, NASA SP-351',
  },
  ndre: {
    name: 'ndre', label: 'NDRE (red edge)', a: 'nir', b: 'rededge',
    source: 'Gitelson & Merzlyak (1994), J. Plant Physiol. 143:286-292; named NDRE by Barnes et al. (2000)',
  },
  gndvi: {
    name: 'gndvi', label: 'Green NDVI', a: 'nir', b: 'green',
    source: 'Gitelson, Kaufman & Merzlyak (1996), Remote Sens. Environ. 58:289-298',
  },
};

// Wavelength windows of each role (common practice; they bracket the usual sensor bands).
const roleWindows: Record<BandRole, [number, number]> = {
  blue: [440, 500],
  green: [500, 590],
  red: [620, 690],
  rededge: [695, 760],
  nir: [770, 900],
};
const roleNames: Record<BandRole, RegExp> = {
  blue: /^blue$/i,
  green: /^green$/i,
  red: /^red$/i,
  rededge: /^red[ -]?edge$/i,
  nir: /^(nir|nir1|near[ -]infrared)$/i,
};

/**
 * The 0-based band that plays a role: by name first, else the band whose centre
 * wavelength is nearest the middle of the role's window. Null when none fits.
 */
export function bandForRole(table: BandEntry[], role: BandRole): number | null {
  const named = table.find((b) => roleNames[role].test(b.name.trim()));
  if (named) return named.index - 1;
  const [lo, hi] = roleWindows[role];
  const middle = (lo + hi) / 2;
  let best: BandEntry | null = null;
  for (const band of table) {
    const nm = band.centre_nm;
    if (nm === null || nm < lo || nm > hi) continue;
    if (!best || Math.abs(nm - middle) < Math.abs(best.centre_nm! - middle)) best = band;
  }
  return best ? best.index - 1 : null;
}

/** The two 0-based bands an index needs, or a message saying which role is missing. */
export function indexBands(table: BandEntry[], name: IndexName): { a: number; b: number } | { problem: string } {
  const definition = indexDefinitions[name];
  const a = bandForRole(table, definition.a);
  const b = bandForRole(table, definition.b);
  if (a === null || b === null) {
    const missing = [a === null ? definition.a : null, b === null ? definition.b : null].filter(Boolean).join(' and ');
    return { problem: `${definition.label} needs a ${missing} band, and the band table has none` };
  }
  return { a, b };
}

/**
 * (a - b) / (a + b) per pixel. A pixel where either band is no-data, or both are zero,
 * is NaN (no index there).
 */
export function normalisedDifference(a: ArrayLike<number>, b: ArrayLike<number>, noData: number | null = null): Float32Array {
  if (a.length !== b.length) throw new RangeError(`the two bands differ in length: ${a.length} and ${b.length}`);
  const out = new Float32Array(a.length);
  for (let i = 0; i < a.length; i++) {
    const x = a[i], y = b[i];
    const sum = x + y;
    out[i] = x === noData || y === noData || sum === 0 ? NaN : (x - y) / sum;
  }
  return out;
}
