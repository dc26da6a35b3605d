import { consensus } from '../../core/export/consensus.ts';
import { multiPolygonArea } from '../../core/geometry/measure.ts';
import type { RasterGrid } from '../../core/geometry/rasterGrid.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { countPixels, type PixelCountReport } from '../../core/pixels/pixelCounts.ts';
import type { PixelRule } from '../../core/pixels/rule.ts';
import type { SiteState } from '../../core/site/state.ts';
import type { Ruling, Tag } from '../../core/site/types.ts';
import { classBalance, type Balance, type BalanceOptions } from '../../core/training/balance.ts';
import { foldReport, type FoldReport } from '../../core/training/foldReport.ts';
import { applyFoldGap, type GapAction } from '../../core/training/foldGap.ts';
import { assignFolds, type FoldAssignment, type FoldOptions } from '../../core/training/folds.ts';
import { applyScheme, type Scheme } from '../../core/training/scheme.ts';
import { describeRule } from '../../core/pixels/rule.ts';

// The training sheet of a site: which patches can train (a settled species), their
// pure pixels on the multispectral grid, class balance under a scheme, and folds (with
// an optional gap between them).

export interface TrainingPatch {
  id: string;
  species: string;
  rings: MultiPolygonRings;
  area: number;
}

export interface TrainingSet {
  patches: TrainingPatch[];
  /** Patches that cannot train, by reason ("the calls differ: ..." folded to its kind). */
  leftOut: Record<string, string[]>;
}

const MIXED = 'mixed';

/** Patches with a settled single species (agreed, single call or ruled); the rest by reason. */
export function trainingSet(state: SiteState): TrainingSet {
  const tagsOf = new Map<string, Tag[]>();
  for (const tag of state.tags.values()) (tagsOf.get(tag.patchId) ?? tagsOf.set(tag.patchId, []).get(tag.patchId)!).push(tag);
  const rulingsOf = new Map<string, Ruling[]>();
  for (const r of state.rulings.values()) (rulingsOf.get(r.patchId) ?? rulingsOf.set(r.patchId, []).get(r.patchId)!).push(r);
  const patches: TrainingPatch[] = [];
  const leftOut: Record<string, string[]> = {};
  const leave = (why: string, id: string) => (leftOut[why] ??= []).push(id);
  for (const patch of state.patches.values()) {
    const c = consensus(tagsOf.get(patch.id) ?? [], rulingsOf.get(patch.id) ?? []);
    if (c.species === null) leave(c.status === 'untagged' ? 'untagged' : c.status === 'excluded' ? 'excluded by a ruling' : 'calls not settled', patch.id);
    else if (c.species === MIXED) leave('tagged mixed', patch.id);
    else patches.push({ id: patch.id, species: c.species, rings: patch.geometry, area: multiPolygonArea(patch.geometry) });
  }
  return { patches, leftOut };
}

export interface SheetOptions {
  rule: PixelRule;
  scheme: Scheme;
  balance?: BalanceOptions;
  folds?: FoldOptions;
  /** Patches nearer than this to a patch of another fold are left out or reported (foldGap.ts). */
  gap?: { distance: number; action: GapAction };
}

export interface TrainingSheet {
  pixels: PixelCountReport;
  balance: Balance;
  assignment: FoldAssignment;
  folds: FoldReport;
  /** Pixel problems, unmapped species and fold warnings, each one line. */
  messages: string[];
}

/** Everything the sheet shows, from the training patches and the multispectral grid. */
export function trainingSheet(set: TrainingSet, grid: RasterGrid, options: SheetOptions): TrainingSheet {
  const pixels = countPixels(set.patches, grid, options.rule);
  const items = set.patches.map((p, i) => ({ id: p.id, species: p.species, area: p.area, pure: pixels.patches[i].pure }));
  const balance = classBalance(items, options.scheme, options.balance);
  const classes = applyScheme(options.scheme, set.patches.map((p) => p.species)).classes;
  const foldPatches = set.patches
    .map((p, i) => ({ id: p.id, cls: classes[i], rings: p.rings, weight: pixels.patches[i].pure }))
    .filter((p): p is { id: string; cls: string; rings: MultiPolygonRings; weight: number } => p.cls !== null);
  const dealt = assignFolds(foldPatches, options.folds);
  const { assignment, gap } = options.gap?.distance ? applyFoldGap(foldPatches, dealt, options.gap.distance, options.gap.action) : { assignment: dealt, gap: null };
  const folds = foldReport(foldPatches, assignment, gap);
  return { pixels, balance, assignment, folds, messages: [...pixels.messages, ...balance.warnings, ...assignment.messages] };
}

/** What the sheet shows, without the per-pixel detail: what a worker hands back. */
export interface SheetSummary {
  ruleText: string;
  balance: Balance;
  folds: FoldReport;
  messages: string[];
}

export interface SheetJob {
  set: TrainingSet;
  grid: RasterGrid;
  options: SheetOptions;
}

/** The sheet's figures for a job: the training sheet worker runs this, tests run it inline. */
export function sheetSummary(job: SheetJob): SheetSummary {
  const sheet = trainingSheet(job.set, job.grid, job.options);
  return { ruleText: describeRule(job.options.rule), balance: sheet.balance, folds: sheet.folds, messages: sheet.messages };
}
