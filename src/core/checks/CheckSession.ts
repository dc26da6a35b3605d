import Flatbush from 'flatbush';
import { boxPairs } from '../geometry/boxPairs.ts';
import { countPurePixels } from '../geometry/purePixels.ts';
import type { Extent } from '../geometry/types.ts';
import { compareFindings, countByKind, type Finding, type FindingKind, type PatchId } from './findings.ts';
import { pairFindings } from './pairFindings.ts';
import { patchFindings } from './patchFindings.ts';
import { preparePatch, type PatchInput, type PreparedPatch } from './preparedPatch.ts';
import { resolveSettings, type CheckSettings, type SceneGrids } from './settings.ts';
import { nextTask } from '../nextTask.ts';

// The checks over a whole site, kept current edit by edit. A full load checks each
// patch and each pair of neighbouring boxes (found all at once, see boxPairs.ts).
// After that, adding, changing or removing one patch re-checks only that patch and its
// neighbours, found in a Flatbush tree of every patch's box, built at the first edit
// (or sooner by compact()). Flatbush trees are static, so a changed patch leaves its
// old slot dead and joins a short list of loose patches searched one by one; the tree
// is rebuilt when that list grows long.

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

/** One patch in the session: kept in a single map, so a full load costs one map write per patch. */
interface Entry {
  patch: PreparedPatch;
  /** Its own findings; only patches with some keep a list (see #single). */
  single: Finding[];
  /** Its place in the tree, or -1 while loose (or without an extent). */
  slot: number;
}

/** The answer for most patches, shared (never changed). */
const NONE: Finding[] = Object.freeze([]) as unknown as Finding[];

export class CheckSession {
  readonly settings: CheckSettings;
  readonly scene: SceneGrids;
  #patches = new Map<PatchId, Entry>();
  /** The entries with findings of their own, so listing them skips the many without. */
  #single = new Set<Entry>();
  #pairs = new Map<PatchId, Map<PatchId, Finding[]>>();
  #tree: Flatbush | null = null;
  /** Whether #tree and the slots cover every patch not in #loose (false after a load). */
  #indexed = false;
  /** Tree slot -> entry; null once the entry left its slot. */
  #slots: (Entry | null)[] = [];
  #loose = new Set<Entry>();

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
      await nextTask();
      if (progress.signal?.aborted) {
        this.#clear();
        throw progress.signal.reason ?? new Error('the check was cancelled');
      }
    }
    progress.onProgress?.(list.length * 2, list.length * 2);
  }

  /** A patch's area and pure pixel count, or null for an unknown id. */
  figures(id: PatchId): PatchFigures | null {
    const patch = this.#patches.get(id)?.patch;
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
    this.#indexed = false;
  }

  /** The full check as a sequence of steps; yields work done after each chunk. */
  *#loadSteps(patches: PatchInput[], chunk: number): Generator<number, void> {
    this.#clear();
    let done = 0;
    // Whole chunks done pause the steps (a plain load passes Infinity: no pauses).
    let pause = chunk;
    // An index loop: in a generator, for-of would allocate a result object per patch.
    for (let i = 0; i < patches.length; i++) {
      const input = patches[i];
      const entry = this.#check(input);
      this.#patches.set(input.id, entry);
      if (this.#patches.size === done) {
        this.#clear();
        throw new RangeError(`patch id ${JSON.stringify(input.id)} appears twice`);
      }
      if (++done === pause) {
        pause += chunk;
        yield done;
      }
    }
    const slots = this.#indexable();
    // The tree, built only when the boxes are too uneven for the grid, takes the
    // entries in this same order, so its slots are these indices.
    const { start, partner } = boxPairs(slots.map((entry) => entry.patch.extent!), (e) => this.#index()!.search(e[0], e[1], e[2], e[3]));
    for (let i = 0; i < slots.length; i++) {
      const patch = slots[i].patch;
      for (let k = start[i]; k < start[i + 1]; k++) this.#link(patch, slots[partner[k]].patch);
      if (++done === pause) {
        pause += chunk;
        yield done;
      }
    }
  }

  /** Adds a patch or replaces the one with its id, re-checking it and its neighbours. */
  upsert(input: PatchInput): CheckDelta {
    this.#index();
    const old = this.#patches.get(input.id);
    const removed = old ? this.#detach(old) : [];
    const entry = this.#check(input);
    this.#patches.set(input.id, entry);
    const { patch } = entry;
    const added = [...entry.single];
    if (patch.extent) {
      for (const other of this.#neighbours(patch.extent, entry)) added.push(...this.#link(patch, other));
      this.#loose.add(entry);
      if (this.#loose.size > LOOSE_LIMIT) this.#rebuildTree();
    }
    return { removed, added };
  }

  /** Prepares and checks one patch on its own. */
  #check(input: PatchInput): Entry {
    const patch = preparePatch(input, this.settings);
    const single = patchFindings(patch, this.settings, this.scene);
    const entry: Entry = { patch, single: single.length ? single : NONE, slot: -1 };
    if (single.length) this.#single.add(entry);
    return entry;
  }

  /** Removes a patch and every finding that involved it. */
  remove(id: PatchId): CheckDelta {
    const entry = this.#patches.get(id);
    if (!entry) return { removed: [], added: [] };
    const removed = this.#detach(entry);
    this.#patches.delete(id);
    return { removed, added: [] };
  }

  /** Builds the index over all patches now (for an idle moment after a load or many edits). */
  compact(): void {
    if (this.#loose.size > 0 || !this.#indexed) this.#rebuildTree();
  }

  /** Every current finding, in a stable order (kind, then patch ids). */
  findings(): Finding[] {
    const all: Finding[] = [];
    for (const entry of this.#single) all.push(...entry.single);
    for (const [id, partners] of this.#pairs) {
      for (const [other, list] of partners) if (compareKey(id, other) < 0) all.push(...list);
    }
    return all.sort(compareFindings);
  }

  /** The findings that involve one patch. */
  findingsOf(id: PatchId): Finding[] {
    const list = [...(this.#patches.get(id)?.single ?? [])];
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
  #detach(entry: Entry): Finding[] {
    const id = entry.patch.input.id;
    const removed = [...entry.single];
    this.#single.delete(entry);
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
    if (entry.slot >= 0) this.#slots[entry.slot] = null;
    this.#loose.delete(entry);
    return removed;
  }

  /** Patches whose boxes meet `extent`, from the tree and the loose list. */
  #neighbours(extent: Extent, self: Entry): PreparedPatch[] {
    const [x0, y0, x1, y1] = extent;
    const out: PreparedPatch[] = [];
    if (this.#tree) {
      for (const slot of this.#tree.search(x0, y0, x1, y1)) {
        const entry = this.#slots[slot];
        if (entry !== null && entry !== self) out.push(entry.patch);
      }
    }
    for (const entry of this.#loose) {
      if (entry === self) continue;
      const e = entry.patch.extent!;
      if (e[0] <= x1 && e[2] >= x0 && e[1] <= y1 && e[3] >= y0) out.push(entry.patch);
    }
    return out;
  }

  /** The patches with a box, in the order the tree takes them. */
  #indexable(): Entry[] {
    const out: Entry[] = [];
    for (const entry of this.#patches.values()) if (entry.patch.extent) out.push(entry);
    return out;
  }

  /** The tree, built first if a load left it unbuilt. */
  #index(): Flatbush | null {
    if (!this.#indexed) this.#rebuildTree();
    return this.#tree;
  }

  #rebuildTree(): void {
    for (const entry of this.#patches.values()) entry.slot = -1;
    const slots = this.#indexable();
    slots.forEach((entry, slot) => (entry.slot = slot));
    this.#slots = slots;
    this.#loose.clear();
    this.#indexed = true;
    if (slots.length === 0) {
      this.#tree = null;
      return;
    }
    const tree = new Flatbush(slots.length);
    for (const { patch: { extent: e } } of slots) tree.add(e![0], e![1], e![2], e![3]);
    tree.finish();
    this.#tree = tree;
  }
}

/** A total order over ids of both types, so each pair is listed once. */
function compareKey(a: PatchId, b: PatchId): number {
  if (typeof a !== typeof b) return typeof a === 'number' ? -1 : 1;
  return a < b ? -1 : a > b ? 1 : 0;
}
