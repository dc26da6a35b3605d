import { Random } from '../random.ts';

// A random sample stratified by species: each species (stratum) gets a share of the
// sample proportional to its size (proportional allocation, Cochran 1977, §5.3:
// n_h = n · N_h / N), rounded by largest remainder so the shares add up to n exactly.
// When the sample has room for it, every species gets at least one patch, so a rare
// species is never left out of the second look (common practice in accuracy assessment;
// Olofsson et al. 2014 recommend a floor for rare strata).

export interface Stratum {
  key: string;
  ids: readonly string[];
}

export interface StratumDraw {
  key: string;
  /** patches in the stratum */
  size: number;
  /** patches drawn from it */
  drawn: number;
}

export interface StratifiedSample {
  /** the drawn patch ids, stratum by stratum, each stratum's in draw order */
  ids: string[];
  strata: StratumDraw[];
}

const byCodePoint = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/** How many to draw from each stratum of the given sizes for a sample of n. */
export function proportionalAllocation(sizes: readonly number[], n: number, floorOfOne = true): number[] {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`the sample size must be a whole number of at least 0, got ${n}`);
  for (const s of sizes) if (!Number.isInteger(s) || s < 0) throw new RangeError(`a stratum size must be a whole number, got ${s}`);
  const total = sizes.reduce((a, b) => a + b, 0);
  if (n >= total) return [...sizes];
  const quotas = sizes.map((s) => (n * s) / total);
  const drawn = quotas.map(Math.floor);
  let left = n - drawn.reduce((a, b) => a + b, 0);
  // Largest remainder first; ties go to the larger stratum, then to the earlier one.
  const order = sizes.map((_, i) => i).sort((a, b) => (quotas[b] - drawn[b]) - (quotas[a] - drawn[a]) || sizes[b] - sizes[a] || a - b);
  for (const i of order) {
    if (left === 0) break;
    if (drawn[i] < sizes[i]) {
      drawn[i]++;
      left--;
    }
  }
  const nonEmpty = sizes.filter((s) => s > 0).length;
  if (floorOfOne && n >= nonEmpty) {
    for (let i = 0; i < sizes.length; i++) {
      if (sizes[i] === 0 || drawn[i] > 0) continue;
      // Take the one from the stratum that has the most drawn above its exact quota.
      let donor = -1;
      for (let j = 0; j < sizes.length; j++) {
        if (drawn[j] <= 1) continue;
        if (donor < 0 || drawn[j] - quotas[j] > drawn[donor] - quotas[donor]) donor = j;
      }
      if (donor < 0) break;
      drawn[donor]--;
      drawn[i]++;
    }
  }
  return drawn;
}

/**
 * Draws a stratified sample of n ids. The same seed and strata give the same sample on
 * any machine; each stratum draws from its own stream (named by its key), so adding a
 * species to the site does not change which patches of another species are drawn.
 */
export function stratifiedSample(strata: readonly Stratum[], n: number, seed: number): StratifiedSample {
  const sorted = [...strata].sort((a, b) => byCodePoint(a.key, b.key));
  const keys = new Set<string>();
  for (const s of sorted) {
    if (keys.has(s.key)) throw new RangeError(`stratum '${s.key}' is listed twice`);
    keys.add(s.key);
  }
  const allocation = proportionalAllocation(sorted.map((s) => s.ids.length), n);
  const random = new Random(seed);
  const ids: string[] = [];
  const draws: StratumDraw[] = sorted.map((stratum, i) => {
    const pool = [...stratum.ids].sort(byCodePoint);
    random.fork(stratum.key).shuffle(pool);
    ids.push(...pool.slice(0, allocation[i]));
    return { key: stratum.key, size: pool.length, drawn: allocation[i] };
  });
  return { ids, strata: draws };
}
