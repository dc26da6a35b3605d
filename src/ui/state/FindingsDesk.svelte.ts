import type { Finding, FindingKind } from '../../core/checks/findings.ts';
import type { SceneGrids } from '../../core/checks/settings.ts';
import { FindingsTracker } from '../../app/findings/FindingsTracker.ts';
import { fixPlan } from '../../app/findings/fixPlan.ts';
import type { PatchDesk } from './PatchDesk.svelte.ts';

/**
 * The findings of the open site, kept live: checked in full once, then re-checked edit
 * by edit (only the patches that changed and their neighbours). Fixes are ordinary
 * edits through the patch desk, so undo takes them back like any other.
 */
export class FindingsDesk {
  findings = $state.raw<Finding[]>([]);
  counts = $state.raw<Partial<Record<FindingKind, number>>>({});
  /** Whole-site check under way: patches done of total. */
  progress = $state<{ done: number; total: number } | null>(null);
  /** What the last fix did, or why it could not. */
  notice = $state<string | null>(null);
  /** The finding in hand (the list highlights it, the map shows it). */
  current = $state.raw<Finding | null>(null);

  readonly #patches: PatchDesk;
  readonly #tracker: FindingsTracker;
  readonly #abort = new AbortController();
  #unsubscribe: () => void = () => {};
  #queued = false;

  constructor(patches: PatchDesk, scene: SceneGrids) {
    this.#patches = patches;
    this.#tracker = new FindingsTracker(scene);
  }

  /** Checks the whole site, then follows every change of the patches. */
  async start(): Promise<void> {
    const patches = this.#tracked();
    this.progress = { done: 0, total: patches.length };
    try {
      await this.#tracker.load(patches, { signal: this.#abort.signal, onProgress: (done, total) => (this.progress = { done, total }) });
    } catch (error) {
      if (this.#abort.signal.aborted) return;
      this.notice = `The checks stopped: ${(error as Error).message}`;
      return;
    } finally {
      this.progress = null;
    }
    this.#publish();
    this.#unsubscribe = this.#patches.onChange(() => this.#schedule());
    this.#schedule(); // edits made while the first check ran
  }

  /** Takes a finding in hand: its patches selected and the map brought to it. */
  focus(finding: Finding): void {
    this.current = finding;
    this.#patches.select(String(finding.fix.target), true);
  }

  /** Moves to the next (or previous) finding in list order. */
  step(by: 1 | -1): void {
    if (this.findings.length === 0) {
      this.notice = 'No findings: every check passes.';
      return;
    }
    const at = this.current ? this.findings.findIndex((f) => sameFinding(f, this.current!)) : -1;
    const next = at < 0 ? (by > 0 ? 0 : this.findings.length - 1) : (at + by + this.findings.length) % this.findings.length;
    this.focus(this.findings[next]);
  }

  /** Carries out a finding's suggested fix as an ordinary, undoable edit. */
  async fix(finding: Finding): Promise<void> {
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
  }

  #tracked() {
    return this.#patches.features().map((f) => ({ id: f.id, geometry: f.geometry, species: f.species }));
  }

  // Several edits in one turn of the event loop make one re-check.
  #schedule(): void {
    if (this.#queued) return;
    this.#queued = true;
    queueMicrotask(() => {
      this.#queued = false;
      this.#tracker.sync(this.#tracked());
      this.#publish();
    });
  }

  #publish(): void {
    this.findings = this.#tracker.findings();
    this.counts = this.#tracker.counts();
    if (this.current && !this.findings.some((f) => sameFinding(f, this.current!))) this.current = null;
  }
}

export function sameFinding(a: Finding, b: Finding): boolean {
  return a.kind === b.kind && a.patches.length === b.patches.length && a.patches.every((p, i) => p === b.patches[i]);
}
