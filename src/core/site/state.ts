import type {
  ImportRecord, Pass, Patch, ReferenceFeature, RosterEntry, Ruling, SceneRef, Site, Tag,
} from './types.ts';
import type { Scheme } from '../training/scheme.ts';

/** The current state of a site: what replaying its ledger from empty gives. */
export interface SiteState {
  site: Site | null;
  scenes: ReadonlyMap<string, SceneRef>;
  roster: readonly RosterEntry[];
  patches: ReadonlyMap<string, Patch>;
  /** keyed by tagKey(patchId, passId) */
  tags: ReadonlyMap<string, Tag>;
  passes: ReadonlyMap<string, Pass>;
  rulings: ReadonlyMap<string, Ruling>;
  references: ReadonlyMap<string, ReferenceFeature>;
  imports: ReadonlyMap<string, ImportRecord>;
  /** the site's named training schemes, in the order the user keeps them */
  schemes: readonly Scheme[];
  /** seqs of the events an undo would reverse (last on top) and of the undos a redo would */
  history: { undo: readonly number[]; redo: readonly number[] };
  /** the last event applied: seq 0 and 64 zeros before the first */
  head: { seq: number; hash: string };
}

export const GENESIS_HASH = '0'.repeat(64);

/** How many steps back undo reaches; older steps stay in the ledger but leave the stack. */
export const UNDO_DEPTH = 1000;

export function emptySiteState(): SiteState {
  return {
    site: null,
    scenes: new Map(),
    roster: [],
    patches: new Map(),
    tags: new Map(),
    passes: new Map(),
    rulings: new Map(),
    references: new Map(),
    imports: new Map(),
    schemes: [],
    history: { undo: [], redo: [] },
    head: { seq: 0, hash: GENESIS_HASH },
  };
}

/** The tags of one patch (scans: a site holds tens of thousands of tags at most). */
export function tagsOfPatch(state: SiteState, patchId: string): Tag[] {
  const found: Tag[] = [];
  for (const tag of state.tags.values()) if (tag.patchId === patchId) found.push(tag);
  return found;
}
