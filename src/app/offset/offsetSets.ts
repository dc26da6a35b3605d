import type { Extent } from '../../core/geometry/types.ts';
import { extentOfRings } from '../../core/geometry/measure.ts';
import type { Patch, SiteState } from '../../core/site/index.ts';

// The sets of patches a shift is estimated for: one imported field file (the usual
// case: one GPS, one walk), every imported patch, every patch, or those on screen.

export type OffsetSetChoice =
  | { kind: 'import'; importId: string }
  | { kind: 'imported' }
  | { kind: 'all' }
  | { kind: 'in-view'; extent: Extent };

export interface OffsetSetOption {
  key: string;
  label: string;
  choice: OffsetSetChoice;
}

const overlaps = (a: Extent, b: Extent) => a[0] < b[2] && a[2] > b[0] && a[1] < b[3] && a[3] > b[1];

export function patchesOfSet(state: SiteState, choice: OffsetSetChoice): Patch[] {
  const all = [...state.patches.values()];
  switch (choice.kind) {
    case 'import':
      return all.filter((p) => p.source.kind === 'import' && p.source.importId === choice.importId);
    case 'imported':
      return all.filter((p) => p.source.kind === 'import');
    case 'all':
      return all;
    case 'in-view':
      return all.filter((p) => overlaps(extentOfRings(p.geometry), choice.extent));
  }
}

/** The sets the desk offers, imports first (newest first). */
export function offsetSetOptions(state: SiteState, viewExtent: Extent | null): OffsetSetOption[] {
  const imports = [...state.imports.values()].sort((a, b) => b.time.localeCompare(a.time));
  const options: OffsetSetOption[] = imports.map((r) => ({
    key: `import:${r.id}`, label: `Imported from ${r.fileName}`, choice: { kind: 'import', importId: r.id },
  }));
  if (imports.length > 1) options.push({ key: 'imported', label: 'Every imported patch', choice: { kind: 'imported' } });
  options.push({ key: 'all', label: 'Every patch of the site', choice: { kind: 'all' } });
  if (viewExtent) options.push({ key: 'in-view', label: 'The patches on screen', choice: { kind: 'in-view', extent: viewExtent } });
  return options;
}
