import GeometryFactory from 'jsts/org/locationtech/jts/geom/GeometryFactory.js';
import GeoJSONReader from 'jsts/org/locationtech/jts/io/GeoJSONReader.js';
import DistanceOp from 'jsts/org/locationtech/jts/operation/distance/DistanceOp.js';
import { describe, expect, it } from 'vitest';
import type { MultiPolygonRings, Ring } from '../../../src/core/geometry/types.ts';
import { Random } from '../../../src/core/random.ts';
import { foldReport } from '../../../src/core/training/foldReport.ts';
import { anchorOf, assignFolds, HELD_OUT, type FoldPatch } from '../../../src/core/training/folds.ts';

// Folds: whole patches, whole blocks, class shares near the whole, seeded; the reported
// train-test gaps against an all-pairs search with JSTS 2.12.1 (npm) DistanceOp.

const CLASSES = ['ABFI', 'PIEX', 'PISI', 'SAIN', 'BEFA', 'RHPE'];
const SHARES = [0.3, 0.25, 0.2, 0.12, 0.1, 0.03];

function crown(random: Random, cx: number, cy: number, r: number): Ring {
  const k = 8 + random.int(10);
  const ring: Ring = [];
  for (let i = 0; i < k; i++) {
    const a = (2 * Math.PI * i) / k;
    const rr = r * random.uniform(0.8, 1.1);
    ring.push([cx + rr * Math.cos(a), cy + rr * Math.sin(a)]);
  }
  ring.push(ring[0]);
  return ring;
}

/** Crowns scattered over a square site, species drawn by the shares above. */
function site(n: number, side: number, seed = 9): FoldPatch[] {
  const random = new Random(seed);
  return Array.from({ length: n }, (_, i) => {
    const cx = 600000 + random.uniform(0, side), cy = 5100000 + random.uniform(0, side);
    return { id: `P${i}`, cls: CLASSES[random.weighted(SHARES)], rings: [[crown(random, cx, cy, random.uniform(0.8, 4))]], weight: 1 + random.int(20) };
  });
}

describe('assignFolds', () => {
  const patches = site(3000, 2000);
  const assignment = assignFolds(patches, { k: 5, blockSize: 50, seed: 1 });

  it('puts every patch in one fold, the fold of the block holding its centre', () => {
    for (let i = 0; i < patches.length; i++) {
      const f = assignment.fold[i];
      expect(f >= 0 && f < 5).toBe(true);
      const [x, y] = anchorOf(patches[i].rings)!;
      const b = assignment.blocks[assignment.block[i]];
      expect([b.col, b.row]).toEqual([Math.floor(x / 50), Math.floor(y / 50)]);
      expect(f).toBe(b.fold);
    }
  });

  it('never splits a block: all patches with centres in one 50 m square share a fold', () => {
    const foldOfSquare = new Map<string, number>();
    patches.forEach((p, i) => {
      const [x, y] = anchorOf(p.rings)!;
      const square = `${Math.floor(x / 50)},${Math.floor(y / 50)}`;
      const seen = foldOfSquare.get(square);
      if (seen === undefined) foldOfSquare.set(square, assignment.fold[i]);
      else expect(assignment.fold[i], `square ${square}`).toBe(seen);
    });
    expect(foldOfSquare.size).toBe(assignment.blocks.length);
  });

  it('keeps each fold\'s class shares within 0.02 of the whole (weights: pure pixels)', () => {
    // Stated tolerance: 0.02 of the share, for 3000 patches in about 1600 blocks of
    // 50 m over 2 km; a random deal of blocks misses by several times that (below).
    const report = foldReport(patches, assignment);
    expect(report.maxShareDeviation).toBeLessThan(0.02);
    const totals = report.folds.map((f) => Object.values(f.classWeights).reduce((a, b) => a + b, 0));
    const mean = totals.reduce((a, b) => a + b, 0) / 5;
    for (const t of totals) expect(Math.abs(t - mean) / mean).toBeLessThan(0.02);
    // The same blocks dealt at random, for contrast: the check above can fail.
    const random = new Random(1);
    const dealt = { ...assignment, fold: new Int32Array(assignment.fold) };
    const blockFold = assignment.blocks.map(() => random.int(5));
    for (let i = 0; i < patches.length; i++) dealt.fold[i] = blockFold[assignment.block[i]];
    expect(foldReport(patches, dealt).maxShareDeviation).toBeGreaterThan(0.02);
  });

  it('gives the same folds for the same seed and others for another', () => {
    const again = assignFolds(patches, { k: 5, blockSize: 50, seed: 1 });
    expect(Array.from(again.fold)).toEqual(Array.from(assignment.fold));
    const other = assignFolds(patches, { k: 5, blockSize: 50, seed: 2 });
    expect(Array.from(other.fold)).not.toEqual(Array.from(assignment.fold));
  });

  it('spreads patches of no weight (no pure pixels) evenly instead of piling them in one fold', () => {
    const weightless = patches.map((p) => ({ ...p, weight: 0 }));
    const a = assignFolds(weightless, { k: 5, blockSize: 50, seed: 1 });
    const counts = [0, 0, 0, 0, 0];
    for (const f of a.fold) counts[f]++;
    for (const c of counts) expect(Math.abs(c - 600)).toBeLessThan(30);
  });

  it('warns when blocks or a class are too few for the folds', () => {
    const few = assignFolds(site(40, 90), { k: 5, blockSize: 50 });
    expect(few.messages).toContain('only 4 block(s) of 50 m hold patches, fewer than the 5 folds: use smaller blocks');
    expect(() => assignFolds(patches, { k: 1 })).toThrow(/2 or more/);
    expect(() => assignFolds(patches, { blockSize: 0 })).toThrow(/positive distance/);
  });
});

describe('held-out region', () => {
  const patches = site(600, 600, 4);
  const square = (x0: number, y0: number, s: number): MultiPolygonRings =>
    [[[[x0, y0], [x0 + s, y0], [x0 + s, y0 + s], [x0, y0 + s], [x0, y0]]]];

  it('holds out the patches whose centre lies in the region, and reports their gap to training', () => {
    const region = square(600200, 5100200, 150);
    const a = assignFolds(patches, { heldOut: region, seed: 3 });
    patches.forEach((p, i) => {
      const [x, y] = anchorOf(p.rings)!;
      const inside = x > 600200 && x < 600350 && y > 5100200 && y < 5100350;
      expect(a.fold[i] === HELD_OUT).toBe(inside);
    });
    const report = foldReport(patches, a);
    expect(report.heldOut!.patches).toBeGreaterThan(20);
    expect(report.heldOut!.minTrainDistance).toBeGreaterThanOrEqual(0);
    expect(a.messages.filter((m) => m.includes('held-out'))).toEqual([]);
  });

  it('says so when the region holds no patch, and folds the rest', () => {
    const a = assignFolds(patches, { heldOut: square(700000, 5200000, 10) });
    expect(a.messages).toContain('the held-out region holds no patch centre: there is no independent test set');
    expect(Array.from(a.fold).every((f) => f >= 0)).toBe(true);
  });
});

describe('smallest train-test distance', () => {
  const reader = new GeoJSONReader(new GeometryFactory());
  const patches = site(250, 400, 6);

  it('matches an all-pairs JSTS distance search, fold by fold', () => {
    const a = assignFolds(patches, { blockSize: 40, seed: 5, heldOut: [[[[600000, 5100000], [600100, 5100000], [600100, 5100100], [600000, 5100100], [600000, 5100000]]]] });
    const report = foldReport(patches, a);
    const shapes = patches.map((p) => reader.read({ type: 'MultiPolygon', coordinates: p.rings }));
    const sets = [...report.folds.map((f) => f.fold as number), HELD_OUT];
    for (const f of sets) {
      let best = Infinity;
      for (let i = 0; i < patches.length; i++) {
        if (a.fold[i] !== f) continue;
        for (let j = 0; j < patches.length; j++) {
          if (a.fold[j] < 0 || a.fold[j] === f) continue;
          best = Math.min(best, DistanceOp.distance(shapes[i], shapes[j]));
        }
      }
      const summary = f === HELD_OUT ? report.heldOut! : report.folds[f];
      expect(summary.minTrainDistance!, `fold ${f}`).toBeCloseTo(best, 9);
    }
  });
});
