import type { StretchLimits } from '../../core/render/stretch.ts';
import type { SharpenMethod } from '../../core/render/pansharpen.ts';
import type { IndexName } from '../../core/render/indices.ts';

// What one imagery layer shows, as plain data: the view state derives it, the map turns
// it into a tile source. Equal specs give the same tiles, so a spec's key names its source.

export type LayerSpec =
  | { kind: 'pan'; scene: number; limits: StretchLimits }
  | { kind: 'bands'; scene: number; bands: [number, number, number]; limits: StretchLimits[] }
  | { kind: 'sharpened'; scene: number; method: SharpenMethod; bands: [number, number, number]; limits: StretchLimits[]; gain: number }
  | { kind: 'index'; scene: number; index: IndexName; a: number; b: number; low: number; high: number; threshold: number | null };

/** A second date beside the first: wiped across at `position` (0-1 of the width), or flickered. */
export interface CompareSpec {
  mode: 'swipe' | 'flicker';
  layer: LayerSpec;
  position: number;
}

export function specKey(spec: LayerSpec): string {
  return JSON.stringify(spec);
}
