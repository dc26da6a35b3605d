import { extentOfRings } from '../../core/geometry/measure.ts';
import type { Extent } from '../../core/geometry/types.ts';
import { defaultSettings, type AreaShifts, type OffsetEstimate, type SignalKind } from '../../core/offset/index.ts';
import type { Patch } from '../../core/site/index.ts';
import type { SceneView } from '../site.ts';
import { OffsetInputError, readSignal } from './offsetSignal.ts';
import type { OffsetProgress } from './offsetJob.ts';
import type { OffsetRunner } from './offsetRunner.ts';

// Estimating the field-to-imagery shift of a set of stored patches on the desk's
// scene: checks the set and the radius, reads the signal around the polygons, and runs
// the search (in a worker in the app). Nothing is moved here: see applyShift.ts.

export interface EstimateRequest {
  patches: readonly Patch[];
  scene: SceneView;
  /** Largest shift tried, metres. */
  radius: number;
  signal?: SignalKind;
  /** Also a shift per cell of an N x N grid (0 or absent: none). */
  areasAcross?: number;
  runner: OffsetRunner;
  onProgress?: (progress: EstimateProgress) => void;
  abort?: AbortSignal;
}

export interface EstimateProgress {
  stage: 'reading' | OffsetProgress['stage'];
  /** 0 to 1 over the whole estimate */
  share: number;
  text: string;
}

/** An estimate, with what it was made of, ready to show or to apply. */
export interface OffsetRun {
  estimate: OffsetEstimate;
  /** the shift per area, when asked for */
  areas: AreaShifts | null;
  /** the patches estimated, in the estimate's order */
  patchIds: string[];
  /** geometries as estimated: the before outlines of a preview */
  geometries: Patch['geometry'][];
  panPixel: number;
  signalFile: string;
}

const intersects = (a: Extent, b: Extent) => a[0] < b[2] && a[2] > b[0] && a[1] < b[3] && a[3] > b[1];

/** Throws OffsetInputError with a message a user can act on. */
export function checkRequest(patches: readonly Patch[], sceneExtent: Extent, fileName: string, radius: number): void {
  if (patches.length < 2) {
    throw new OffsetInputError(`The set holds ${patches.length} patch${patches.length === 1 ? '' : 'es'}; a common shift needs at least two (one polygon cannot tell it from its own error).`);
  }
  const outside = patches.filter((p) => !intersects(extentOfRings(p.geometry), sceneExtent));
  if (outside.length > 0) {
    const ids = outside.slice(0, 5).map((p) => p.id).join(', ');
    throw new OffsetInputError(`${outside.length} of ${patches.length} patches lie outside the scene ${fileName} (${ids}${outside.length > 5 ? ', ...' : ''}); choose a set on the scene.`);
  }
  const side = Math.min(sceneExtent[2] - sceneExtent[0], sceneExtent[3] - sceneExtent[1]);
  if (!(radius > 0) || !Number.isFinite(radius) || 2 * radius >= side) {
    throw new OffsetInputError(`Search radius ${radius} m: it must be above 0 and under half the scene's side (${(side / 2).toFixed(1)} m).`);
  }
}

export async function estimateOffset(request: EstimateRequest): Promise<OffsetRun> {
  const { patches, scene, radius, runner, abort } = request;
  const kind = request.signal ?? 'ndvi';
  const raster = kind === 'ndvi' ? scene.ms?.raster : scene.pan?.raster;
  if (!raster) throw new OffsetInputError(`The scene of ${scene.date} has no ${kind === 'ndvi' ? 'multispectral' : 'panchromatic'} raster to estimate a shift on.`);
  const summary = raster.summary;
  if (!summary.georeferenced) throw new OffsetInputError(`${summary.fileName}: the raster is not georeferenced, so polygons cannot be placed on it.`);
  checkRequest(patches, summary.extent as Extent, summary.fileName, radius);

  const panPixel = scene.pan?.raster.summary.pixelSize[0] ?? summary.pixelSize[0] / 4;
  const settings = defaultSettings(panPixel, summary.pixelSize[0], { radius, signal: kind });
  const all = extentOfRings(patches.flatMap((p) => p.geometry));
  const margin = radius + settings.ownReach + settings.ringWidth + 2 * summary.pixelSize[0];
  const tell = request.onProgress ?? (() => {});
  tell({ stage: 'reading', share: 0, text: `Reading ${summary.fileName} around ${patches.length} patches` });
  const grid = await readSignal(raster, kind, [all[0] - margin, all[1] - margin, all[2] + margin, all[3] + margin], abort);
  const areasAcross = request.areasAcross ?? 0;
  const { estimate, areas } = await runner.run(
    { patches: patches.map((p) => ({ id: p.id, rings: p.geometry })), grid, settings, areasAcross },
    (p) => tell(p.stage === 'templates'
      ? { stage: 'templates', share: 0.15 + 0.25 * (p.done / p.total), text: `Sampling ${p.done} of ${p.total} patches` }
      : p.stage === 'search'
        ? { stage: 'search', share: p.done ? (areasAcross ? 0.7 : 1) : 0.4, text: 'Searching shifts and bootstrapping' }
        : { stage: 'areas', share: p.done ? 1 : 0.7, text: `Estimating a shift in each of ${areasAcross} x ${areasAcross} areas` }),
    abort,
  );
  return { estimate, areas, patchIds: patches.map((p) => p.id), geometries: patches.map((p) => p.geometry), panPixel, signalFile: summary.fileName };
}
