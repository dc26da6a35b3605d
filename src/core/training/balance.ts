import { applyScheme, type Scheme } from './scheme.ts';

// Class balance under a scheme, and the trivial baselines a classifier has to beat:
// always calling the majority class (the "maximum chance criterion"), and guessing each
// class as often as it occurs, right with probability Σ p² (the "proportional chance
// criterion"); both from Morrison (1969), "On the interpretation of discriminant
// analysis", Journal of Marketing Research 6, 156-163.

export interface BalanceItem {
  id: string | number;
  species: string;
  /** Area in m². */
  area: number;
  /** Pure pixels (under whichever rule the caller chose). */
  pure: number;
}

export interface BalanceOptions {
  /** A class holding less than this share of the pure pixels is rare. Default 0.05. */
  rareShare?: number;
  /** A class with fewer pure pixels than this is rare. Default 50. */
  rareCount?: number;
}

export interface ClassBalance {
  name: string;
  patches: number;
  area: number;
  pure: number;
  patchShare: number;
  areaShare: number;
  pureShare: number;
  rare: boolean;
}

export interface Baselines {
  /** The class a constant guess would call (most pure pixels; ties by name). */
  majorityClass: string | null;
  /** Accuracy of always calling the majority class: its share. */
  majorityAccuracy: number;
  /** Expected accuracy of guessing classes at their own frequencies: Σ share². */
  frequencyAccuracy: number;
}

export interface Balance {
  scheme: string;
  classes: ClassBalance[];
  totals: { patches: number; area: number; pure: number };
  /** On pure pixels (the training samples) and on patches. */
  baselines: { pixels: Baselines; patches: Baselines };
  unmapped: string[];
  warnings: string[];
}

export function baselines(counts: ReadonlyMap<string, number>): Baselines {
  let total = 0;
  for (const v of counts.values()) total += v;
  if (total === 0) return { majorityClass: null, majorityAccuracy: 0, frequencyAccuracy: 0 };
  let best: string | null = null;
  let bestCount = -1;
  let squares = 0;
  for (const [name, v] of [...counts].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))) {
    if (v > bestCount) { best = name; bestCount = v; }
    squares += (v / total) ** 2;
  }
  return { majorityClass: best, majorityAccuracy: bestCount / total, frequencyAccuracy: squares };
}

export function classBalance(items: readonly BalanceItem[], scheme: Scheme, options: BalanceOptions = {}): Balance {
  const rareShare = options.rareShare ?? 0.05;
  const rareCount = options.rareCount ?? 50;
  const applied = applyScheme(scheme, items.map((i) => i.species));
  const byClass = new Map<string, { patches: number; area: number; pure: number }>();
  // Every class the scheme names is listed, even with nothing in it.
  for (const cls of new Set(Object.values(scheme.classOf))) byClass.set(cls, { patches: 0, area: 0, pure: 0 });
  const totals = { patches: 0, area: 0, pure: 0 };
  items.forEach((item, i) => {
    const cls = applied.classes[i];
    if (cls === null) return;
    const row = byClass.get(cls)!;
    row.patches++; row.area += item.area; row.pure += item.pure;
    totals.patches++; totals.area += item.area; totals.pure += item.pure;
  });
  const share = (v: number, t: number) => (t > 0 ? v / t : 0);
  const classes: ClassBalance[] = [...byClass].map(([name, row]) => {
    const pureShare = share(row.pure, totals.pure);
    return {
      name, ...row,
      patchShare: share(row.patches, totals.patches),
      areaShare: share(row.area, totals.area),
      pureShare,
      rare: pureShare < rareShare || row.pure < rareCount,
    };
  });
  classes.sort((a, b) => b.pure - a.pure || (a.name < b.name ? -1 : 1));
  const warnings = [...applied.messages];
  for (const c of classes) {
    if (!c.rare) continue;
    const why = c.pure < rareCount ? `${c.pure} pure pixel(s), under ${rareCount}` : `${(c.pureShare * 100).toFixed(1)} % of the pure pixels, under ${(rareShare * 100).toFixed(1)} %`;
    warnings.push(`class ${c.name} is rare: ${why}`);
  }
  return {
    scheme: scheme.name,
    classes,
    totals,
    baselines: {
      pixels: baselines(new Map(classes.map((c) => [c.name, c.pure]))),
      patches: baselines(new Map(classes.map((c) => [c.name, c.patches]))),
    },
    unmapped: applied.unmapped,
    warnings,
  };
}
