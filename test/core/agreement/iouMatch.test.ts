import { describe, expect, it } from 'vitest';
import { allPairsCandidates, candidatePairs, matchByIou, type MatchedPair, type Outline } from '../../../src/core/agreement/iouMatch.ts';
import { seeded } from '../../../bench/harness.ts';

const rect = (id: string, x0: number, y0: number, x1: number, y1: number): Outline => ({
  id,
  rings: [[[[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]]]],
});

/** Best pair first: the shortcut the optimal assignment must beat. */
function greedy(edges: MatchedPair[]): MatchedPair[] {
  const takenFirst = new Set<number>();
  const takenSecond = new Set<number>();
  const chosen: MatchedPair[] = [];
  for (const e of [...edges].sort((a, b) => b.iou - a.iou)) {
    if (takenFirst.has(e.first) || takenSecond.has(e.second)) continue;
    takenFirst.add(e.first);
    takenSecond.add(e.second);
    chosen.push(e);
  }
  return chosen;
}

describe('matchByIou', () => {
  // A1 overlaps B1 best (IoU 8/12) and B2 less (6/14); A2 overlaps only B1 (6/14).
  const first = [rect('A1', 2, 0, 12, 10), rect('A2', -4, 0, 6, 10)];
  const second = [rect('B1', 0, 0, 10, 10), rect('B2', 6, 0, 16, 10)];

  it('finds the pairs and IoUs of the constructed case', () => {
    const { edges } = candidatePairs(first, second, { minIou: 0.4 });
    const iou = (a: number, b: number) => edges.find((e) => e.first === a && e.second === b)?.iou;
    expect(iou(0, 0)).toBeCloseTo(8 / 12, 12);
    expect(iou(0, 1)).toBeCloseTo(6 / 14, 12);
    expect(iou(1, 0)).toBeCloseTo(6 / 14, 12);
    expect(iou(1, 1)).toBeUndefined();
  });

  it('beats greedy matching: two pairs instead of one, more total IoU', () => {
    const { edges } = candidatePairs(first, second, { minIou: 0.4 });
    const shortcut = greedy(edges);
    const optimal = matchByIou(first, second, { minIou: 0.4 });
    expect(shortcut).toHaveLength(1);
    expect(optimal.pairs.map((p) => [p.first, p.second])).toEqual([[0, 1], [1, 0]]);
    const total = (pairs: MatchedPair[]) => pairs.reduce((s, p) => s + p.iou, 0);
    expect(total(optimal.pairs)).toBeGreaterThan(total(shortcut));
    expect(optimal.unmatchedFirst).toEqual([]);
    expect(optimal.unmatchedSecond).toEqual([]);
  });

  it('drops pairs below the threshold (default 0.5)', () => {
    const m = matchByIou(first, second);
    expect(m.minIou).toBe(0.5);
    expect(m.pairs.map((p) => [p.first, p.second])).toEqual([[0, 0]]);
    expect(m.unmatchedFirst).toEqual([1]);
    expect(m.unmatchedSecond).toEqual([1]);
  });

  it('refuses a threshold outside (0, 1]', () => {
    expect(() => matchByIou(first, second, { minIou: 0 })).toThrow(/\(0, 1\]/);
    expect(() => matchByIou(first, second, { minIou: 1.5 })).toThrow(/\(0, 1\]/);
  });

  describe('on a generated delineation', () => {
    // A grid of patches and a second delineation of each, jittered, some left out.
    const random = seeded(11);
    const a: Outline[] = [];
    const b: Outline[] = [];
    for (let i = 0; i < 12; i++) {
      for (let j = 0; j < 12; j++) {
        const x = i * 10;
        const y = j * 10;
        a.push(rect(`a${i}-${j}`, x, y, x + 6 + random() * 3, y + 6 + random() * 3));
        if (random() < 0.85) {
          const dx = (random() - 0.5) * 4;
          const dy = (random() - 0.5) * 4;
          b.push(rect(`b${i}-${j}`, x + dx, y + dy, x + dx + 6 + random() * 3, y + dy + 6 + random() * 3));
        }
      }
    }
    const total = (pairs: MatchedPair[]) => pairs.reduce((s, p) => s + p.iou, 0);

    it('gives the same result with the spatial index as with all pairs', () => {
      const indexed = matchByIou(a, b, { minIou: 0.3 });
      const scanned = matchByIou(a, b, { minIou: 0.3, candidatesOf: allPairsCandidates });
      expect(indexed.pairs).toEqual(scanned.pairs);
      expect(indexed.pairs.length).toBeGreaterThan(50);
    });

    it('matches the same total whichever delineation comes first', () => {
      const ab = matchByIou(a, b, { minIou: 0.3 });
      const ba = matchByIou(b, a, { minIou: 0.3 });
      expect(ba.pairs).toHaveLength(ab.pairs.length);
      expect(total(ba.pairs)).toBeCloseTo(total(ab.pairs), 9);
    });

    it('does not change when both delineations are shifted together', () => {
      const shift = (o: Outline): Outline => ({ id: o.id, rings: o.rings.map((p) => p.map((r) => r.map(([x, y]) => [x + 500000, y + 7000000] as [number, number]))) });
      const moved = matchByIou(a.map(shift), b.map(shift), { minIou: 0.3 });
      const here = matchByIou(a, b, { minIou: 0.3 });
      expect(moved.pairs.map((p) => [p.first, p.second])).toEqual(here.pairs.map((p) => [p.first, p.second]));
      expect(total(moved.pairs)).toBeCloseTo(total(here.pairs), 6);
    });

    it('matches each outline at most once, all at or above the threshold', () => {
      const m = matchByIou(a, b, { minIou: 0.3 });
      expect(new Set(m.pairs.map((p) => p.first)).size).toBe(m.pairs.length);
      expect(new Set(m.pairs.map((p) => p.second)).size).toBe(m.pairs.length);
      expect(m.pairs.every((p) => p.iou >= 0.3 && p.iou <= 1)).toBe(true);
      expect(m.pairs.length + m.unmatchedFirst.length).toBe(a.length);
      expect(m.pairs.length + m.unmatchedSecond.length).toBe(b.length);
    });
  });
});
