import type { SiteStore } from '../../store/SiteStore.ts';
import type { SceneView } from '../../app/site.ts';
import type { Extent, MultiPolygonRings } from '../../core/geometry/types.ts';
import { shiftPatches, type SignalKind } from '../../core/offset/index.ts';
import { estimateOffset, type EstimateProgress, type OffsetRun } from '../../app/offset/estimateOffset.ts';
import { applyShift, restoreOriginals } from '../../app/offset/applyShift.ts';
import { appliedShifts, type AppliedShift } from '../../app/offset/appliedShifts.ts';
import { offsetSetOptions, patchesOfSet, type OffsetSetOption } from '../../app/offset/offsetSets.ts';
import { WorkerOffsetRunner, type OffsetRunner } from '../../app/offset/offsetRunner.ts';
import type { PatchDesk } from './PatchDesk.svelte.ts';
import { nowIso } from './listeners.ts';

export interface OffsetDeskOptions {
  store: SiteStore;
  patches: PatchDesk;
  /** the scene the desk shows (its rasters are read) */
  scene: () => SceneView | undefined;
  runner?: OffsetRunner;
}

/** What the map draws of a shift: the field positions and the shifted ones. */
export interface ShiftOutlines {
  field: MultiPolygonRings[];
  shifted: MultiPolygonRings[];
  /** 'preview': an estimate not yet applied; 'applied' or 'restored': the newest shift of the site */
  kind: 'preview' | 'applied' | 'restored';
}

export type OutlineShow = 'both' | 'field' | 'shifted' | 'none';

/**
 * The field-to-imagery shift at the desk: the set and radius chosen, the estimate
 * (run in a worker, cancellable), and the shifts of the site from its ledger. Nothing
 * moves until the user applies; applying is one undo step.
 */
export class OffsetDesk {
  setKey = $state('');
  radius = $state(3);
  signal = $state<SignalKind>('ndvi');
  /** also a shift per area (2 x 2 cells), to see whether one shift fits the whole set */
  byArea = $state(false);
  progress = $state.raw<EstimateProgress | null>(null);
  run = $state.raw<OffsetRun | null>(null);
  error = $state<string | null>(null);
  notice = $state<string | null>(null);
  shifts = $state.raw<AppliedShift[]>([]);
  show = $state<OutlineShow>('both');
  viewExtent = $state.raw<Extent | null>(null);
  busy = $state(false);

  #appliedRun = $state.raw<{ run: OffsetRun; shiftId: string } | null>(null);
  #options: OffsetDeskOptions;
  #runner: OffsetRunner;
  #abort: AbortController | null = null;
  // Not reactive on purpose: `shifts` is replaced from it after each shift event.
  // eslint-disable-next-line svelte/prefer-svelte-reactivity
  #known = new Map<string, AppliedShift>();
  #unsubscribe: () => void;

  constructor(options: OffsetDeskOptions) {
    this.#options = options;
    this.#runner = options.runner ?? new WorkerOffsetRunner();
    this.#unsubscribe = options.store.subscribe((_state, event) => {
      if (event.kind !== 'patches.shifted') return;
      this.#take([event]);
      // Undo and redo come from the desk's keys: say what they did to the shift.
      if (event.undoes !== undefined || event.redoes !== undefined) {
        const moved = event.payload.direction === 'apply' ? 'moved by the shift again' : 'back where the field put them';
        this.notice = `${event.undoes !== undefined ? 'Undone' : 'Redone'}: ${event.payload.outlines.length} patches ${moved}.`;
      }
    });
  }

  get setOptions(): OffsetSetOption[] {
    return offsetSetOptions(this.#options.patches.state, this.viewExtent);
  }

  get chosenSet(): OffsetSetOption | null {
    const options = this.setOptions;
    return options.find((o) => o.key === this.setKey) ?? options[0] ?? null;
  }

  get setSize(): number {
    const chosen = this.chosenSet;
    return chosen ? patchesOfSet(this.#options.patches.state, chosen.choice).length : 0;
  }

  get running(): boolean {
    return this.progress !== null;
  }

  /** True while the current estimate's shift is applied (so Apply would do it twice); false again after its undo or restore. */
  get runApplied(): boolean {
    const applied = this.#appliedRun;
    if (!applied || applied.run !== this.run) return false;
    return this.shifts.find((s) => s.shiftId === applied.shiftId)?.direction === 'apply';
  }
  /** The outlines the map draws: the estimate's preview, else the newest shift of the site. */
  readonly outlines: ShiftOutlines | null = $derived.by(() => this.#outlines());

  #outlines(): ShiftOutlines | null {
    const run = this.run;
    if (run && this.#appliedRun?.run !== run && run.estimate.reliable) {
      const shift = { dx: run.estimate.dx!, dy: run.estimate.dy! };
      return { kind: 'preview', field: run.geometries, shifted: shiftPatches(run.geometries, shift) };
    }
    const newest = this.shifts.reduce<AppliedShift | null>((a, b) => (a && a.seq > b.seq ? a : b), null);
    if (!newest) return null;
    const field = newest.outlines.map((o) => (newest.direction === 'apply' ? o.previous : o.geometry));
    const shifted = newest.outlines.map((o) => (newest.direction === 'apply' ? o.geometry : o.previous));
    return { kind: newest.direction === 'apply' ? 'applied' : 'restored', field, shifted };
  }

  /**
   * Reads the site's shifts from the ledger, once, when the tool is first opened: the
   * whole ledger of a large site is not worth reading on every desk open.
   */
  loadShifts(): void {
    if (this.#loading) return;
    this.#loading = this.#options.store.ledger().then((events) => this.#take(events)).catch((error: Error) => {
      this.#loading = null;
      this.error = `The shifts of this site could not be read: ${error.message}`;
    });
  }
  #loading: Promise<void> | null = null;

  setViewport(extent: number[]): void {
    this.viewExtent = [extent[0], extent[1], extent[2], extent[3]];
  }

  async estimate(): Promise<void> {
    const chosen = this.chosenSet;
    const scene = this.#options.scene();
    if (!chosen || !scene) return this.#say('Open a stored site with its scene to estimate a shift.');
    this.cancel();
    const abort = new AbortController();
    this.#abort = abort;
    this.error = null;
    this.notice = null;
    this.run = null;
    this.progress = { stage: 'reading', share: 0, text: 'Starting' };
    try {
      const patches = patchesOfSet(this.#options.patches.state, chosen.choice);
      this.run = await estimateOffset({
        patches, scene, radius: Number(this.radius), signal: this.signal, areasAcross: this.byArea ? 2 : 0, runner: this.#runner, abort: abort.signal,
        onProgress: (p) => {
          if (this.#abort === abort) this.progress = p;
        },
      });
    } catch (error) {
      // A cancelled read fails in the bridge's own words; once cancelled, no failure is news.
      if (!abort.signal.aborted && (error as Error).name !== 'AbortError') this.error = (error as Error).message;
    } finally {
      if (this.#abort === abort) {
        this.#abort = null;
        this.progress = null;
      }
    }
  }

  cancel(): void {
    this.#abort?.abort();
    this.#abort = null;
    this.progress = null;
  }

  async apply(): Promise<void> {
    const run = this.run;
    if (!run) return;
    const desk = this.#options.patches;
    if (desk.blindPass) return this.#say('Outlines stay as they were sent in a blind pass: end it to apply a shift.');
    await this.#work(async () => {
      const event = await applyShift(this.#options.store, run.estimate, run.patchIds, { interpreter: desk.interpreter, time: nowIso() });
      if (event.kind === 'patches.shifted') this.#appliedRun = { run, shiftId: event.payload.shiftId };
      this.notice = `Moved ${run.patchIds.length} patches by the shift (Ctrl+Z undoes it).`;
    });
  }

  async restore(shiftId: string): Promise<void> {
    const desk = this.#options.patches;
    if (desk.blindPass) return this.#say('Outlines stay as they were sent in a blind pass.');
    await this.#work(async () => {
      const result = await restoreOriginals(this.#options.store, shiftId, { interpreter: desk.interpreter, time: nowIso() });
      const parts = [`Put ${result.event.kind === 'patches.shifted' ? result.event.payload.outlines.length : 0} patches back where the field put them.`];
      if (result.movedBack.length) parts.push(`${result.movedBack.length} edited since were moved back by the shift, their edits kept (${result.movedBack.slice(0, 5).join(', ')}).`);
      if (result.gone.length) parts.push(`${result.gone.length} deleted since were left out.`);
      this.notice = parts.join(' ');
    });
  }

  /** Puts the patch in hand on the desk and the map (an outlier from the list). */
  focus(id: string | number): void {
    this.#options.patches.select(String(id), true);
  }

  dispose(): void {
    this.cancel();
    this.#unsubscribe();
    this.#runner.dispose();
  }

  #take(events: Parameters<typeof appliedShifts>[0]): void {
    appliedShifts(events, this.#known);
    this.shifts = [...this.#known.values()];
  }

  async #work(job: () => Promise<void>): Promise<void> {
    this.busy = true;
    this.error = null;
    this.notice = null;
    try {
      await job();
    } catch (error) {
      this.error = (error as Error).message;
    } finally {
      this.busy = false;
    }
  }

  #say(text: string): Promise<void> {
    this.notice = text;
    return Promise.resolve();
  }
}
