import { describe, expect, it } from 'vitest';
import { patchHistory, translationBetween } from '../../../src/core/export/patchHistory.ts';
import { square, twoPassSite } from './siteBuilder.ts';

describe('patch history from the ledger', () => {
  it('tells a whole-outline move as a shift with its offset', () => {
    expect(translationBetween(square(0, 0, 2), square(1.5, -0.25, 2))).toEqual([1.5, -0.25]);
  });

  it('tells a reshaped outline as an edit (no single offset)', () => {
    const moved = square(0, 0, 2);
    moved[0][0][2] = [2.5, 2.5];
    expect(translationBetween(square(0, 0, 2), moved)).toBeNull();
    expect(translationBetween(square(0, 0, 2), [...square(0, 0, 2), ...square(5, 5, 1)])).toBeNull();
  });

  it('lists each patch\'s changes with who, when and the ledger seq, and no other patch\'s', async () => {
    const b = await twoPassSite(3);
    await b.shift('P2', 0.75, -1.25);
    const reshaped = b.state.patches.get('P3')!.geometry.map((r) => r.map((ring) => ring.map(([x, y], i) => [i === 1 ? x + 1 : x, y] as [number, number])));
    await b.commit({ kind: 'patch.geometry', payload: { patchId: 'P3', geometry: reshaped, previous: b.state.patches.get('P3')!.geometry } }, 'ben');
    const h = patchHistory(b.events);
    expect(h.changes.get('P1')).toBeUndefined();
    const [shift] = h.changes.get('P2')!;
    expect(shift).toMatchObject({ kind: 'shift', by: 'ana', undo: false });
    if (shift.kind !== 'shift') throw new Error('expected a shift');
    expect(shift.dx).toBeCloseTo(0.75, 9);
    expect(shift.dy).toBeCloseTo(-1.25, 9);
    expect(b.events[shift.seq - 1].kind).toBe('patch.geometry');
    expect(h.changes.get('P3')).toEqual([expect.objectContaining({ kind: 'edit', by: 'ben' })]);
    expect(h.origin.get('P1')?.seq).toBe(b.events.find((e) => e.kind === 'patch.added' && e.payload.patch.id === 'P1')!.seq);
  });
});
