import type { SiteStore } from '../../store/SiteStore.ts';
import type { LedgerEvent, Patch, SiteState, Tag } from '../../core/site/index.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { newPatchId } from './patchIndex.ts';

// Cut and join need a geometry library the first screen does without: loaded once the
// first view is drawn (preloadOutlineEdits), or on first use. Once loaded it is used
// without an await, so a cut or join joins the store's queue at once, in the order the
// user acted (an undo pressed right after a join comes after the join).
type OutlineEdits = typeof import('./outlineEdits.ts');
let loaded: OutlineEdits | null = null;
let loading: Promise<OutlineEdits> | null = null;

function outlineEdits(): Promise<OutlineEdits> {
  loading ??= import('./outlineEdits.ts').then((module) => (loaded = module), (error: unknown) => {
    loading = null; // tried again at the next use
    throw error;
  });
  return loading;
}

/** Loads cut and join's code ahead of the first cut. */
export function preloadOutlineEdits(): void {
  outlineEdits().catch(() => {}); // a failure shows at the first use
}

// Outline edits of the desk, each one or more durable ledger events. Every edit reads
// the state at its turn in the store's queue, so a `previous` value is never stale.
// A cut or a join changes several patches in one `patches.replaced` event, so one undo
// reverses it whole.

export interface Actor {
  interpreter: string;
  time: string;
}

/** Adds a drawn patch; resolves to its id once durable. */
export async function addPatch(store: SiteStore, geometry: MultiPolygonRings, who: Actor): Promise<string> {
  let id = '';
  await store.commitWith((state) => {
    id = newPatchId(state);
    const patch: Patch = { id, geometry, source: { kind: 'drawn' }, createdAt: who.time, createdBy: who.interpreter };
    return { kind: 'patch.added', payload: { patch, tags: [] }, actor: who.interpreter, time: who.time };
  });
  return id;
}

/** Replaces a patch's outline (vertex edits, moves); nothing is written when it is unchanged. */
export function editPatchGeometry(store: SiteStore, patchId: string, geometry: MultiPolygonRings, who: Actor): Promise<LedgerEvent | null> {
  return store.commitWith((state) => {
    const patch = state.patches.get(patchId);
    if (!patch) return null;
    if (JSON.stringify(patch.geometry) === JSON.stringify(geometry)) return null;
    return { kind: 'patch.geometry', payload: { patchId, geometry, previous: patch.geometry }, actor: who.interpreter, time: who.time };
  });
}

/** Deletes a patch with its tags (undo brings both back). */
export function deletePatch(store: SiteStore, patchId: string, who: Actor): Promise<LedgerEvent | null> {
  return store.commitWith((state) => {
    const patch = state.patches.get(patchId);
    if (!patch) return null;
    const tags = [...state.tags.values()].filter((t) => t.patchId === patchId);
    return { kind: 'patch.deleted', payload: { patch, tags }, actor: who.interpreter, time: who.time };
  });
}

/**
 * Cuts a patch with a line: the largest piece keeps the patch's id, each other piece
 * becomes a new patch carrying copies of the original's tags. Resolves to the new ids.
 */
export async function splitPatch(store: SiteStore, patchId: string, line: [number, number][], who: Actor): Promise<string[]> {
  const { splitOutline } = loaded ?? (await outlineEdits());
  const patch = store.state.patches.get(patchId);
  if (!patch) return [];
  const [kept, ...others] = splitOutline(patch.geometry, line);
  const ids: string[] = [];
  await store.commitWith((state) => {
    const original = state.patches.get(patchId);
    if (!original) return null;
    const tags = tagsOf(state, patchId);
    const pieces: Patch[] = [{ ...original, geometry: kept }];
    const pieceTags: Tag[] = [...tags];
    for (const piece of others) {
      const id = newPatchId(state, pieces.map((p) => p.id));
      ids.push(id);
      pieces.push({ id, geometry: piece, source: { kind: 'drawn' }, createdAt: who.time, createdBy: who.interpreter });
      pieceTags.push(...tags.map((t) => ({ ...t, patchId: id })));
    }
    return {
      kind: 'patches.replaced',
      payload: { edit: 'cut', before: { patches: [original], tags }, after: { patches: pieces, tags: pieceTags } },
      actor: who.interpreter, time: who.time,
    };
  });
  return ids;
}

/** Merges patch `other` into `into`: `into` takes the union and keeps its tags, `other` goes with its own. */
export async function mergePatches(store: SiteStore, into: string, other: string, who: Actor): Promise<void> {
  const { mergeOutlines } = loaded ?? (await outlineEdits());
  const a = store.state.patches.get(into);
  const b = store.state.patches.get(other);
  if (!a || !b || into === other) return;
  const merged = mergeOutlines(a.geometry, b.geometry);
  await store.commitWith((state) => {
    const kept = state.patches.get(into);
    const gone = state.patches.get(other);
    if (!kept || !gone) return null;
    const keptTags = tagsOf(state, into);
    return {
      kind: 'patches.replaced',
      payload: {
        edit: 'join',
        before: { patches: [kept, gone], tags: [...keptTags, ...tagsOf(state, other)] },
        after: { patches: [{ ...kept, geometry: merged }], tags: keptTags },
      },
      actor: who.interpreter, time: who.time,
    };
  });
}

function tagsOf(state: SiteState, patchId: string): Tag[] {
  return [...state.tags.values()].filter((t) => t.patchId === patchId);
}
