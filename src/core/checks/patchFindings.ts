import OverlayOp from 'jsts/org/locationtech/jts/operation/overlay/OverlayOp.js';
import { fromJsts, jstsPolygon } from '../geometry/jstsBridge.ts';
import { multiPolygonArea } from '../geometry/measure.ts';
import { countPurePixels } from '../geometry/purePixels.ts';
import { gridExtent, type RasterGrid } from '../geometry/rasterGrid.ts';
import { singleRing } from '../geometry/exactOverlap.ts';
import { ringOverlay } from '../geometry/ringOverlay.ts';
import type { Extent, MultiPolygonRings, Ring } from '../geometry/types.ts';
import type { Finding } from './findings.ts';
import type { NoDataCover, NoDataMask } from './noDataMask.ts';
import { middlePixelIsPure, noPixelFitsInBox } from './pixelScreen.ts';
import { jstsOf, type PreparedPatch } from './preparedPatch.ts';
import type { CheckSettings, SceneGrids } from './settings.ts';

// The checks that look at one patch alone: invalid, mixed-tag, undersized, off-image.

const round = (value: number, digits = 3) => Math.round(value * 10 ** digits) / 10 ** digits;
const percent = (share: number) => `${Math.round(share * 1000) / 10} %`;

/** The answer for most patches, shared (never changed by callers). */
const NONE: Finding[] = Object.freeze([]) as unknown as Finding[];

export function patchFindings(patch: PreparedPatch, settings: CheckSettings, scene: SceneGrids): Finding[] {
  const invalid = invalidFinding(patch);
  const mixed = mixedTagFinding(patch, settings);
  const undersized = patch.shape ? undersizedFinding(patch, settings, scene) : null;
  const offImage = patch.shape ? offImageFinding(patch, settings, scene) : null;
  if (!invalid && !mixed && !undersized && !offImage) return NONE;
  return [invalid, mixed, undersized, offImage].filter((f) => f !== null);
}

function invalidFinding(patch: PreparedPatch): Finding | null {
  const { issues, input } = patch;
  if (issues.length === 0) return null;
  const reasons = [...new Set(issues.map((issue) => issue.reason))];
  const located = issues.find((issue) => issue.point && Number.isFinite(issue.point[0]) && Number.isFinite(issue.point[1]));
  const onlyRepeats = reasons.every((r) => r === 'repeated-point');
  const tooBig = reasons.includes('vertex-limit');
  const repairText = patch.repair
    ? (patch.repair.changes.length ? patch.repair.changes.join('; ') : 'no change needed')
    : onlyRepeats ? 'remove the repeated positions' : '';
  return {
    kind: 'invalid',
    patches: [input.id],
    severity: onlyRepeats ? 'warning' : 'error',
    message: `patch ${input.id} is not a valid polygon: ${issues.map((issue) => issue.message).join('; ')}`
      + (located ? ` (at ${located.point!.map((v) => v.toFixed(2)).join(', ')})` : ''),
    area_m2: null,
    geometry: located ? { type: 'Point', coordinates: located.point! } : null,
    reasons,
    fix: tooBig
      ? { action: 'simplify', target: input.id, text: `redraw patch ${input.id} with fewer vertices` }
      : patch.repair && patch.repair.rings.length === 0
        ? { action: 'delete', target: input.id, text: `delete or redraw patch ${input.id}: nothing with area is left to repair (${repairText})` }
        : { action: 'repair', target: input.id, text: `make patch ${input.id} valid: ${repairText}` },
    details: patch.repair
      ? { repairedAreaM2: round(patch.repair.areaAfter), repairedParts: patch.repair.rings.length, repairChanges: patch.repair.changes }
      : {},
  };
}

interface MixedCodes {
  /** The "mixed" codes in lower case. */
  codes: Set<string>;
  /** Whether a species call as written means mixed: a site has a handful of calls. */
  calls: Map<string, boolean>;
}

const mixedSets = new WeakMap<CheckSettings, MixedCodes>();

/** The "mixed" codes, made once per settings object. */
function mixedCodeSet(settings: CheckSettings): MixedCodes {
  let set = mixedSets.get(settings);
  if (!set) mixedSets.set(settings, (set = { codes: new Set(settings.mixedCodes.map((c) => c.toLowerCase())), calls: new Map() }));
  return set;
}

function isMixedCall(species: string, mixed: MixedCodes): boolean {
  let answer = mixed.calls.get(species);
  if (answer === undefined) mixed.calls.set(species, (answer = mixed.codes.has(species.trim().toLowerCase())));
  return answer;
}

function mixedTagFinding(patch: PreparedPatch, settings: CheckSettings): Finding | null {
  const { input } = patch;
  const mixed = mixedCodeSet(settings);
  // Most patches carry one call that is not "mixed": nothing to build.
  if (!input.tags?.length && !isMixedCall(input.species, mixed)) return null;
  const mixedCodes = mixed.codes;
  const calls = [input.species, ...(input.tags ?? []).map((t) => t.species)].map((s) => s.trim());
  const taggedMixed = calls.some((c) => mixedCodes.has(c.toLowerCase()));
  const distinct = [...new Set(calls)].sort();
  if (!taggedMixed && distinct.length < 2) return null;
  const message = taggedMixed
    ? `patch ${input.id} is tagged as mixed: it cannot train a single species`
    : `the tags of patch ${input.id} disagree: ${distinct.join(', ')}`;
  return {
    kind: 'mixed-tag',
    patches: [input.id],
    severity: 'warning',
    message,
    area_m2: patch.shape ? round(patch.area) : null,
    geometry: null,
    fix: { action: 'retag', target: input.id, text: `settle one species for patch ${input.id}, or split it into single-species patches` },
    details: { species: distinct },
  };
}

function undersizedFinding(patch: PreparedPatch, settings: CheckSettings, scene: SceneGrids): Finding | null {
  const { input, area } = patch;
  const msArea = settings.msPixelSize * settings.msPixelSize;
  const minArea = settings.minAreaInMsPixels * msArea;
  let why: string | null = null;
  let pure: number | null = null;
  if (area < minArea) {
    why = `covers ${round(area, 2)} m², under ${settings.minAreaInMsPixels} multispectral pixels (${round(minArea, 2)} m²)`;
  } else if (scene.ms && settings.minPurePixels > 0 && overlapsGrid(patch, scene.ms)
    && !(settings.minPurePixels === 1 && middlePixelIsPure(patch.shape!, patch.extent!, scene.ms))) {
    pure = noPixelFitsInBox(patch.extent!, scene.ms) ? 0 : countPurePixels(patch.shape!, scene.ms, settings.minPurePixels);
    if (pure < settings.minPurePixels) {
      why = `holds ${pure} pure multispectral pixel(s), fewer than ${settings.minPurePixels}`;
    }
  }
  if (!why) return null;
  const details: Record<string, number> = { areaM2: round(area), minAreaM2: round(minArea) };
  if (pure !== null) {
    details.purePixels = pure;
    details.minPurePixels = settings.minPurePixels;
  }
  return {
    kind: 'undersized',
    patches: [input.id],
    severity: 'warning',
    message: `patch ${input.id} ${why}`,
    area_m2: round(area),
    geometry: null,
    fix: { action: 'enlarge', target: input.id, text: `redraw patch ${input.id} to cover whole multispectral pixels, or leave it out of training` },
    details,
  };
}

const gridExtents = new WeakMap<RasterGrid, Extent>();
/** The grid asked about last, and its extent: a site's patches ask of one grid in turn. */
let lastGrid: { grid: RasterGrid; extent: Extent } | null = null;

/** Whether the patch's box meets the grid at all: off the grid, off-image says it all. */
function overlapsGrid(patch: PreparedPatch, grid: RasterGrid): boolean {
  if (lastGrid?.grid !== grid) {
    lastGrid = { grid, extent: gridExtents.get(grid) ?? gridExtents.set(grid, gridExtent(grid)).get(grid)! };
  }
  const g = lastGrid.extent;
  const e = patch.extent!;
  return e[0] < g[2] && e[2] > g[0] && e[1] < g[3] && e[3] > g[1];
}

/** The rectangle every given raster covers (their intersection), or null with no scene. */
export function sceneExtent(scene: SceneGrids): Extent | null {
  if (lastScene?.scene === scene) return lastScene.extent;
  if (!sceneExtents.has(scene)) sceneExtents.set(scene, extentOfScene(scene));
  lastScene = { scene, extent: sceneExtents.get(scene)! };
  return lastScene.extent;
}

const sceneExtents = new WeakMap<SceneGrids, Extent | null>();
/** The scene asked about last, and its extent (as lastGrid). */
let lastScene: { scene: SceneGrids; extent: Extent | null } | null = null;

function extentOfScene(scene: SceneGrids): Extent | null {
  const extents = [scene.pan, scene.ms].filter((g) => g !== undefined).map((g) => gridExtent(g));
  if (extents.length === 0) return null;
  return extents.reduce((a, b) => [Math.max(a[0], b[0]), Math.max(a[1], b[1]), Math.min(a[2], b[2]), Math.min(a[3], b[3])]);
}

function offImageFinding(patch: PreparedPatch, settings: CheckSettings, scene: SceneGrids): Finding | null {
  const bounds = sceneExtent(scene);
  const e = patch.extent;
  if (!bounds || !e) return null;
  const { input, area } = patch;
  if (e[0] >= bounds[0] && e[1] >= bounds[1] && e[2] <= bounds[2] && e[3] <= bounds[3]) return noDataFinding(patch, settings, scene);
  const disjoint = e[0] >= bounds[2] || e[2] <= bounds[0] || e[1] >= bounds[3] || e[3] <= bounds[1];
  let outside: MultiPolygonRings = patch.shape!;
  if (!disjoint) {
    const [x0, y0, x1, y1] = bounds;
    const rectangle: Ring = [[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]];
    const ring = singleRing(patch.shape!);
    outside = (ring && ringOverlay(ring, rectangle, 'difference'))
      ?? fromJsts(OverlayOp.difference(jstsOf(patch), jstsPolygon([rectangle])));
  }
  const outsideArea = disjoint ? area : multiPolygonArea(outside);
  if (!disjoint && outsideArea <= settings.sliverAreaM2) return null;
  const share = area > 0 ? outsideArea / area : 1;
  return {
    kind: 'off-image',
    patches: [input.id],
    severity: disjoint || share > 0.5 ? 'error' : 'warning',
    message: disjoint
      ? `patch ${input.id} lies outside the scene`
      : `patch ${input.id} crosses the edge of the scene: ${round(outsideArea, 2)} m² (${percent(share)}) lies off the image`,
    area_m2: round(outsideArea),
    shares: [round(share, 4)],
    geometry: { type: 'MultiPolygon', coordinates: outside },
    fix: disjoint
      ? { action: 'move-inside', target: input.id, text: `check the CRS of patch ${input.id} or delete it: the scene does not show it` }
      : { action: 'move-inside', target: input.id, text: `clip patch ${input.id} to the scene edge` },
  };
}

/** A patch inside the scene's edge that lies over no-data pixels, in part or whole. */
function noDataFinding(patch: PreparedPatch, settings: CheckSettings, scene: SceneGrids): Finding | null {
  if (!scene.noData?.length) return null;
  const { input, area } = patch;
  let worst: { mask: NoDataMask; cover: NoDataCover } | null = null;
  for (const mask of scene.noData) {
    const cover = mask.cover(patch.shape!, patch.extent!, area);
    if (cover && (!worst || cover.areaM2 > worst.cover.areaM2)) worst = { mask, cover };
  }
  if (!worst || worst.cover.areaM2 <= settings.sliverAreaM2) return null;
  const { mask, cover } = worst;
  const wholly = cover.share >= 1 - 1e-9;
  return {
    kind: 'off-image',
    patches: [input.id],
    severity: wholly || cover.share > 0.5 ? 'error' : 'warning',
    message: wholly
      ? `patch ${input.id} lies wholly over no-data pixels of ${mask.fileName}`
      : `patch ${input.id} lies partly over no-data pixels of ${mask.fileName}: ${round(cover.areaM2, 2)} m² (${percent(cover.share)})`,
    area_m2: round(cover.areaM2),
    shares: [round(cover.share, 4)],
    geometry: null,
    fix: wholly
      ? { action: 'move-inside', target: input.id, text: `delete patch ${input.id} or check the scene: the image holds nothing there` }
      : { action: 'move-inside', target: input.id, text: `redraw patch ${input.id} where the image holds data, or leave it out of training` },
    details: { overNoData: true, raster: mask.fileName, noDataValue: String(mask.value) },
  };
}
