import type {
  ImportRecord, Pass, Patch, ReferenceFeature, RosterEntry, Ruling, SceneRef, Site, Tag,
} from './types.ts';
import type { ShiftRecord } from '../offset/shiftPatches.ts';
import type { Scheme } from '../training/scheme.ts';

/** One patch's outline in a shift: where it goes and where it was. */
export interface ShiftedOutline {
  patchId: string;
  geometry: Patch['geometry'];
  previous: Patch['geometry'];
}

/** Patches with every tag they carry, as one side of a replacement. */
export interface PatchesWithTags {
  patches: Patch[];
  tags: Tag[];
}

// The ledger's event kinds. Each change to a site is exactly one of these. Events that
// can be undone carry both the new and the previous value, so their inverse is another
// event of the same family, built from the payload alone (see inverse.ts).

export interface EventPayloads {
  /** The first event of every ledger. */
  'site.created': { site: Site };
  'site.renamed': { name: string; previous: string };
  'scene.added': { scene: SceneRef };
  /** The whole roster replaced (edits, imports). */
  'roster.set': { entries: RosterEntry[]; previous: RosterEntry[] };
  /** A patch with its tags (tags are non-empty when an undo restores a deleted patch). */
  'patch.added': { patch: Patch; tags: Tag[] };
  'patch.deleted': { patch: Patch; tags: Tag[] };
  'patch.geometry': { patchId: string; geometry: Patch['geometry']; previous: Patch['geometry'] };
  /**
   * A set of patches moved by one estimated field-to-imagery shift (`direction`
   * 'apply'), or moved back to where they were ('restore'). `shiftId` names the
   * application, so its undo, redo and restore read as the same one.
   */
  'patches.shifted': { shiftId: string; direction: 'apply' | 'restore'; record: ShiftRecord; outlines: ShiftedOutline[] };
  /**
   * One outline edit that changes several patches at once, so one undo reverses it:
   * 'cut' (a patch cut by a line into pieces) or 'join' (two patches become one).
   * `before` leaves the site with all its tags and `after` comes in with its own.
   */
  'patches.replaced': { edit: 'cut' | 'join'; before: PatchesWithTags; after: PatchesWithTags };
  /** A tag set, changed or (tag null) removed; `previous` is what it replaced. */
  'tag.set': { patchId: string; passId: string; tag: Tag | null; previous: Tag | null };
  /** A field file imported: its record, new patches, their tags, reference features. */
  'import.added': { record: ImportRecord; patches: Patch[]; tags: Tag[]; references: ReferenceFeature[] };
  'import.removed': { record: ImportRecord; patches: Patch[]; tags: Tag[]; references: ReferenceFeature[] };
  'pass.started': { pass: Pass };
  'pass.ended': { passId: string; time: string };
  /** A blind pass held: it stays open and hidden from others, but takes no calls until resumed. */
  'pass.paused': { passId: string; time: string };
  'pass.resumed': { passId: string; time: string };
  /** Another interpreter takes the desk of this site (an explicit switch, never implied). */
  'interpreter.switched': { from: string | null; to: string; initials: string };
  /** The site's named training schemes replaced (edits, presets); `previous` is what it replaced. */
  'schemes.set': { schemes: Scheme[]; previous: Scheme[] };
  'ruling.recorded': { ruling: Ruling };
  'ruling.reopened': { rulingId: string; by: string; time: string; reason: string };
}

export type EventKind = keyof EventPayloads;

export const EVENT_KINDS = [
  'site.created', 'site.renamed', 'scene.added', 'roster.set', 'patch.added', 'patch.deleted',
  'patch.geometry', 'patches.shifted', 'patches.replaced', 'tag.set', 'import.added', 'import.removed', 'pass.started',
  'pass.ended', 'pass.paused', 'pass.resumed', 'interpreter.switched', 'schemes.set', 'ruling.recorded', 'ruling.reopened',
] as const satisfies readonly EventKind[];

/** An event as a use case proposes it, before the ledger numbers and hashes it. */
export type EventDraft = {
  [K in EventKind]: {
    kind: K;
    payload: EventPayloads[K];
    /** who made the change */
    actor: string;
    /** ISO 8601 UTC */
    time: string;
    /** set on an undo: the seq of the event it reverses */
    undoes?: number;
    /** set on a redo: the seq of the undo event it reverses */
    redoes?: number;
  };
}[EventKind];

/** An event as stored: numbered from 1, chained to the one before by its hash. */
export type LedgerEvent = EventDraft & {
  seq: number;
  /** hash of the previous event; 64 zeros for seq 1 */
  prev: string;
  /** SHA-256 (hex) of the canonical JSON of every other member */
  hash: string;
};

/** The kinds that go on the undo stack. */
export const UNDOABLE_KINDS: ReadonlySet<EventKind> = new Set<EventKind>([
  'site.renamed', 'roster.set', 'patch.added', 'patch.deleted', 'patch.geometry', 'patches.shifted', 'patches.replaced',
  'tag.set', 'import.added', 'import.removed', 'schemes.set',
]);
