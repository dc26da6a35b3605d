import type { RasterGrid } from '../geometry/rasterGrid.ts';
import type { MultiPolygonRings } from '../geometry/types.ts';
import { innerRadius, patchPixels, type PatchPixels } from './patchPixels.ts';
import { describeRule, type PixelRule } from './rule.ts';

// Pure pixels counted per patch and per species, with what spoils them told plainly:
// a buffer wider than the patch, no-data pixels inside it, a patch off the grid.

export interface PixelPatch {
  id: string | number;
  species: string;
  rings: MultiPolygonRings;
}

/** True when the scene has no data at this grid pixel (any band). */
export type NoDataTest = (row: number, col: number) => boolean;

export interface PatchPixelCount {
  id: string | number;
  species: string;
  /** Pure pixels with data. */
  pure: number;
  /** Pixels the rule chose that hold no data (left out of `pure`). */
  noData: number;
  /** Pixels the patch touches at all (coverage above 0). */
  touched: number;
  pixels: PatchPixels;
  /** Plain-language notes about this patch, e.g. a buffer wider than the patch. */
  problems: string[];
}

export interface PixelCountReport {
  rule: PixelRule;
  ruleText: string;
  patches: PatchPixelCount[];
  /** Pure pixels per species. */
  classes: Record<string, number>;
  /** Every patch's problems, each naming the patch. */
  messages: string[];
}

export function countPixels(patches: readonly PixelPatch[], grid: RasterGrid, rule: PixelRule, noData?: NoDataTest): PixelCountReport {
  const out: PatchPixelCount[] = [];
  const classes: Record<string, number> = {};
  const messages: string[] = [];
  for (const patch of patches) {
    const pixels = patchPixels(patch.rings, grid, rule);
    const problems: string[] = [];
    let touched = 0;
    for (const f of pixels.coverage.fraction) if (f > 0) touched++;
    let noDataCount = 0;
    if (noData) {
      for (let i = 0; i < pixels.rows.length; i++) if (noData(pixels.rows[i], pixels.cols[i])) noDataCount++;
    }
    const pure = pixels.rows.length - noDataCount;
    if (touched === 0) {
      problems.push('lies off the raster grid: no pixels');
    } else if (rule.kind === 'inside' && rule.buffer > 0 && pixels.rows.length === 0) {
      const radius = innerRadius(patch.rings);
      if (radius < rule.buffer) {
        problems.push(`the ${rule.buffer} m buffer is wider than the patch (its widest inner circle has a radius of ${radius.toFixed(2)} m), so nothing is left to hold pure pixels`);
      }
    }
    if (noDataCount > 0) problems.push(`${noDataCount} of its ${pixels.rows.length} chosen pixel(s) hold no data in the scene and are left out`);
    for (const p of problems) messages.push(`patch ${patch.id}: ${p}`);
    classes[patch.species] = (classes[patch.species] ?? 0) + pure;
    out.push({ id: patch.id, species: patch.species, pure, noData: noDataCount, touched, pixels, problems });
  }
  return { rule, ruleText: describeRule(rule), patches: out, classes, messages };
}
