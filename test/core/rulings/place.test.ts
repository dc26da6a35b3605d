import { describe, expect, it } from 'vitest';
import { itemAtPlace, type QueueItem } from '../../../src/core/rulings/index.ts';

// Coming back to the queue: the patch left in hand, or the one that took its place.
// Plain list logic, no outside source: the expected items follow from the rule stated
// in src/core/rulings/place.ts.

const item = (patchId: string, settled = false) => ({ patchId, settled }) as QueueItem;

describe('the place in the queue', () => {
  const all = [item('P1'), item('P2'), item('P3', true), item('P4')];
  const open = all.filter((i) => !i.settled);

  it('finds the patch in hand while the list holds it, wherever it moved', () => {
    expect(itemAtPlace(open, all, { patchId: 'P4', position: 0 })?.patchId).toBe('P4');
  });

  it('keeps the patch in hand when a filter hides it (it was just settled)', () => {
    expect(itemAtPlace(open, all, { patchId: 'P3', position: 2 })?.patchId).toBe('P3');
  });

  it('takes the item now at the old position when the patch left the queue, or the last', () => {
    const without = open.filter((i) => i.patchId !== 'P2');
    expect(itemAtPlace(without, all.filter((i) => i.patchId !== 'P2'), { patchId: 'P2', position: 1 })?.patchId).toBe('P4');
    expect(itemAtPlace(without, all, { patchId: 'P9', position: 7 })?.patchId).toBe('P4');
  });

  it('starts at the first item, and gives nothing for an empty list', () => {
    expect(itemAtPlace(open, all, { patchId: null, position: 0 })?.patchId).toBe('P1');
    expect(itemAtPlace([], [], { patchId: 'P1', position: 3 })).toBeNull();
  });
});
