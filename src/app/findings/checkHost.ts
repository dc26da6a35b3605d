import { CheckSession, type CheckDelta, type LoadProgress } from '../../core/checks/CheckSession.ts';
import { findingKey, type Finding } from '../../core/checks/findings.ts';
import { NoDataMask, readMasksFor } from '../../core/checks/noDataMask.ts';
import type { PatchInput } from '../../core/checks/preparedPatch.ts';
import { resolveSettings } from '../../core/checks/settings.ts';
import type { RasterGrid } from '../../core/geometry/rasterGrid.ts';
import { extentOfRings } from '../../core/geometry/measure.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { vertexCount } from '../../core/geometry/validity.ts';
import type { TiffSummary } from '../../core/tiff/inspectTiff.ts';

// The checks of one open site as a job: what the checks worker runs, and what tests run
// in their own thread. One implementation of the rules (CheckSession); this adds the
// no-data pixels, read block by block before the patches that lie over them are checked.

/** What the checks need of one patch as the desk shows it. */
export interface TrackedPatch {
  id: string;
  geometry: MultiPolygonRings;
  /** The species the desk shows for the patch ('' when untagged). */
  species: string;
}

/** A scene raster whose no-data pixels the checks read (bytes come through `read`). */
export interface CheckRaster {
  summary: TiffSummary;
}

export interface CheckScene {
  pan?: RasterGrid;
  ms?: RasterGrid;
  /** Rasters to learn no-data pixels from (those without a no-data value are skipped). */
  rasters?: CheckRaster[];
  /** The user's no-data value, over the rasters' own. */
  noDataValue?: number | null;
}

export interface CheckProgress {
  stage: 'pixels' | 'patches';
  done: number;
  total: number;
}

/** Reads bytes of scene raster `raster` (its index in CheckScene.rasters). */
export type RasterBytes = (raster: number, offset: number, length: number, signal?: AbortSignal) => Promise<Uint8Array>;

export const toInput = (patch: TrackedPatch): PatchInput => ({ id: patch.id, species: patch.species, rings: patch.geometry });

export class CheckHost {
  #session: CheckSession = new CheckSession();
  #masks: { mask: NoDataMask; read: (offset: number, length: number) => Promise<Uint8Array> }[] = [];
  readonly #bytes: RasterBytes;

  constructor(bytes: RasterBytes) {
    this.#bytes = bytes;
  }

  /** Checks a whole site: no-data blocks under the patches first, then every patch and pair. */
  async load(patches: TrackedPatch[], scene: CheckScene, onProgress: (p: CheckProgress) => void, signal?: AbortSignal): Promise<Finding[]> {
    this.#masks = [];
    (scene.rasters ?? []).forEach((raster, index) => {
      const mask = NoDataMask.of(raster.summary, scene.noDataValue);
      if (mask) this.#masks.push({ mask, read: (offset, length) => this.#bytes(index, offset, length, signal) });
    });
    const grids = { ...(scene.pan ? { pan: scene.pan } : {}), ...(scene.ms ? { ms: scene.ms } : {}) };
    this.#session = new CheckSession({ scene: this.#masks.length ? { ...grids, noData: this.#masks.map((m) => m.mask) } : grids });
    const inputs = patches.map(toInput);
    await readMasksFor(this.#masks, this.#extents(inputs), signal, (done, total) => onProgress({ stage: 'pixels', done, total }));
    const progress: LoadProgress = {
      signal,
      onProgress: (done, total) => onProgress({ stage: 'patches', done: Math.floor(done / 2), total: Math.floor(total / 2) }),
    };
    await this.#session.loadInChunks(inputs, progress);
    return this.#session.findings();
  }

  /** Builds what edits need (the index over the patches) in an idle moment after a load. */
  prepareEdits(): void {
    this.#session.compact();
  }

  /** Re-checks the changed and removed patches and their neighbours. */
  async apply(upserts: TrackedPatch[], removals: string[], signal?: AbortSignal): Promise<CheckDelta> {
    const inputs = upserts.map(toInput);
    if (this.#masks.length) await readMasksFor(this.#masks, this.#extents(inputs), signal);
    // Edits apply one after another: a finding one adds and a later one removes never
    // reaches the list, so the net change is kept, not the concatenation.
    const removed: Finding[] = [];
    const added = new Map<string, Finding>();
    const take = (delta: CheckDelta) => {
      for (const finding of delta.removed) {
        if (!added.delete(findingKey(finding))) removed.push(finding);
      }
      for (const finding of delta.added) added.set(findingKey(finding), finding);
    };
    for (const input of inputs) take(this.#session.upsert(input));
    for (const id of removals) take(this.#session.remove(id));
    return { removed, added: [...added.values()] };
  }

  /** Boxes of the patches the checks will look at (past the vertex limit they do not). */
  #extents(inputs: PatchInput[]) {
    const limit = this.#session.settings.maxVertices ?? resolveSettings().maxVertices;
    return inputs.filter((p) => vertexCount(p.rings) <= limit).map((p) => extentOfRings(p.rings));
  }
}
