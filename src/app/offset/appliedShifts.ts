import type { ShiftRecord } from '../../core/offset/index.ts';
import type { LedgerEvent, ShiftedOutline } from '../../core/site/index.ts';

// The shifts of a site as the ledger tells them: each application (named by its
// shiftId) with where its patches are now, after every apply, restore, undo and redo.

export interface AppliedShift {
  shiftId: string;
  record: ShiftRecord;
  /** 'apply': the patches sit where the shift put them; 'restore': back where the field put them */
  direction: 'apply' | 'restore';
  /** the newest event of this shift */
  seq: number;
  by: string;
  time: string;
  /** that event's outlines: geometry is where each patch went, previous where it was */
  outlines: ShiftedOutline[];
}

/** Every shift of the ledger in the order first applied; `into` (if given) is updated in place and returned. */
export function appliedShifts(events: Iterable<LedgerEvent>, into: Map<string, AppliedShift> = new Map()): Map<string, AppliedShift> {
  for (const e of events) {
    if (e.kind !== 'patches.shifted') continue;
    const { shiftId, direction, record, outlines } = e.payload;
    // A late whole-ledger read must not take back a newer event already heard of.
    if ((into.get(shiftId)?.seq ?? 0) > e.seq) continue;
    into.set(shiftId, { shiftId, record, direction, seq: e.seq, by: e.actor, time: e.time, outlines });
  }
  return into;
}
