import type { CheckDelta } from '../../core/checks/CheckSession.ts';
import { compareFindings, countByKind, findingKey, type Finding, type FindingKind } from '../../core/checks/findings.ts';
import type { CheckProgress, CheckScene, TrackedPatch } from './checkHost.ts';
import type { CheckRunner } from './checkRunner.ts';
import { nextTask } from '../../core/nextTask.ts';

export type { TrackedPatch } from './checkHost.ts';

const keyOf = findingKey;

/** Items handled between pauses when taking in a whole site: each slice stays short on the page. */
const SLICE = 10_000;

/** Lets the page answer input before the next slice. */
const pause = nextTask;

/** A patch as last checked, and the sync that last saw it. */
interface Known {
  patch: TrackedPatch;
  seen: number;
}

/**
 * Keeps a site's findings in step with its patches. The first sync checks everything
 * (in the runner: a worker in the app); after that only the patches whose outline or
 * species changed, and their neighbours, are checked again, and the list is patched
 * with what changed rather than rebuilt.
 */
export class FindingsTracker {
  readonly #runner: CheckRunner;
  readonly #scene: CheckScene;
  #known = new Map<string, Known>();
  #sorted: Finding[] = [];
  #keys = new Set<string>();
  #loaded = false;
  #syncs = 0;

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
    // The checks send their findings in order already; sorting is only for a runner that does not.
    this.#sorted = inOrder(findings) ? findings : findings.sort(compareFindings);
    // A whole site's keys and patches are taken in slices, pausing between them.
    this.#keys = new Set();
    for (let i = 0; i < findings.length; i += SLICE) {
      for (const finding of findings.slice(i, i + SLICE)) this.#keys.add(keyOf(finding));
      if (i + SLICE < findings.length) await pause();
    }
    this.#known = new Map();
    for (let i = 0; i < patches.length; i += SLICE) {
      await pause();
      for (const patch of patches.slice(i, i + SLICE)) this.#known.set(patch.id, { patch, seen: this.#syncs });
    }
    this.#loaded = true;
  }

  /** Brings the findings up to date with the patches now on the desk; returns what changed. */
  async sync(patches: TrackedPatch[]): Promise<CheckDelta> {
    const upserts: TrackedPatch[] = [];
    const sync = ++this.#syncs;
    const knownBefore = this.#known.size;
    // Known patches met in this sync; when all of them are, none was removed.
    let met = 0;
    for (const patch of patches) {
      const known = this.#known.get(patch.id);
      if (known && known.seen !== sync) {
        known.seen = sync;
        met++;
      }
      // Geometries are replaced, never mutated, by every edit: identity says "changed".
      if (known && known.patch.geometry === patch.geometry && known.patch.species === patch.species) continue;
      upserts.push(patch);
      if (known) known.patch = patch;
      else this.#known.set(patch.id, { patch, seen: sync });
    }
    const removals: string[] = [];
    if (met < knownBefore) {
      for (const [id, known] of this.#known) if (known.seen !== sync) removals.push(id);
      for (const id of removals) this.#known.delete(id);
    }
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

function inOrder(findings: Finding[]): boolean {
  for (let i = 1; i < findings.length; i++) if (compareFindings(findings[i - 1], findings[i]) > 0) return false;
  return true;
}
