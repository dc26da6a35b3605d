import type { MultiPolygonRings } from '../geometry/types.ts';
import { hashUnit } from '../random.ts';
import { bootstrapShift, latticePeak, type BootstrapSummary } from './bootstrap.ts';
import { patchTemplate, type PatchTemplate } from './patchTemplate.ts';
import { peakSignificance } from './significance.ts';
import { ownPeak, residualsAgainst, type OwnPeak, type PatchResidual } from './residuals.ts';
import { combine, evaluateLattice, latticeNodes, latticeSide, nodeInRadius, nodeShift, onRim, type ShiftLattice } from './shiftLattice.ts';
import { isConstant, type SignalGrid, type SignalKind } from './signalGrid.ts';

// Estimates the one shift that puts a set of field polygons on the imagery: the shift
// that maximizes the mean contrast of the signal inside the polygons against a ring
// just outside, searched coarse to fine and fitted below a lattice step, with an
// uncertainty by bootstrap over the polygons, per-polygon residuals and outliers, and
// a plain "no reliable shift" when the imagery does not say.

export interface OffsetSettings {
  /** Largest shift tried, metres (default 3). */
  radius: number;
  /** Coarse lattice step, metres (default: two panchromatic pixels). */
  coarseStep: number;
  /** The fine lattice divides the coarse step by this (default 8: a quarter of a
   * panchromatic pixel); a middle lattice of twice that step spans one coarse step
   * either side of the coarse peak, the final one two steps either side of the middle
   * peak. */
  refine: number;
  /** Sample-point spacing inside and around the polygons, metres (default: a third of
   * the signal pixel, at least one panchromatic pixel). */
  spacing: number;
  /** Each patch's own best shift is sought this much farther than the radius, metres
   * (default 2), so a misplaced polygon shows where it fits. */
  ownReach: number;
  /** Width of the ring just outside each polygon, metres (default 1.2). */
  ringWidth: number;
  /** Bootstrap replicates (default 200) and their seed (default 1). */
  replicates: number;
  seed: number;
  /** Outliers: a residual longer than this many robust scales (default 3.5) ... */
  outlierZ: number;
  /** ... and a residual longer than this, metres (default 0.75). */
  outlierMinM: number;
  /** Outliers: contrast at the common shift below this share of the patch's own best (default 0.5). */
  outlierMinFit: number;
  /** The peak must stand this many standard deviations above the peaks of randomly
   * misaligned surrogates (default 4), of which there are `surrogates` (default 100). */
  minSignificance: number;
  surrogates: number;
  signal: SignalKind;
}

export interface OffsetPatch {
  id: string | number;
  rings: MultiPolygonRings;
}

export interface OffsetPatchResult extends PatchResidual {
  id: string | number;
  /** The patch's contrast at the common shift (signal units); null off the imagery. */
  contrast: number | null;
}

/** The coarse score surface, for a heat map: row 0 is the southernmost. */
export interface ScoreSurface {
  step: number;
  half: number;
  /** (2 half + 1)^2 values row by row, null outside the radius. */
  values: (number | null)[];
}

export interface OffsetEstimate {
  reliable: boolean;
  /** Why the shift is not reliable (empty when it is). */
  reasons: string[];
  /** The shift to apply to the polygons, metres east and north; null when not reliable. */
  dx: number | null;
  dy: number | null;
  /** The best shift found, reliable or not (for display), metres. */
  candidate: [number, number] | null;
  /** 95 % radius of the bootstrap replicates around the estimate, metres. */
  uncertainty: number | null;
  bootstrap: BootstrapSummary | null;
  /** The peak over chance alignments, in standard deviations (see significance.ts). */
  significance: number;
  /** The patches used, in input order, and the outliers among them. */
  patches: OffsetPatchResult[];
  outliers: (string | number)[];
  surface: ScoreSurface;
  settings: OffsetSettings;
}

/** Defaults for a scene of this panchromatic pixel and signal pixel (metres). */
export function defaultSettings(panPixel: number, signalPixel: number, overrides: Partial<OffsetSettings> = {}): OffsetSettings {
  const coarseStep = overrides.coarseStep ?? 2 * panPixel;
  return {
    radius: 3, coarseStep, refine: 8, spacing: Math.max(panPixel / 2, signalPixel / 4), ownReach: 2, ringWidth: 1.2, replicates: 200, seed: 1,
    outlierZ: 3.5, outlierMinM: 0.75, outlierMinFit: 0.5, minSignificance: 4, surrogates: 100, signal: 'ndvi', ...overrides,
  };
}

/** Sample templates of the patches on the signal grid. */
export function templatesFor(patches: readonly OffsetPatch[], grid: SignalGrid, settings: OffsetSettings): PatchTemplate[] {
  return patches.map((p, i) => patchTemplate(p.id, p.rings, grid, settings, [hashUnit(settings.seed, i, 0, 1), hashUnit(settings.seed, i, 0, 2)]));
}

/** The coarse lattice around the zero shift: tried out to radius + ownReach for each
 * patch's own peak, searched within the radius for the common one. */
function coarseLattices(settings: OffsetSettings): { wide: ShiftLattice; search: ShiftLattice } {
  const reach = settings.radius + settings.ownReach;
  const half = Math.ceil(reach / settings.coarseStep - 1e-9);
  const wide = { cx: 0, cy: 0, step: settings.coarseStep, half, radius: reach };
  return { wide, search: { ...wide, radius: settings.radius } };
}

/** The common score surface over the inliers, NaN outside the search radius. */
function searchSurface(perCoarse: Float32Array, n: number, inlier: ArrayLike<number>, search: ShiftLattice): Float64Array {
  const nodes = latticeNodes(search);
  const total = combine(perCoarse, n, nodes, inlier);
  for (let k = 0; k < nodes; k++) if (!nodeInRadius(search, k)) total[k] = NaN;
  return total;
}

/** The surface cut to the search disc's square. */
function surfaceOf(total: Float64Array, l: ShiftLattice): ScoreSurface {
  const half = Math.min(l.half, Math.ceil(l.radius / l.step - 1e-9));
  const side = latticeSide(l);
  const values: (number | null)[] = [];
  for (let row = l.half - half; row <= l.half + half; row++) {
    for (let col = l.half - half; col <= l.half + half; col++) {
      const v = total[row * side + col];
      values.push(Number.isFinite(v) ? Number(v.toPrecision(6)) : null);
    }
  }
  return { step: l.step, half, values };
}

const round = (v: number, d = 4) => Number(v.toFixed(d));

/**
 * Estimates the common shift of the patches on a signal grid. Needs at least two
 * patches (throws RangeError otherwise: one polygon cannot tell a shift from its own error).
 */
export function estimateShift(patches: readonly OffsetPatch[], grid: SignalGrid, settings: OffsetSettings): OffsetEstimate {
  if (patches.length < 2) throw new RangeError(`needs at least two polygons to tell a common shift from their own errors, got ${patches.length}`);
  return estimateFromTemplates(templatesFor(patches, grid, settings), grid, settings);
}

export function estimateFromTemplates(templates: readonly PatchTemplate[], grid: SignalGrid, settings: OffsetSettings): OffsetEstimate {
  const n = templates.length;
  const { wide, search: coarse } = coarseLattices(settings);
  const perCoarse = evaluateLattice(templates, grid, wide);
  const rule = { zLimit: settings.outlierZ, minDistance: settings.outlierMinM, minFit: settings.outlierMinFit };
  const reasons: string[] = [];
  if (isConstant(grid)) reasons.push('the imagery under the polygons is flat (one value everywhere): it carries no signal');

  // Robust loop: estimate from the inliers, flag against that estimate, until the
  // set of outliers no longer changes (at most a few rounds).
  let inlier = new Uint8Array(n).fill(1);
  let residuals: PatchResidual[] = [];
  let own: (OwnPeak | null)[] = templates.map(() => null);
  let fine: ShiftLattice | null = null;
  let perFine: Float32Array = new Float32Array(0);
  let peak: ReturnType<typeof latticePeak> = null;
  let coarseTotal = searchSurface(perCoarse, n, inlier, coarse);
  let coarseBest: ReturnType<typeof latticePeak> = null;
  for (let round = 0; round < 4; round++) {
    coarseTotal = searchSurface(perCoarse, n, inlier, coarse);
    coarseBest = latticePeak(coarseTotal, coarse);
    if (!coarseBest) break;
    const [cx, cy] = nodeShift(coarse, coarseBest.node);
    if (!fine || fine.cx !== cx || fine.cy !== cy) {
      // The middle lattice: half the final step, one coarse step either side.
      const half = Math.max(1, Math.round(settings.refine / 2));
      fine = { cx, cy, step: settings.coarseStep / half, half, radius: settings.radius };
      perFine = evaluateLattice(templates, grid, fine);
    }
    peak = latticePeak(combine(perFine, n, latticeNodes(fine), inlier), fine);
    if (!peak) break;
    const fineNodes = latticeNodes(fine);
    const common = peak.shift;
    own = templates.map((_, p) => ownPeak(perCoarse, p, wide, common));
    const atCommon = templates.map((_, p) => perFine[p * fineNodes + peak!.node]);
    residuals = residualsAgainst(own, atCommon, peak.shift, rule);
    const next = Uint8Array.from(residuals, (r) => (r.outlier ? 0 : 1));
    const inliers = next.reduce((s, v) => s + v, 0);
    if (inliers < 2 || next.every((v, i) => v === inlier[i])) {
      if (inliers >= 2) inlier = next;
      break;
    }
    inlier = next;
  }

  const members = [...inlier.keys()].filter((i) => inlier[i] === 1);
  // The final lattice: the final step, two nodes either side of the middle peak's node.
  let finalPeak: ReturnType<typeof latticePeak> = null;
  if (peak && fine) {
    const [fx, fy] = nodeShift(fine, peak.node);
    const last: ShiftLattice = { cx: fx, cy: fy, step: settings.coarseStep / settings.refine, half: 2, radius: settings.radius };
    finalPeak = latticePeak(combine(evaluateLattice(templates, grid, last), n, latticeNodes(last), inlier), last);
    if (finalPeak && !finalPeak.fitted) finalPeak = null;
  }
  let significance = 0;
  let bootstrap: BootstrapSummary | null = null;
  if (!coarseBest || !peak || !fine) {
    reasons.push('no polygon has imagery under it at any tried shift');
  } else {
    // On the rim of the fine lattice: next to the radius, or the coarse peak was not the true one.
    if (onRim(fine, peak.node)) {
      reasons.push(`the best fit lies on the edge of the ${settings.radius} m search radius: the shift may be larger`);
    }
    if (!peak.fitted || !finalPeak) reasons.push('the score surface has no clear peak (its fitted curvature is not a maximum)');
    // Over all patches: the inliers were chosen for agreeing, which would flatter them.
    significance = peakSignificance(perCoarse, [...templates.keys()], coarse, settings.surrogates, settings.seed + 1);
    if (!(significance >= settings.minSignificance)) {
      reasons.push(`the peak does not stand out (${significance.toFixed(1)} standard deviations above chance alignments, ${settings.minSignificance} needed)`);
    }
    if (members.length < 2) reasons.push('fewer than two polygons agree on a shift');
    else {
      bootstrap = bootstrapShift(perFine, members, n, fine, peak.shift, settings.replicates, settings.seed);
      if (bootstrap.rimHits > 0.05 * bootstrap.replicates) {
        reasons.push(`the estimate is unstable: ${bootstrap.rimHits} of ${bootstrap.replicates} bootstrap replicates peak at the edge of the fine search`);
      }
    }
  }

  const reliable = reasons.length === 0;
  const fineNodes = fine ? latticeNodes(fine) : 0;
  const patchResults: OffsetPatchResult[] = templates.map((t, p) => {
    const r = residuals[p] ?? { own: own[p]?.shift ?? null, residual: null, distance: null, z: null, fit: null, outlier: false };
    const c = peak ? perFine[p * fineNodes + peak.node] : NaN;
    return {
      id: t.id,
      contrast: Number.isFinite(c) ? round(c, 5) : null,
      own: r.own && [round(r.own[0]), round(r.own[1])],
      residual: r.residual && [round(r.residual[0]), round(r.residual[1])],
      distance: r.distance === null ? null : round(r.distance),
      z: r.z === null ? null : round(r.z, 2),
      fit: r.fit === null ? null : round(r.fit, 3),
      outlier: reliable ? r.outlier : false,
    };
  });
  return {
    reliable,
    reasons,
    dx: reliable && finalPeak ? finalPeak.shift[0] : null,
    dy: reliable && finalPeak ? finalPeak.shift[1] : null,
    candidate: finalPeak ? finalPeak.shift : peak ? peak.shift : null,
    uncertainty: reliable && bootstrap ? bootstrap.radius95 : null,
    bootstrap,
    significance,
    patches: patchResults,
    outliers: patchResults.filter((r) => r.outlier).map((r) => r.id),
    surface: surfaceOf(coarseTotal, coarse),
    settings,
  };
}


