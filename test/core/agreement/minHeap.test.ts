import { describe, expect, it } from 'vitest';
import { MinHeap } from '../../../src/core/agreement/minHeap.ts';
import { seeded } from '../../../bench/harness.ts';

describe('MinHeap', () => {
  it('pops keys in the order Array.prototype.sort gives, values with them', () => {
    const random = seeded(5);
    const keys = Array.from({ length: 500 }, () => Math.floor(random() * 100));
    const heap = new MinHeap();
    keys.forEach((k, i) => heap.push(k, i));
    const popped: number[] = [];
    while (heap.size > 0) {
      const value = heap.pop();
      expect(keys[value]).toBe(heap.lastKey);
      popped.push(heap.lastKey);
    }
    expect(popped).toEqual([...keys].sort((a, b) => a - b));
  });

  it('starts empty again after clear', () => {
    const heap = new MinHeap();
    heap.push(1, 1);
    heap.clear();
    expect(heap.size).toBe(0);
  });
});
