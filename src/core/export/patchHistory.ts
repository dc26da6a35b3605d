import type { MultiPolygonRings } from '../geometry/types.ts';
import type { LedgerEvent } from '../site/events.ts';

// What happened to each patch's outline, read from the ledger in one pass: every
// geometry change with who and when, told as a shift when the whole outline moved by
// one offset (how a systematic GPS correction is applied), else as an edit.

/** Two offsets closer than this (metres) are the same shift: far below any pixel. */
const SAME_OFFSET_M = 1e-6;

export type GeometryChange =
  | {
      kind: 'shift'; seq: number; by: string; time: string; dx: number; dy: number; undo: boolean;
      /** for an estimated field-to-imagery shift: its 95 % radius (metres) and method */
      uncertaintyM?: number; method?: string;
    }
  | {
      kind: 'edit'; seq: number; by: string; time: string; undo: boolean;
      /** set when the outline was cut by a line or joined with another patch */
      how?: 'cut' | 'join';
    };

export interface PatchOrigin {
  /** The event that made the patch as it now is (a later delete and undo makes it anew). */
  seq: number;
  by: string;
  time: string;
}

export interface PatchHistory {
  origin: Map<string, PatchOrigin>;
  changes: Map<string, GeometryChange[]>;
}

/** The one offset that moves `from` onto `to`, or null when the change is not a translation. */
export function translationBetween(from: MultiPolygonRings, to: MultiPolygonRings): [number, number] | null {
  if (from.length !== to.length || from.length === 0) return null;
  let dx = NaN, dy = NaN;
  for (let p = 0; p < from.length; p++) {
    if (from[p].length !== to[p].length) return null;
    for (let r = 0; r < from[p].length; r++) {
      const a = from[p][r], b = to[p][r];
      if (a.length !== b.length) return null;
      for (let i = 0; i < a.length; i++) {
        const ex = b[i][0] - a[i][0], ey = b[i][1] - a[i][1];
        if (Number.isNaN(dx)) { dx = ex; dy = ey; continue; }
        if (Math.abs(ex - dx) > SAME_OFFSET_M || Math.abs(ey - dy) > SAME_OFFSET_M) return null;
      }
    }
  }
  return Number.isNaN(dx) ? null : [dx, dy];
}

export function patchHistory(events: readonly LedgerEvent[]): PatchHistory {
  const origin = new Map<string, PatchOrigin>();
  const changes = new Map<string, GeometryChange[]>();
  for (const e of events) {
    const stamp = { seq: e.seq, by: e.actor, time: e.time };
    if (e.kind === 'patch.added') {
      origin.set(e.payload.patch.id, stamp);
      changes.delete(e.payload.patch.id);
    } else if (e.kind === 'import.added') {
      for (const p of e.payload.patches) {
        origin.set(p.id, stamp);
        changes.delete(p.id);
      }
    } else if (e.kind === 'patch.geometry') {
      const { patchId, geometry, previous } = e.payload;
      const undo = e.undoes !== undefined;
      const offset = translationBetween(previous, geometry);
      const change: GeometryChange = offset
        ? { kind: 'shift', ...stamp, dx: offset[0], dy: offset[1], undo }
        : { kind: 'edit', ...stamp, undo };
      const list = changes.get(patchId);
      if (list) list.push(change);
      else changes.set(patchId, [change]);
    } else if (e.kind === 'patches.replaced') {
      // A cut or a join: a patch on both sides changed its outline; a piece new to the
      // site starts here, a piece of a cut keeping the history of the outline it came from.
      const { edit, before, after } = e.payload;
      const undo = e.undoes !== undefined;
      const beforeIds = new Set(before.patches.map((p) => p.id));
      const inherited = edit === 'cut' && !undo ? [...(changes.get(before.patches[0].id) ?? [])] : [];
      for (const p of after.patches) {
        const change: GeometryChange = { kind: 'edit', ...stamp, undo, how: edit };
        if (beforeIds.has(p.id)) {
          const list = changes.get(p.id);
          if (list) list.push(change);
          else changes.set(p.id, [change]);
        } else {
          origin.set(p.id, stamp);
          changes.set(p.id, [...inherited, change]);
        }
      }
    } else if (e.kind === 'patches.shifted') {
      // An estimated shift moves the set; moving back (restore, or its undo) is the shift reversed.
      const { direction, record, outlines } = e.payload;
      const sign = direction === 'apply' ? 1 : -1;
      const undo = e.undoes !== undefined;
      for (const o of outlines) {
        const offset = translationBetween(o.previous, o.geometry) ?? [sign * record.shift.dx, sign * record.shift.dy];
        const change: GeometryChange = {
          kind: 'shift', ...stamp, dx: offset[0], dy: offset[1], undo, uncertaintyM: record.uncertaintyM, method: record.method,
        };
        const list = changes.get(o.patchId);
        if (list) list.push(change);
        else changes.set(o.patchId, [change]);
      }
    }
  }
  return { origin, changes };
}
