import GeometryFactory from 'jsts/org/locationtech/jts/geom/GeometryFactory.js';
import GeoJSONReader from 'jsts/org/locationtech/jts/io/GeoJSONReader.js';
import DistanceOp from 'jsts/org/locationtech/jts/operation/distance/DistanceOp.js';
import { describe, expect, it } from 'vitest';
import type { MultiPolygonRings, Ring } from '../../../src/core/geometry/types.ts';
import { Random } from '../../../src/core/random.ts';
import { applyFoldGap, GAP_LEFT_OUT } from '../../../src/core/training/foldGap.ts';
import { foldReport } from '../../../src/core/training/foldReport.ts';
import { assignFolds, HELD_OUT, type FoldPatch } from '../../../src/core/training/folds.ts';

// The gap between folds: a patch nearer than the gap to a patch of another fold is left
// out (or reported). Distances between outlines by JSTS 2.12.1 (npm) DistanceOp, all
// pairs; the touching pair across a block edge worked by hand.

const square = (x: number, y: number, s: number): MultiPolygonRings => [[[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]]];
const reader = new GeoJSONReader(new GeometryFactory());
const jsts = (rings: MultiPolygonRings) => reader.read({ type: 'MultiPolygon', coordinates: rings });
const jstsDistance = (a: MultiPolygonRings, b: MultiPolygonRings) => DistanceOp.distance(jsts(a), jsts(b));

describe('the gap between folds', () => {
  // Blocks of 10 m: A's centre (9, 5) is in block 0, B's (11, 5) in block 1, and they touch at x = 10.
  const touching: FoldPatch[] = [
    { id: 'A', cls: 'ABFI', rings: square(8, 4, 2) },
    { id: 'B', cls: 'ABFI', rings: square(10, 4, 2) },
    { id: 'C', cls: 'ABFI', rings: square(40, 4, 2) },
  ];
  const dealt = assignFolds(touching, { k: 2, blockSize: 10, seed: 1 });

  it('finds the touching pair across a block edge: a train-test distance of 0 without a gap', () => {
    expect(dealt.fold[0]).not.toBe(dealt.fold[1]);
    expect(Math.min(...foldReport(touching, dealt).folds.map((f) => f.minTrainDistance ?? Infinity))).toBe(0);
  });

  it('leaves both out with a gap, and says how many per fold', () => {
    const { assignment, gap } = applyFoldGap(touching, dealt, 1);
    expect([...assignment.fold.subarray(0, 2)]).toEqual([GAP_LEFT_OUT, GAP_LEFT_OUT]);
    expect(assignment.fold[2]).toBe(dealt.fold[2]);
    expect([...gap.within]).toEqual([1, 1, 0]);
    expect(gap.perFold.reduce((a, b) => a + b, 0)).toBe(2);
    const report = foldReport(touching, assignment, gap);
    expect(report.folds.map((f) => f.withinGap).sort()).toEqual([1, 1]);
    expect(report.folds.reduce((n, f) => n + f.patches, 0)).toBe(1);
    expect(report.gap).toEqual({ distance: 1, action: 'leave-out', within: 2 });
    expect(assignment.messages).toContain('2 patch(es) lie within 1 m of a patch of another fold and are left out of every fold');
  });

  it('only reports them when asked, the folds unchanged', () => {
    const { assignment, gap } = applyFoldGap(touching, dealt, 1, 'report');
    expect(assignment).toBe(dealt);
    const report = foldReport(touching, assignment, gap);
    expect(report.folds.map((f) => f.withinGap).sort()).toEqual([1, 1]);
    expect(Math.min(...report.folds.map((f) => f.minTrainDistance ?? Infinity))).toBe(0);
  });

  it('counts the held-out set as a fold of its own, and a gap of 0 changes nothing', () => {
    const heldOut = square(9.5, 0, 10); // holds B's centre
    const withTest = assignFolds(touching, { k: 2, blockSize: 10, seed: 1, heldOut });
    expect(withTest.fold[1]).toBe(HELD_OUT);
    const { gap } = applyFoldGap(touching, withTest, 0.5, 'report');
    expect(gap.heldOut).toBe(1);
    expect(applyFoldGap(touching, dealt, 0).assignment).toBe(dealt);
    expect(() => applyFoldGap(touching, dealt, -1)).toThrow(/gap between folds must be a distance of 0 m or more, got -1/);
  });

  it('keeps at least the gap between folds, and leaves out only patches that had to go (JSTS, all pairs)', () => {
    const random = new Random(3);
    const crowns: FoldPatch[] = Array.from({ length: 400 }, (_, i) => {
      const cx = random.uniform(0, 300), cy = random.uniform(0, 300), r = random.uniform(0.5, 3);
      const ring: Ring = Array.from({ length: 9 }, (_, k) => [cx + r * Math.cos((2 * Math.PI * k) / 9), cy + r * Math.sin((2 * Math.PI * k) / 9)] as [number, number]);
      ring.push(ring[0]);
      return { id: `P${i}`, cls: i % 3 ? 'ABFI' : 'SAIN', rings: [[ring]] };
    });
    const before = assignFolds(crowns, { k: 5, blockSize: 30, seed: 2 });
    const gapM = 2;
    const { assignment } = applyFoldGap(crowns, before, gapM);
    const kept = crowns.map((_, i) => i).filter((i) => assignment.fold[i] >= 0);
    const left = crowns.map((_, i) => i).filter((i) => assignment.fold[i] === GAP_LEFT_OUT);
    expect(left.length).toBeGreaterThan(0);
    for (const i of kept) for (const j of kept) {
      if (j > i && assignment.fold[i] !== assignment.fold[j]) expect(jstsDistance(crowns[i].rings, crowns[j].rings)).toBeGreaterThanOrEqual(gapM);
    }
    for (const i of left) {
      const near = crowns.some((c, j) => j !== i && before.fold[j] !== before.fold[i] && jstsDistance(crowns[i].rings, c.rings) < gapM);
      expect(near, `patch ${crowns[i].id} was left out without a neighbour of another fold within the gap`).toBe(true);
    }
    for (const f of foldReport(crowns, assignment).folds) if (f.minTrainDistance !== null) expect(f.minTrainDistance).toBeGreaterThanOrEqual(gapM);
  });
});
