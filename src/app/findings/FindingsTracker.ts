import type { CheckDelta } from '../../core/checks/CheckSession.ts';
import { compareFindings, countByKind, findingKey, type Finding, type FindingKind } from '../../core/checks/findings.ts';
import type { CheckProgress, CheckScene, TrackedPatch } from './checkHost.ts';
import type { CheckRunner } from './checkRunner.ts';

export type { TrackedPatch } from './checkHost.ts';

const keyOf = findingKey;

/**
 * Keeps a site's findings in step with its patches. The first sync checks everything
 * (in the runner: a worker in the app); after that only the patches whose outline or
 * species changed, and their neighbours, are checked again, and the list is patched
 * with what changed rather than rebuilt.
 */
export class FindingsTracker {
  readonly #runner: CheckRunner;
  readonly #scene: CheckScene;
  #known = new Map<string, TrackedPatch>();
  #sorted: Finding[] = [];
  #keys = new Set<string>();
  #loaded = false;

  constructor(runner: CheckRunner, scene: CheckScene = {}) {
    this.#runner = runner;
    this.#scene = scene;
  }

  get loaded(): boolean {
    return this.#loaded;
  }

  /** The first, whole-site check. */
  async load(patches: TrackedPatch[], options: { signal?: AbortSignal; onProgress?: (p: CheckProgress) => void } = {}): Promise<void> {
    this.#loaded = false;
    const findings = await this.#runner.load(patches, this.#scene, options.onProgress ?? (() => {}), options.signal);
    this.#sorted = findings.sort(compareFindings);
    this.#keys = new Set(findings.map(keyOf));
    this.#known = new Map(patches.map((p) => [p.id, p]));
    this.#loaded = true;
  }

  /** Brings the findings up to date with the patches now on the desk; returns what changed. */
  async sync(patches: TrackedPatch[]): Promise<CheckDelta> {
    const upserts: TrackedPatch[] = [];
    const seen = new Set<string>();
    for (const patch of patches) {
      seen.add(patch.id);
      const before = this.#known.get(patch.id);
      // Geometries are replaced, never mutated, by every edit: identity says "changed".
      if (before && before.geometry === patch.geometry && before.species === patch.species) continue;
      upserts.push(patch);
      this.#known.set(patch.id, patch);
    }
    const removals = [...this.#known.keys()].filter((id) => !seen.has(id));
    for (const id of removals) this.#known.delete(id);
    if (upserts.length === 0 && removals.length === 0) return { removed: [], added: [] };
    const delta = await this.#runner.apply(upserts, removals);
    this.#patch(delta);
    return delta;
  }

  /** Every finding, in the stable order of compareFindings. */
  findings(): Finding[] {
    return [...this.#sorted];
  }

  counts(): Record<FindingKind, number> {
    return countByKind(this.#sorted);
  }

  dispose(): void {
    this.#runner.dispose();
  }

  /** Removes and inserts by binary search, so an edit costs little however long the list. */
  #patch(delta: CheckDelta): void {
    for (const gone of delta.removed) {
      const key = keyOf(gone);
      if (!this.#keys.delete(key)) continue;
      const at = this.#position(gone);
      if (at < this.#sorted.length && keyOf(this.#sorted[at]) === key) this.#sorted.splice(at, 1);
      else this.#sorted = this.#sorted.filter((f) => keyOf(f) !== key);
    }
    for (const added of delta.added) {
      const key = keyOf(added);
      if (this.#keys.has(key)) continue;
      this.#keys.add(key);
      this.#sorted.splice(this.#position(added), 0, added);
    }
  }

  /** The first index whose finding does not come before `finding`. */
  #position(finding: Finding): number {
    let lo = 0, hi = this.#sorted.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (compareFindings(this.#sorted[mid], finding) < 0) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }
}
