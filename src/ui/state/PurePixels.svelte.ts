import type { RasterGrid } from '../../core/geometry/rasterGrid.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { patchPixels, type PatchPixels } from '../../core/pixels/patchPixels.ts';
import type { PixelRule } from '../../core/pixels/rule.ts';
import type { PixelRuleChoice } from './PixelRuleChoice.svelte.ts';

// The pure pixels the desk's map shows (Shift+P): for each outline, the multispectral
// pixels the chosen rule keeps, by the same computation as the training sheet and the
// undersized check (core/pixels). Kept per outline while the rule and grid stay the
// same (outlines are replaced, never changed in place, when a patch is edited).

export class PurePixels {
  shown = $state(false);
  #kept = new WeakMap<MultiPolygonRings, { key: string; pixels: PatchPixels }>();

  constructor(readonly choice: PixelRuleChoice, readonly grid: () => RasterGrid | null) {}

  toggle(): void {
    this.shown = !this.shown;
  }

  /** The rule in force, or null while the chosen one cannot be used. */
  get rule(): PixelRule | null {
    return this.choice.problem ? null : this.choice.rule;
  }

  /** The pixels of an outline under the rule (pure ones listed, every touched one in `coverage`), or null without a grid or rule. */
  of(outline: MultiPolygonRings): PatchPixels | null {
    const grid = this.grid();
    const rule = this.rule;
    if (!grid || !rule) return null;
    const key = `${JSON.stringify(rule)}|${grid.originX},${grid.originY},${grid.pixelWidth},${grid.pixelHeight}`;
    const kept = this.#kept.get(outline);
    if (kept?.key === key) return kept.pixels;
    const pixels = patchPixels(outline, grid, rule);
    this.#kept.set(outline, { key, pixels });
    return pixels;
  }

  /** Pure and touched pixel counts of an outline, or null. */
  countOf(outline: MultiPolygonRings): { pure: number; touched: number } | null {
    const pixels = this.of(outline);
    if (!pixels) return null;
    let touched = 0;
    for (const f of pixels.coverage.fraction) if (f > 0) touched++;
    return { pure: pixels.rows.length, touched };
  }
}
