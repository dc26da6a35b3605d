import { shiftPatches, shiftRecord, type OffsetEstimate } from '../../core/offset/index.ts';
import { SiteRuleError, type LedgerEvent, type ShiftedOutline } from '../../core/site/index.ts';
import type { SiteStore } from '../../store/SiteStore.ts';
import { newId } from '../site/context.ts';

// Applying an estimated shift to the set as one ledger event (one undo step), and
// putting the set back where the field put it. Both keep the other position in the
// event, so either can be undone exactly.

export interface Actor {
  interpreter: string;
  time: string;
}

/** Moves the patches of an estimate (those still in the site) by its shift; refused when the shift is not reliable. */
export async function applyShift(store: SiteStore, estimate: OffsetEstimate, patchIds: readonly string[], who: Actor): Promise<LedgerEvent> {
  shiftRecord(estimate, patchIds); // refuses an unreliable estimate before anything else
  const event = await store.commitWith((state) => {
    const present = patchIds.filter((id) => state.patches.has(id));
    if (present.length === 0) throw new SiteRuleError('none of the estimated patches is in the site any more');
    const record = shiftRecord(estimate, present);
    const outlines: ShiftedOutline[] = present.map((patchId) => {
      const previous = state.patches.get(patchId)!.geometry;
      return { patchId, geometry: shiftPatches([previous], record.shift)[0], previous };
    });
    return { kind: 'patches.shifted', payload: { shiftId: newId('shift'), direction: 'apply', record, outlines }, actor: who.interpreter, time: who.time };
  });
  return event!;
}

export interface RestoreResult {
  event: LedgerEvent;
  /** patches edited since the shift: moved back by the shift, their edit kept */
  movedBack: string[];
  /** patches deleted since the shift */
  gone: string[];
}

/**
 * Puts the patches of an applied shift back where they were. An outline untouched
 * since gets its original back exactly; one edited since is moved back by the shift
 * (so the edit stays); a deleted one is left out.
 */
export async function restoreOriginals(store: SiteStore, shiftId: string, who: Actor): Promise<RestoreResult> {
  const ledger = await store.ledger();
  const latest = [...ledger].reverse().find((e) => e.kind === 'patches.shifted' && e.payload.shiftId === shiftId) as
    | Extract<LedgerEvent, { kind: 'patches.shifted' }> | undefined;
  if (!latest) throw new SiteRuleError(`no shift ${shiftId} in the site`);
  if (latest.payload.direction === 'restore') throw new SiteRuleError('the patches of this shift are already back where the field put them');
  const movedBack: string[] = [];
  const gone: string[] = [];
  const event = await store.commitWith((state) => {
    movedBack.length = 0;
    gone.length = 0;
    const { record } = latest.payload;
    const back = { dx: -record.shift.dx, dy: -record.shift.dy };
    const outlines: ShiftedOutline[] = [];
    for (const o of latest.payload.outlines) {
      const patch = state.patches.get(o.patchId);
      if (!patch) {
        gone.push(o.patchId);
        continue;
      }
      const untouched = JSON.stringify(patch.geometry) === JSON.stringify(o.geometry);
      if (!untouched) movedBack.push(o.patchId);
      outlines.push({ patchId: o.patchId, geometry: untouched ? o.previous : shiftPatches([patch.geometry], back)[0], previous: patch.geometry });
    }
    if (outlines.length === 0) throw new SiteRuleError('every patch of this shift has been deleted since');
    return { kind: 'patches.shifted', payload: { shiftId, direction: 'restore', record, outlines }, actor: who.interpreter, time: who.time };
  });
  return { event: event!, movedBack, gone };
}
