import Flatbush from 'flatbush';
import { countPurePixels } from '../geometry/purePixels.ts';
import type { Extent } from '../geometry/types.ts';
import { compareFindings, countByKind, type Finding, type FindingKind, type PatchId } from './findings.ts';
import { pairFindings } from './pairFindings.ts';
import { patchFindings } from './patchFindings.ts';
import { preparePatch, type PatchInput, type PreparedPatch } from './preparedPatch.ts';
import { resolveSettings, type CheckSettings, type SceneGrids } from './settings.ts';

// The checks over a whole site, kept current edit by edit. A full load indexes every
// patch's box in a Flatbush tree and checks each patch and each pair of neighbouring
// boxes. After that, adding, changing or removing one patch re-checks only that patch
// and its neighbours. Flatbush trees are static, so a changed patch leaves its old slot
// dead and joins a short list of loose patches searched one by one; the tree is rebuilt
// when that list grows long.

/** A patch's own figures, for the patch in hand. */
export interface PatchFigures {
  /** Area of the (repaired, when broken) outline, m². */
  areaM2: number;
  /** Pure multispectral pixels, or null without an MS grid or a usable outline. */
  purePixels: number | null;
  valid: boolean;
}

export interface LoadProgress {
  /** Stops the load between chunks; the promise rejects with the signal's reason. */
  signal?: AbortSignal;
  /** Called after each chunk with patches prepared (first pass) or paired (second). */
  onProgress?: (done: number, total: number) => void;
  /** Patches per chunk; default 2,000. */
  chunk?: number;
}

export interface CheckSessionOptions {
  settings?: Partial<CheckSettings>;
  scene?: SceneGrids;
}

/** What one edit changed in the findings. */
export interface CheckDelta {
  removed: Finding[];
  added: Finding[];
}

/**
 * Loose patches allowed before an edit rebuilds the tree (some milliseconds at 10,000
 * patches). Scanning them costs microseconds per edit; callers with idle time can
 * call compact() sooner.
 */
const LOOSE_LIMIT = 2048;

export class CheckSession {
  readonly settings: CheckSettings;
  readonly scene: SceneGrids;
  #patches = new Map<PatchId, PreparedPatch>();
  #single = new Map<PatchId, Finding[]>();
  #pairs = new Map<PatchId, Map<PatchId, Finding[]>>();
  #tree: Flatbush | null = null;
  #slots: (PatchId | null)[] = [];
  #slotOf = new Map<PatchId, number>();
  #loose = new Set<PatchId>();

  constructor(options: CheckSessionOptions = {}) {
    this.scene = options.scene ?? {};
    this.settings = resolveSettings(options.settings, this.scene);
  }

  get size(): number {
    return this.#patches.size;
  }

  /** Replaces everything with these patches and checks them all. Ids must be unique. */
  load(patches: Iterable<PatchInput>): void {
    const steps = this.#loadSteps([...patches], Infinity);
    while (!steps.next().done) { /* one pass, no pauses */ }
  }

  /**
   * The same as load, in chunks that yield to the event loop between them, so a worker
   * can report progress and take a cancel. On abort the session is left empty.
   */
  async loadInChunks(patches: Iterable<PatchInput>, progress: LoadProgress = {}): Promise<void> {
    const list = [...patches];
    const steps = this.#loadSteps(list, progress.chunk ?? 2000);
    for (let step = steps.next(); !step.done; step = steps.next()) {
      progress.onProgress?.(step.value, list.length * 2);
      await new Promise((resolve) => setTimeout(resolve, 0));
      if (progress.signal?.aborted) {
        this.#clear();
        throw progress.signal.reason ?? new Error('the check was cancelled');
      }
    }
    progress.onProgress?.(list.length * 2, list.length * 2);
  }

  /** A patch's area and pure pixel count, or null for an unknown id. */
  figures(id: PatchId): PatchFigures | null {
    const patch = this.#patches.get(id);
    if (!patch) return null;
    const ms = this.scene.ms;
    return {
      areaM2: patch.area,
      purePixels: ms && patch.shape ? countPurePixels(patch.shape, ms) : null,
      valid: patch.issues.every((issue) => issue.reason === 'repeated-point'),
    };
  }

  #clear(): void {
    this.#patches.clear();
    this.#single.clear();
    this.#pairs.clear();
    this.#loose.clear();
    this.#tree = null;
    this.#slots = [];
    this.#slotOf.clear();
  }

  /** The full check as a sequence of steps; yields work done after each chunk. */
  *#loadSteps(patches: PatchInput[], chunk: number): Generator<number, void> {
    this.#clear();
    let done = 0;
    for (const input of patches) {
      if (this.#patches.has(input.id)) {
        this.#clear();
        throw new RangeError(`patch id ${JSON.stringify(input.id)} appears twice`);
      }
      const patch = preparePatch(input, this.settings);
      this.#patches.set(input.id, patch);
      this.#single.set(input.id, patchFindings(patch, this.settings, this.scene));
      if (++done % chunk === 0) yield done;
    }
    this.#rebuildTree();
    const tree = this.#tree;
    if (!tree) return;
    for (let i = 0; i < this.#slots.length; i++) {
      const patch = this.#patches.get(this.#slots[i]!)!;
      const [x0, y0, x1, y1] = patch.extent!;
      for (const j of tree.search(x0, y0, x1, y1)) {
        if (j <= i) continue;
        this.#link(patch, this.#patches.get(this.#slots[j]!)!);
      }
      if (++done % chunk === 0) yield done;
    }
  }

  /** Adds a patch or replaces the one with its id, re-checking it and its neighbours. */
  upsert(input: PatchInput): CheckDelta {
    const removed = this.#patches.has(input.id) ? this.#detach(input.id) : [];
    const patch = preparePatch(input, this.settings);
    this.#patches.set(input.id, patch);
    const own = patchFindings(patch, this.settings, this.scene);
    this.#single.set(input.id, own);
    const added = [...own];
    if (patch.extent) {
      for (const other of this.#neighbours(patch.extent, input.id)) added.push(...this.#link(patch, other));
      this.#loose.add(input.id);
      if (this.#loose.size > LOOSE_LIMIT) this.#rebuildTree();
    }
    return { removed, added };
  }

  /** Removes a patch and every finding that involved it. */
  remove(id: PatchId): CheckDelta {
    if (!this.#patches.has(id)) return { removed: [], added: [] };
    const removed = this.#detach(id);
    this.#patches.delete(id);
    return { removed, added: [] };
  }

  /** Rebuilds the index over all patches now (for an idle moment after many edits). */
  compact(): void {
    if (this.#loose.size > 0) this.#rebuildTree();
  }

  /** Every current finding, in a stable order (kind, then patch ids). */
  findings(): Finding[] {
    const all: Finding[] = [];
    for (const list of this.#single.values()) all.push(...list);
    for (const [id, partners] of this.#pairs) {
      for (const [other, list] of partners) if (compareKey(id, other) < 0) all.push(...list);
    }
    return all.sort(compareFindings);
  }

  /** The findings that involve one patch. */
  findingsOf(id: PatchId): Finding[] {
    const list = [...(this.#single.get(id) ?? [])];
    for (const pair of this.#pairs.get(id)?.values() ?? []) list.push(...pair);
    return list.sort(compareFindings);
  }

  counts(): Record<FindingKind, number> {
    return countByKind(this.findings());
  }

  #link(a: PreparedPatch, b: PreparedPatch): Finding[] {
    const found = pairFindings(a, b, this.settings);
    if (found.length === 0) return found;
    this.#partners(a.input.id).set(b.input.id, found);
    this.#partners(b.input.id).set(a.input.id, found);
    return found;
  }

  #partners(id: PatchId): Map<PatchId, Finding[]> {
    let partners = this.#pairs.get(id);
    if (!partners) this.#pairs.set(id, (partners = new Map()));
    return partners;
  }

  /** Drops a patch's findings and its place in the index; returns the findings dropped. */
  #detach(id: PatchId): Finding[] {
    const removed = [...(this.#single.get(id) ?? [])];
    this.#single.delete(id);
    const partners = this.#pairs.get(id);
    if (partners) {
      for (const [other, list] of partners) {
        removed.push(...list);
        const back = this.#pairs.get(other);
        back?.delete(id);
        if (back && back.size === 0) this.#pairs.delete(other);
      }
      this.#pairs.delete(id);
    }
    const slot = this.#slotOf.get(id);
    if (slot !== undefined) {
      this.#slots[slot] = null;
      this.#slotOf.delete(id);
    }
    this.#loose.delete(id);
    return removed;
  }

  /** Patches whose boxes meet `extent`, from the tree and the loose list. */
  #neighbours(extent: Extent, self: PatchId): PreparedPatch[] {
    const [x0, y0, x1, y1] = extent;
    const out: PreparedPatch[] = [];
    if (this.#tree) {
      for (const slot of this.#tree.search(x0, y0, x1, y1)) {
        const id = this.#slots[slot];
        if (id !== null && id !== self) out.push(this.#patches.get(id)!);
      }
    }
    for (const id of this.#loose) {
      if (id === self) continue;
      const other = this.#patches.get(id)!;
      const e = other.extent!;
      if (e[0] <= x1 && e[2] >= x0 && e[1] <= y1 && e[3] >= y0) out.push(other);
    }
    return out;
  }

  #rebuildTree(): void {
    const indexed = [...this.#patches.values()].filter((p) => p.extent);
    this.#slots = indexed.map((p) => p.input.id);
    this.#slotOf = new Map(this.#slots.map((id, slot) => [id!, slot]));
    this.#loose.clear();
    if (indexed.length === 0) {
      this.#tree = null;
      return;
    }
    const tree = new Flatbush(indexed.length);
    for (const p of indexed) tree.add(p.extent![0], p.extent![1], p.extent![2], p.extent![3]);
    tree.finish();
    this.#tree = tree;
  }
}

/** A total order over ids of both types, so each pair is listed once. */
function compareKey(a: PatchId, b: PatchId): number {
  if (typeof a !== typeof b) return typeof a === 'number' ? -1 : 1;
  return a < b ? -1 : a > b ? 1 : 0;
}
