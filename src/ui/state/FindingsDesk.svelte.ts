import type { Finding, FindingKind } from '../../core/checks/findings.ts';
import type { SceneView } from '../../app/site.ts';
import type { CheckProgress } from '../../app/findings/checkHost.ts';
import { WorkerCheckRunner, type CheckRunner, type PageBytes } from '../../app/findings/checkRunner.ts';
import { FindingsTracker } from '../../app/findings/FindingsTracker.ts';
import { checkScene } from '../../app/findings/sceneGrids.ts';
import type { PatchDesk } from './PatchDesk.svelte.ts';

/**
 * The findings of the open site, kept live: checked in full once in a worker (with
 * progress, cancellable), then re-checked edit by edit (only the patches that changed
 * and their neighbours). Fixes are ordinary edits through the patch desk, so undo takes
 * them back like any other.
 */
export class FindingsDesk {
  findings = $state.raw<Finding[]>([]);
  counts = $state.raw<Partial<Record<FindingKind, number>>>({});
  /** Whole-site check under way. */
  progress = $state.raw<CheckProgress | null>(null);
  /** The whole-site check was cancelled or failed: the list is empty until it runs again. */
  stopped = $state(false);
  /** What the last fix did, or why it could not. */
  notice = $state<string | null>(null);
  /** The finding in hand (the list highlights it, the map shows it). */
  current = $state.raw<Finding | null>(null);
  /** The no-data value the scene's headers give (null: none), and the user's, over it. */
  readonly headerNoData: number | null;
  noDataValue = $state<number | null>(null);

  readonly #patches: PatchDesk;
  readonly #scene: SceneView | undefined;
  readonly #makeRunner: (bytes: PageBytes) => CheckRunner;
  #tracker: FindingsTracker | null = null;
  #abort = new AbortController();
  #unsubscribe: () => void = () => {};
  #queued = false;
  #syncing: Promise<unknown> = Promise.resolve();

  constructor(patches: PatchDesk, scene: SceneView | undefined, makeRunner: (bytes: PageBytes) => CheckRunner = (bytes) => new WorkerCheckRunner(bytes)) {
    this.#patches = patches;
    this.#scene = scene;
    this.#makeRunner = makeRunner;
    this.headerNoData = scene?.ms?.raster.summary.nodata ?? scene?.pan?.raster.summary.nodata ?? null;
  }

  /** Checks the whole site, then follows every change of the patches. */
  async start(): Promise<void> {
    this.#unsubscribe();
    this.#tracker?.dispose();
    this.#abort = new AbortController();
    this.stopped = false;
    const { scene, bytes } = checkScene(this.#scene, this.noDataValue);
    const tracker = (this.#tracker = new FindingsTracker(this.#makeRunner(bytes), scene));
    const patches = this.#tracked();
    this.progress = { stage: 'patches', done: 0, total: patches.length };
    try {
      await tracker.load(patches, { signal: this.#abort.signal, onProgress: (p) => (this.progress = p) });
    } catch (error) {
      this.stopped = true;
      this.findings = [];
      this.counts = {};
      this.notice = this.#abort.signal.aborted ? 'The checks were cancelled. Run them again when you are ready.' : `The checks stopped: ${(error as Error).message}`;
      return;
    } finally {
      this.progress = null;
    }
    this.#publish();
    this.#unsubscribe = this.#patches.onChange(() => this.#schedule());
    this.#schedule(); // edits made while the first check ran
  }

  /** Stops a whole-site check under way. */
  cancel(): void {
    this.#abort.abort();
  }

  /** Takes a finding in hand: its patches selected and the map brought to it. */
  focus(finding: Finding): void {
    this.current = finding;
    this.#patches.select(String(finding.fix.target), true);
  }

  /** Moves to the next (or previous) finding in list order. */
  step(by: 1 | -1): void {
    if (this.findings.length === 0) {
      this.notice = this.stopped ? 'The checks have not run: run them first.' : 'No findings: every check passes.';
      return;
    }
    const at = this.current ? this.findings.findIndex((f) => sameFinding(f, this.current!)) : -1;
    const next = at < 0 ? (by > 0 ? 0 : this.findings.length - 1) : (at + by + this.findings.length) % this.findings.length;
    this.focus(this.findings[next]);
  }

  /** Carries out a finding's suggested fix as an ordinary, undoable edit. */
  async fix(finding: Finding): Promise<void> {
    // The fixes' geometry library is loaded on the first fix, not with the desk.
    const { fixPlan } = await import('../../app/findings/fixPlan.ts');
    const plan = fixPlan(finding, (id) => this.#patches.state.patches.get(id)?.geometry);
    const patches = this.#patches;
    if (plan.kind === 'hand') {
      this.focus(finding);
      this.notice = plan.says;
      return;
    }
    if (plan.kind === 'geometry') await patches.editGeometry(plan.id, plan.geometry);
    else if (plan.kind === 'delete') {
      patches.select(plan.id);
      await patches.deleteSelected();
    } else {
      patches.select(plan.id);
      await patches.mergeWith(plan.other);
    }
    this.notice = patches.error ? `Not fixed: ${patches.error}` : `${plan.says}. Ctrl+Z takes it back.`;
  }

  dispose(): void {
    this.#abort.abort();
    this.#unsubscribe();
    this.#tracker?.dispose();
  }

  #tracked() {
    return this.#patches.features().map((f) => ({ id: f.id, geometry: f.geometry, species: f.species }));
  }

  // Several edits in one turn of the event loop make one re-check; re-checks run one at a time.
  #schedule(): void {
    if (this.#queued) return;
    this.#queued = true;
    queueMicrotask(() => {
      this.#queued = false;
      const tracker = this.#tracker;
      if (!tracker) return;
      this.#syncing = this.#syncing.then(async () => {
        if (tracker !== this.#tracker) return;
        try {
          await tracker.sync(this.#tracked());
          if (tracker === this.#tracker) this.#publish();
        } catch (error) {
          this.notice = `The checks stopped: ${(error as Error).message}`;
        }
      });
    });
  }

  #publish(): void {
    const tracker = this.#tracker;
    if (!tracker) return;
    this.findings = tracker.findings();
    this.counts = tracker.counts();
    if (this.current && !this.findings.some((f) => sameFinding(f, this.current!))) this.current = null;
  }
}

export function sameFinding(a: Finding, b: Finding): boolean {
  return a.kind === b.kind && a.patches.length === b.patches.length && a.patches.every((p, i) => p === b.patches[i]);
}
