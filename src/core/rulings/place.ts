import type { QueueItem } from './queue.ts';

// Where the person ruling is in the queue, so that leaving the page (to split a patch on
// the desk, or to read a sheet) and coming back finds the same place: the patch in hand,
// and where it stood in the listed items when it was last in hand.

export interface QueuePlace {
  /** the patch in hand, or null before any was chosen */
  patchId: string | null;
  /** its index among the listed items when it was last in hand (0 before any) */
  position: number;
}

/**
 * The item to show for a place: the patch itself while the list holds it; else the same
 * patch if the whole queue still holds it (a filter hides it, e.g. just settled); else,
 * when it left the queue (deleted, or merged into another), the item now at its old
 * position — the one that followed it — or the last one; null for an empty list.
 */
export function itemAtPlace(listed: readonly QueueItem[], all: readonly QueueItem[], place: QueuePlace): QueueItem | null {
  if (place.patchId !== null) {
    const same = listed.find((i) => i.patchId === place.patchId) ?? all.find((i) => i.patchId === place.patchId);
    if (same) return same;
  }
  if (listed.length === 0) return null;
  return listed[Math.min(Math.max(0, place.position), listed.length - 1)];
}
