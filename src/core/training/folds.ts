import type { MultiPolygonRings } from '../geometry/types.ts';
import { Random } from '../random.ts';

// Spatial k-fold assignment. Pixels of one patch are never split: each patch goes
// whole to the square block holding the centre of its bounding box, and blocks go
// whole to folds, so near neighbours (which share light, soil and interpreter) land in
// the same fold (spatial blocking: Roberts et al. 2017, "Cross-validation strategies
// for data with temporal, spatial, hierarchical, or phylogenetic structure", Ecography
// 40, 913-929). Blocks are dealt largest first, each to the fold whose class counts it
// brings nearest the fold's share of every class (a greedy stratification); a seeded
// shuffle breaks ties, so the same seed gives the same folds. Patches whose centre lies
// in a held-out region form an independent test set and take part in no fold.

export interface FoldPatch {
  id: string | number;
  /** Training class (under a scheme). */
  cls: string;
  rings: MultiPolygonRings;
  /** What stratification balances, e.g. the patch's pure pixels. Default 1 (patches). */
  weight?: number;
}

export interface FoldOptions {
  /** Number of folds; default 5. */
  k?: number;
  /** Side of the square blocks in CRS units (metres); default 50. */
  blockSize?: number;
  /** Default 1. */
  seed?: number;
  /** A region whose patches are held out as an independent test set. */
  heldOut?: MultiPolygonRings | null;
}

export const HELD_OUT = -1;
/** A patch with no usable outline goes nowhere (and is reported). */
export const UNPLACED = -2;

export interface FoldBlock {
  /** Block column and row: floor(x / size), floor(y / size) in the CRS, so blocks stay put as patches are added. */
  col: number;
  row: number;
  fold: number;
  patches: number;
}

export interface FoldAssignment {
  k: number;
  blockSize: number;
  seed: number;
  /** Fold of each patch (0..k-1), HELD_OUT, or UNPLACED; input order. */
  fold: Int32Array;
  /** Index into `blocks` of each patch, or -1 (held out, unplaced). */
  block: Int32Array;
  blocks: FoldBlock[];
  messages: string[];
}

/** Centre of a patch's bounding box, or null when it has no finite position. */
export function anchorOf(rings: MultiPolygonRings): [number, number] | null {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const part of rings) for (const ring of part) for (const [x, y] of ring) {
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  return minX <= maxX && minY <= maxY ? [(minX + maxX) / 2, (minY + maxY) / 2] : null;
}

/** Even-odd point in region (all rings of all parts). */
export function pointInRegion(x: number, y: number, region: MultiPolygonRings): boolean {
  let inside = false;
  for (const part of region) for (const ring of part) {
    for (let i = 1; i < ring.length; i++) {
      const a = ring[i - 1], b = ring[i];
      if ((a[1] > y) !== (b[1] > y) && x < a[0] + ((y - a[1]) * (b[0] - a[0])) / (b[1] - a[1])) inside = !inside;
    }
  }
  return inside;
}

/** Why fold options cannot be used, or null. */
export function foldOptionsProblem(options: FoldOptions): string | null {
  const { k = 5, blockSize = 50, seed = 1 } = options;
  if (!Number.isInteger(k) || k < 2) return `the number of folds must be a whole number of 2 or more, got ${k}`;
  if (!(Number.isFinite(blockSize) && blockSize > 0)) return `the block size must be a positive distance, got ${blockSize}`;
  if (!Number.isInteger(seed) || seed < 0) return `the seed must be a whole number of 0 or more, got ${seed}`;
  return null;
}

export function assignFolds(patches: readonly FoldPatch[], options: FoldOptions = {}): FoldAssignment {
  const problem = foldOptionsProblem(options);
  if (problem) throw new RangeError(problem);
  const k = options.k ?? 5;
  const blockSize = options.blockSize ?? 50;
  const seed = options.seed ?? 1;
  const n = patches.length;
  const fold = new Int32Array(n).fill(UNPLACED);
  const block = new Int32Array(n).fill(-1);
  const messages: string[] = [];

  // Class indices and block membership.
  const classIndex = new Map<string, number>();
  for (const p of patches) if (!classIndex.has(p.cls)) classIndex.set(p.cls, classIndex.size);
  const classes = classIndex.size;
  const blockIndex = new Map<string, number>();
  const blocks: FoldBlock[] = [];
  const blockWeights: number[][] = [];
  let heldOutCount = 0;
  patches.forEach((p, i) => {
    const anchor = anchorOf(p.rings);
    if (!anchor) {
      messages.push(`patch ${p.id} has no usable outline and is left out of the folds`);
      return;
    }
    if (options.heldOut && pointInRegion(anchor[0], anchor[1], options.heldOut)) {
      fold[i] = HELD_OUT;
      heldOutCount++;
      return;
    }
    const col = Math.floor(anchor[0] / blockSize), row = Math.floor(anchor[1] / blockSize);
    const key = `${col},${row}`;
    let b = blockIndex.get(key);
    if (b === undefined) {
      b = blocks.length;
      blockIndex.set(key, b);
      blocks.push({ col, row, fold: -1, patches: 0 });
      blockWeights.push(new Array(classes).fill(0));
    }
    block[i] = b;
    blocks[b].patches++;
    blockWeights[b][classIndex.get(p.cls)!] += p.weight ?? 1;
  });
  if (options.heldOut && heldOutCount === 0) {
    messages.push('the held-out region holds no patch centre: there is no independent test set');
  }

  // Targets: each fold's even share of each class.
  const totals = new Array(classes).fill(0);
  for (const w of blockWeights) for (let c = 0; c < classes; c++) totals[c] += w[c];
  const target = totals.map((t) => t / k);
  const foldWeights = Array.from({ length: k }, () => new Array(classes).fill(0));
  const foldTotals = new Array(k).fill(0);
  const foldPatches = new Array(k).fill(0);

  const random = new Random(seed);
  const order = random.shuffle(blocks.map((_, b) => b));
  const blockTotal = blockWeights.map((w) => w.reduce((a, b) => a + b, 0));
  // Largest first; the shuffle decides among equals (Array.prototype.sort is stable).
  order.sort((a, b) => blockTotal[b] - blockTotal[a]);
  const foldOrder = random.shuffle(Array.from({ length: k }, (_, f) => f));
  for (const b of order) {
    const w = blockWeights[b];
    let best = -1, bestCost = Infinity;
    for (const f of foldOrder) {
      // Change in Σ_c (count - target)² / target from adding the block to fold f.
      let cost = 0;
      for (let c = 0; c < classes; c++) {
        if (w[c] === 0 || target[c] === 0) continue;
        cost += (w[c] * (2 * (foldWeights[f][c] - target[c]) + w[c])) / target[c];
      }
      // Ties (blocks of weight 0 tie everywhere) go to the fold with fewer patches, then less weight.
      const tie = Math.abs(cost - bestCost) <= 1e-12;
      if (cost < bestCost - 1e-12 || (tie && (foldPatches[f] < foldPatches[best] || (foldPatches[f] === foldPatches[best] && foldTotals[f] < foldTotals[best])))) {
        best = f;
        bestCost = cost;
      }
    }
    blocks[b].fold = best;
    for (let c = 0; c < classes; c++) foldWeights[best][c] += w[c];
    foldTotals[best] += blockTotal[b];
    foldPatches[best] += blocks[b].patches;
  }
  for (let i = 0; i < n; i++) if (block[i] >= 0) fold[i] = blocks[block[i]].fold;

  // Classes too scattered or too rare to reach every fold.
  const classBlocks = new Array(classes).fill(0);
  for (const w of blockWeights) for (let c = 0; c < classes; c++) if (w[c] > 0) classBlocks[c]++;
  for (const [name, c] of classIndex) {
    if (totals[c] > 0 && classBlocks[c] < k) {
      messages.push(`class ${name} lies in only ${classBlocks[c]} block(s) of ${blockSize} m, fewer than the ${k} folds: some folds test none of it`);
    }
  }
  if (blocks.length < k) messages.push(`only ${blocks.length} block(s) of ${blockSize} m hold patches, fewer than the ${k} folds: use smaller blocks`);
  return { k, blockSize, seed, fold, block, blocks, messages };
}
