import { describe, expect, it } from 'vitest';
import { canonicalJson } from '../../../src/core/ledger/canonicalJson.ts';
import { defaultSettings, shiftPatches, SHIFT_METHOD, type ShiftRecord } from '../../../src/core/offset/index.ts';
import { patchHistory } from '../../../src/core/export/patchHistory.ts';
import { patchRecords } from '../../../src/core/export/patchRecords.ts';
import {
  emptySiteState, inverseOf, readSiteFile, replay, siteFileOf, touchedRows, writeSiteFile, type LedgerEvent, type ShiftedOutline,
} from '../../../src/core/site/index.ts';
import { buildSite, type MemoryLedger } from './scenario.ts';

// The 'patches.shifted' event: a set moved by one estimated shift in one step, undone
// and redone exactly, replayed from empty to the same state, kept in a site file and
// read by the export's history as a shift of each patch.

const record = (ids: string[], dx = 0.37, dy = -1.21): ShiftRecord => ({
  shift: { dx, dy }, uncertaintyM: 0.05, method: `${SHIFT_METHOD} (signal: ndvi)`,
  settings: defaultSettings(0.3, 1.2), patchIds: ids, outliers: [ids[0]],
});

async function shifted(l: MemoryLedger, ids: string[], direction: 'apply' | 'restore' = 'apply', shiftId = 'shift-1') {
  const r = record(ids);
  const outlines: ShiftedOutline[] = ids.map((patchId) => {
    const previous = l.state.patches.get(patchId)!.geometry;
    return { patchId, previous, geometry: shiftPatches([previous], r.shift)[0] };
  });
  return l.add({ kind: 'patches.shifted', payload: { shiftId, direction, record: r, outlines } });
}

const geometries = (l: MemoryLedger) => canonicalJson([...l.state.patches.values()].map((p) => [p.id, p.geometry]));

describe('patches.shifted', () => {
  it('moves every listed patch by the shift and leaves the others', async () => {
    const l = await buildSite();
    const before = structuredClone(l.state.patches);
    await shifted(l, ['p0', 'p2']);
    const p0 = l.state.patches.get('p0')!.geometry[0][0];
    expect(p0[0][0]).toBeCloseTo(before.get('p0')!.geometry[0][0][0][0] + 0.37, 12);
    expect(p0[0][1]).toBeCloseTo(before.get('p0')!.geometry[0][0][0][1] - 1.21, 12);
    expect(l.state.patches.get('p1')).toEqual(before.get('p1'));
    expect(l.state.patches.get('p4')).toEqual(before.get('p4'));
  });

  it('is one undo step that gives the originals back byte for byte, and redo moves them again', async () => {
    const l = await buildSite();
    const original = geometries(l);
    await shifted(l, ['p0', 'p1', 'p2', 'p4']);
    const moved = geometries(l);
    expect(moved).not.toBe(original);
    await l.undo();
    expect(geometries(l)).toBe(original);
    const undo = l.events.at(-1)!;
    expect(undo.kind === 'patches.shifted' && undo.payload.direction).toBe('restore');
    await l.redo();
    expect(geometries(l)).toBe(moved);
  });

  it('replays from empty to the state it left, through apply, undo and redo', async () => {
    const l = await buildSite();
    await shifted(l, ['p0', 'p1']);
    await l.undo();
    await l.redo();
    expect(replay(emptySiteState(), l.events)).toEqual(l.state);
  });

  it('refuses a shift of a patch that changed since it was worked out, without moving any', async () => {
    const l = await buildSite();
    const r = record(['p0', 'p1']);
    const p0 = l.state.patches.get('p0')!.geometry;
    const stale: ShiftedOutline[] = [
      { patchId: 'p0', previous: p0, geometry: shiftPatches([p0], r.shift)[0] },
      { patchId: 'p1', previous: p0, geometry: shiftPatches([p0], r.shift)[0] },
    ];
    const before = l.state;
    await expect(l.add({ kind: 'patches.shifted', payload: { shiftId: 's', direction: 'apply', record: r, outlines: stale } })).rejects.toThrow(/p1 changed since/);
    expect(l.state).toBe(before);
    const twice = [stale[0], stale[0]];
    await expect(l.add({ kind: 'patches.shifted', payload: { shiftId: 's', direction: 'apply', record: r, outlines: twice } })).rejects.toThrow(/moved twice/);
    const gone = [{ ...stale[0], patchId: 'p3' }];
    await expect(l.add({ kind: 'patches.shifted', payload: { shiftId: 's', direction: 'apply', record: r, outlines: gone } })).rejects.toThrow(/no patch p3/);
  });

  it('has an inverse that swaps each outline and the direction, and whose inverse is the event', async () => {
    const l = await buildSite();
    const event = await shifted(l, ['p0', 'p4']);
    const inverse = inverseOf(event);
    expect(inverse.kind).toBe('patches.shifted');
    const back = inverseOf({ ...event, ...inverse } as LedgerEvent);
    expect(back.payload).toEqual(event.payload);
    expect(touchedRows(event).patches).toEqual(['p0', 'p4']);
  });

  it('survives the site file: written, read, verified and replayed', async () => {
    const l = await buildSite();
    await shifted(l, ['p0', 'p1']);
    await l.undo();
    const text = writeSiteFile(siteFileOf(l.state, l.events));
    const read = await readSiteFile('site.fellfield.json', text);
    expect(read.state).toEqual(l.state);
  });

  it('is read by the export history as a shift of each patch, with its uncertainty and method; the undo as the shift reversed', async () => {
    const l = await buildSite();
    const apply = await shifted(l, ['p0', 'p2']);
    const undo = await l.undo();
    const changes = patchHistory(l.events).changes.get('p0')!;
    expect(changes).toHaveLength(2);
    expect(changes[0]).toMatchObject({ kind: 'shift', seq: apply.seq, undo: false, uncertaintyM: 0.05, method: expect.stringContaining('bootstrap') });
    if (changes[0].kind !== 'shift' || changes[1].kind !== 'shift') throw new Error('expected shifts');
    expect(changes[0].dx).toBeCloseTo(0.37, 9);
    expect(changes[0].dy).toBeCloseTo(-1.21, 9);
    expect(changes[1]).toMatchObject({ seq: undo.seq, undo: true });
    expect(changes[1].dx).toBeCloseTo(-0.37, 9);
    expect(patchHistory(l.events).changes.has('p1')).toBe(false);
  });

  it('goes out in each moved patch\'s exported transformations with its uncertainty and method', async () => {
    const l = await buildSite();
    const apply = await shifted(l, ['p0', 'p2']);
    const { patches } = patchRecords(l.state, l.events, { selection: { kind: 'all-passes' } });
    const p0 = patches.find((p) => p.id === 'p0')!;
    const shift = p0.transformations.find((t) => t.kind === 'shift');
    expect(shift).toMatchObject({ kind: 'shift', ledger_seq: apply.seq, undo: false, uncertainty_m: 0.05, method: expect.stringContaining('quadratic peak fit') });
    expect(patches.find((p) => p.id === 'p1')!.transformations.some((t) => t.kind === 'shift')).toBe(false);
  });
});
