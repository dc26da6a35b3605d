import type { ValidityReason } from '../geometry/validity.ts';
import type { MultiPolygonRings, Position } from '../geometry/types.ts';

// What the checks report. Every finding names its patches, the place and size of the
// problem and one suggested fix, so a list can group, zoom to and act on it.

export type PatchId = string | number;

export const FINDING_KINDS = [
  'invalid',
  'overlap-same',
  'overlap-mixed',
  'near-duplicate',
  'mixed-tag',
  'undersized',
  'off-image',
] as const;

export type FindingKind = (typeof FINDING_KINDS)[number];

/** error: the patch would corrupt the training set as it stands; warning: worth a look. */
export type Severity = 'error' | 'warning';

export type FixAction =
  | 'repair' // make the outline valid (see repairOutline), showing what changes
  | 'trim' // cut the overlap out of `target`
  | 'merge' // join the patches into one
  | 'delete' // drop `target`, a duplicate
  | 'retag' // settle the species of `target`
  | 'enlarge' // redraw `target` bigger, or drop it from training
  | 'move-inside' // clip `target` to the scene or redraw it on the image
  | 'simplify'; // redraw `target` with fewer vertices

export interface SuggestedFix {
  action: FixAction;
  /** The patch the fix acts on. */
  target: PatchId;
  text: string;
}

export type FindingGeometry =
  | { type: 'Point'; coordinates: Position }
  | { type: 'MultiPolygon'; coordinates: MultiPolygonRings };

export interface Finding {
  kind: FindingKind;
  /** Feature ids; pairs in canonical order (see compareIds). */
  patches: PatchId[];
  severity: Severity;
  message: string;
  /** The problem's size: overlap area, patch area, or area off the image; null for a point problem. */
  area_m2: number | null;
  /** The problem's area as a share of each patch in `patches` (0-1), when it has an area. */
  shares?: number[];
  /** Where the problem is: the overlap polygon, the self-intersection point, ... */
  geometry: FindingGeometry | null;
  fix: SuggestedFix;
  /** invalid: the validity reasons found. */
  reasons?: ValidityReason[];
  /** Kind-specific figures: species, IoU, pure pixel count, ... */
  details?: Record<string, string | number | boolean | string[]>;
}

/** Numbers before strings, then by value: the order findings and pairs use. */
export function compareIds(a: PatchId, b: PatchId): number {
  if (typeof a === 'number' && typeof b === 'number') return a - b;
  if (typeof a === 'number') return -1;
  if (typeof b === 'number') return 1;
  return a < b ? -1 : a > b ? 1 : 0;
}

const kindOrder = Object.fromEntries(FINDING_KINDS.map((k, i) => [k, i])) as Record<FindingKind, number>;

/** Stable order for a findings list: by kind, then by the patches involved. */
export function compareFindings(a: Finding, b: Finding): number {
  const byKind = kindOrder[a.kind] - kindOrder[b.kind];
  if (byKind) return byKind;
  const n = Math.min(a.patches.length, b.patches.length);
  for (let i = 0; i < n; i++) {
    const c = compareIds(a.patches[i], b.patches[i]);
    if (c) return c;
  }
  return a.patches.length - b.patches.length || (a.message < b.message ? -1 : a.message > b.message ? 1 : 0);
}

export function countByKind(findings: Finding[]): Record<FindingKind, number> {
  const counts = Object.fromEntries(FINDING_KINDS.map((k) => [k, 0])) as Record<FindingKind, number>;
  for (const f of findings) counts[f.kind]++;
  return counts;
}

/** One finding per kind and patches: the key a list adds and removes by. */
export const findingKey = (f: Finding) => `${f.kind}|${f.patches.join('\u0001')}`;
