import { CheckSession, type CheckDelta } from '../../core/checks/CheckSession.ts';
import type { Finding, FindingKind } from '../../core/checks/findings.ts';
import type { SceneGrids } from '../../core/checks/settings.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';

/** What the checks need of one patch as the desk shows it. */
export interface TrackedPatch {
  id: string;
  geometry: MultiPolygonRings;
  /** The species the desk shows for the patch ('' when untagged). */
  species: string;
}

/**
 * Keeps a site's findings in step with its patches. The first sync checks everything
 * (in chunks, so the page stays responsive); after that only the patches whose outline
 * or species changed, and their neighbours, are checked again.
 */
export class FindingsTracker {
  readonly #session: CheckSession;
  #known = new Map<string, TrackedPatch>();
  #loaded = false;

  constructor(scene: SceneGrids = {}) {
    this.#session = new CheckSession({ scene });
  }

  get loaded(): boolean {
    return this.#loaded;
  }

  /** The first, whole-site check. */
  async load(patches: TrackedPatch[], options: { signal?: AbortSignal; onProgress?: (done: number, total: number) => void } = {}): Promise<void> {
    await this.#session.loadInChunks(patches.map(toInput), options);
    this.#known = new Map(patches.map((p) => [p.id, p]));
    this.#loaded = true;
  }

  /** Brings the findings up to date with the patches now on the desk; returns what changed. */
  sync(patches: TrackedPatch[]): CheckDelta {
    const delta: CheckDelta = { removed: [], added: [] };
    const seen = new Set<string>();
    for (const patch of patches) {
      seen.add(patch.id);
      const before = this.#known.get(patch.id);
      // Geometries are replaced, never mutated, by every edit: identity says "changed".
      if (before && before.geometry === patch.geometry && before.species === patch.species) continue;
      merge(delta, this.#session.upsert(toInput(patch)));
      this.#known.set(patch.id, patch);
    }
    for (const id of [...this.#known.keys()]) {
      if (seen.has(id)) continue;
      merge(delta, this.#session.remove(id));
      this.#known.delete(id);
    }
    return delta;
  }

  findings(): Finding[] {
    return this.#session.findings();
  }

  counts(): Record<FindingKind, number> {
    return this.#session.counts();
  }
}

function toInput(patch: TrackedPatch) {
  return { id: patch.id, species: patch.species, rings: patch.geometry };
}

function merge(into: CheckDelta, delta: CheckDelta): void {
  into.removed.push(...delta.removed);
  into.added.push(...delta.added);
}
