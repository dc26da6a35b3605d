import Flatbush from 'flatbush';
import { extentOfRings, multiPolygonArea } from '../geometry/measure.ts';
import type { Extent, MultiPolygonRings } from '../geometry/types.ts';
import { maxWeightMatching } from './hungarian.ts';
import { sharedArea } from './sharedArea.ts';

/** One outline of a delineation, in a projected CRS (metres). */
export interface Outline {
  id: string;
  rings: MultiPolygonRings;
}

export interface MatchedPair {
  /** Index into the first delineation. */
  first: number;
  /** Index into the second delineation. */
  second: number;
  iou: number;
  /** Shared area, in the squared units of the coordinates. */
  intersection: number;
}

export interface IouMatching {
  minIou: number;
  pairs: MatchedPair[];
  /** Indices of first-delineation outlines left without a partner. */
  unmatchedFirst: number[];
  unmatchedSecond: number[];
  /** Areas of every outline, in input order. */
  firstAreas: number[];
  secondAreas: number[];
  /** How many pairs reached the threshold (candidates for the assignment). */
  candidates: number;
}

export interface IouMatchOptions {
  /** Smallest IoU a pair may have to be matched; default 0.5. */
  minIou?: number;
  /**
   * Finds the outlines of `second` whose extents meet `extent`; defaults to a
   * flatbush index. The benchmark swaps in a scan of all pairs.
   */
  candidatesOf?: (secondExtents: Extent[]) => (extent: Extent) => number[];
}

/** The default candidate search: a packed R-tree (flatbush) over the second set's extents. */
export function flatbushCandidates(extents: Extent[]): (extent: Extent) => number[] {
  if (extents.length === 0) return () => [];
  const index = new Flatbush(extents.length);
  for (const e of extents) index.add(e[0], e[1], e[2], e[3]);
  index.finish();
  return (e) => index.search(e[0], e[1], e[2], e[3]);
}

/** Candidate search without an index: every extent is tested (the baseline). */
export function allPairsCandidates(extents: Extent[]): (extent: Extent) => number[] {
  return (e) => {
    const hits: number[] = [];
    for (let i = 0; i < extents.length; i++) {
      const o = extents[i];
      if (o[0] <= e[2] && o[2] >= e[0] && o[1] <= e[3] && o[3] >= e[1]) hits.push(i);
    }
    return hits;
  };
}

function overlapOfExtents(a: Extent, b: Extent): number {
  const w = Math.min(a[2], b[2]) - Math.max(a[0], b[0]);
  const h = Math.min(a[3], b[3]) - Math.max(a[1], b[1]);
  return w > 0 && h > 0 ? w * h : 0;
}

export interface CandidatePairs {
  /** Every pair at or above the threshold, with its IoU and shared area. */
  edges: MatchedPair[];
  firstAreas: number[];
  secondAreas: number[];
}

/** Finds every pair of outlines whose IoU reaches `minIou`, clipping only where bounds allow it. */
export function candidatePairs(first: readonly Outline[], second: readonly Outline[], options: IouMatchOptions = {}): CandidatePairs {
  const minIou = checkedMinIou(options.minIou);
  const firstAreas = first.map((o) => multiPolygonArea(o.rings));
  const secondAreas = second.map((o) => multiPolygonArea(o.rings));
  const firstExtents = first.map((o) => extentOfRings(o.rings));
  const secondExtents = second.map((o) => extentOfRings(o.rings));
  const search = (options.candidatesOf ?? flatbushCandidates)(secondExtents);

  const edges: MatchedPair[] = [];
  for (let i = 0; i < first.length; i++) {
    const areaA = firstAreas[i];
    if (!(areaA > 0)) continue;
    for (const j of search(firstExtents[i])) {
      const areaB = secondAreas[j];
      if (!(areaB > 0)) continue;
      // Cheap upper bounds on IoU (area ratio, extent overlap) before any clipping.
      if (Math.min(areaA, areaB) / Math.max(areaA, areaB) < minIou) continue;
      const bound = Math.min(overlapOfExtents(firstExtents[i], secondExtents[j]), areaA, areaB);
      if (bound / (areaA + areaB - bound) < minIou) continue;
      const shared = sharedArea(first[i].rings, second[j].rings);
      const iou = shared / (areaA + areaB - shared);
      if (iou >= minIou) edges.push({ first: i, second: j, iou, intersection: shared });
    }
  }
  return { edges, firstAreas, secondAreas };
}

function checkedMinIou(minIou = 0.5): number {
  if (!(minIou > 0 && minIou <= 1)) throw new RangeError(`minimum IoU must be in (0, 1], got ${minIou}`);
  return minIou;
}

/**
 * Matches two delineations of the same area one-to-one by IoU: pairs at or above
 * `minIou` are candidates, and the assignment of largest total IoU among them is
 * chosen (Kuhn–Munkres over the sparse candidates). A greedy "best pair first"
 * choice can lose matches; the optimal assignment cannot.
 */
export function matchByIou(first: readonly Outline[], second: readonly Outline[], options: IouMatchOptions = {}): IouMatching {
  const minIou = checkedMinIou(options.minIou);
  const { edges, firstAreas, secondAreas } = candidatePairs(first, second, options);
  const weighted = edges.map((e) => ({ row: e.first, column: e.second, weight: e.iou, pair: e }));
  const pairs = maxWeightMatching(first.length, second.length, weighted).map((e) => e.pair);
  const matchedFirst = new Set(pairs.map((p) => p.first));
  const matchedSecond = new Set(pairs.map((p) => p.second));
  return {
    minIou,
    pairs,
    unmatchedFirst: first.map((_, i) => i).filter((i) => !matchedFirst.has(i)),
    unmatchedSecond: second.map((_, j) => j).filter((j) => !matchedSecond.has(j)),
    firstAreas,
    secondAreas,
    candidates: edges.length,
  };
}
