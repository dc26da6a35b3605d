import Flatbush from 'flatbush';
import { describe, expect, it } from 'vitest';
import { boxPairs } from '../../../src/core/geometry/boxPairs.ts';
import type { Extent } from '../../../src/core/geometry/types.ts';
import { Random } from '../../../src/core/random.ts';

// The grid's pairs against trying every pair of boxes, and its fallback against the
// search of a Flatbush index (the npm package the session indexes with), on sites the
// grid suits and on sites it gives up on.

/** Every pair i < j of closed boxes that meet, as "i j" keys. */
function allPairs(boxes: Extent[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < boxes.length; i++) {
    for (let j = i + 1; j < boxes.length; j++) {
      const a = boxes[i], b = boxes[j];
      if (a[0] <= b[2] && a[2] >= b[0] && a[1] <= b[3] && a[3] >= b[1]) out.push(`${i} ${j}`);
    }
  }
  return out;
}

function found(boxes: Extent[]): { pairs: string[]; searches: number } {
  const tree = new Flatbush(Math.max(1, boxes.length));
  for (const b of boxes) tree.add(b[0], b[1], b[2], b[3]);
  if (boxes.length === 0) tree.add(0, 0, 0, 0);
  tree.finish();
  let searches = 0;
  const { start, partner } = boxPairs(boxes, (b) => {
    searches++;
    return tree.search(b[0], b[1], b[2], b[3]);
  });
  const pairs: string[] = [];
  for (let i = 0; i < boxes.length; i++) {
    for (let k = start[i]; k < start[i + 1]; k++) {
      expect(partner[k]).toBeGreaterThan(i);
      pairs.push(`${i} ${partner[k]}`);
    }
  }
  return { pairs, searches };
}

function crownBoxes(random: Random, n: number, spacing: number): Extent[] {
  const side = Math.ceil(Math.sqrt(n));
  const boxes: Extent[] = [];
  for (let i = 0; i < n; i++) {
    const r = random.uniform(0.5, 5);
    const x = 600000 + (i % side) * spacing + random.uniform(-2, 2), y = 5100000 + Math.floor(i / side) * spacing + random.uniform(-2, 2);
    boxes.push([x - r, y - r, x + r * random.uniform(0.8, 1.2), y + r * random.uniform(0.8, 1.2)]);
  }
  return boxes;
}

describe('boxPairs', () => {
  it('finds each meeting pair once on crown-like sites, by the grid', () => {
    for (const [seed, spacing] of [[1, 12], [2, 6], [3, 3]]) {
      const boxes = crownBoxes(new Random(seed), 1500, spacing);
      const { pairs, searches } = found(boxes);
      expect(searches).toBe(0);
      expect(pairs.sort()).toEqual(allPairs(boxes).sort());
      expect(pairs.length).toBeGreaterThan(spacing < 12 ? 1000 : 0);
    }
  });

  it('counts boxes that touch at an edge or a corner, and copies of one box', () => {
    const boxes: Extent[] = [[0, 0, 1, 1], [1, 0, 2, 1], [2, 1, 3, 2], [0, 0, 1, 1], [5, 5, 5, 5], [5, 5, 5, 5], [10, 0, 11, 1]];
    const { pairs, searches } = found(boxes);
    expect(searches).toBe(0);
    expect(pairs.sort()).toEqual(allPairs(boxes).sort());
  });

  it('falls back to the index search for very uneven boxes, with the same pairs', () => {
    const random = new Random(4);
    // A few huge boxes over a crown site: too many cells each.
    const huge = crownBoxes(random, 800, 12);
    for (let i = 0; i < 40; i++) huge.push([600000 + i, 5100000 + i, 600300 - i, 5100300 - i]);
    // Many small boxes crowded into one spot far from a few others.
    const crowded: Extent[] = [];
    for (let i = 0; i < 500; i++) {
      const x = random.uniform(0, 20), y = random.uniform(0, 20);
      crowded.push([x, y, x + 0.3, y + 0.3]);
    }
    crowded.push([1e6, 1e6, 1e6 + 1, 1e6 + 1], [-1e6, 0, -1e6 + 1, 1]);
    for (const boxes of [huge, crowded]) {
      const { pairs, searches } = found(boxes);
      expect(searches).toBe(boxes.length);
      expect(pairs.sort()).toEqual(allPairs(boxes).sort());
    }
  });

  it('handles no boxes, one box, and boxes all at one point', () => {
    expect(found([]).pairs).toEqual([]);
    expect(found([[0, 0, 1, 1]]).pairs).toEqual([]);
    const point: Extent[] = [[3, 3, 3, 3], [3, 3, 3, 3], [3, 3, 3, 3]];
    expect(found(point).pairs.sort()).toEqual(allPairs(point).sort());
  });
});
