import { Random } from '../random.ts';
import { latticeNodes, latticeSide, nodeInRadius, type ShiftLattice } from './shiftLattice.ts';

// Whether the common peak stands out from what the patches' own surfaces give by
// chance: a randomization test (Manly, B. F. J. 2007, Randomization, Bootstrap and
// Monte Carlo Methods in Biology, 3rd ed., Chapman & Hall). Each surrogate moves every
// patch's coarse surface by its own random circular offset, which keeps each surface's
// texture but breaks the one alignment a common shift would give, and takes the
// largest mean over the search disc. The real peak is scored in standard deviations
// of those surrogate maxima above their mean.

export function peakSignificance(
  perCoarse: Float32Array, members: readonly number[], l: ShiftLattice, surrogates: number, seed: number,
): number {
  const nodes = latticeNodes(l);
  const side = latticeSide(l);
  const inDisc: number[] = [];
  for (let k = 0; k < nodes; k++) if (nodeInRadius(l, k)) inDisc.push(k);
  const maxOf = (offsets: Int32Array | null) => {
    let best = -Infinity;
    for (const k of inDisc) {
      const col = k % side;
      const row = Math.floor(k / side);
      let sum = 0;
      let count = 0;
      for (let m = 0; m < members.length; m++) {
        const c = offsets ? (col + offsets[2 * m]) % side : col;
        const r = offsets ? (row + offsets[2 * m + 1]) % side : row;
        const v = perCoarse[members[m] * nodes + r * side + c];
        if (v === v) {
          sum += v;
          count++;
        }
      }
      if (count > 0 && sum / count > best) best = sum / count;
    }
    return best;
  };
  const real = maxOf(null);
  const random = new Random(seed);
  const offsets = new Int32Array(2 * members.length);
  const maxima: number[] = [];
  for (let s = 0; s < surrogates; s++) {
    for (let i = 0; i < offsets.length; i++) offsets[i] = random.int(side);
    maxima.push(maxOf(offsets));
  }
  const finite = maxima.filter(Number.isFinite);
  if (!Number.isFinite(real) || finite.length < 2) return 0;
  const mean = finite.reduce((a, b) => a + b, 0) / finite.length;
  const sd = Math.sqrt(finite.reduce((a, b) => a + (b - mean) ** 2, 0) / (finite.length - 1));
  if (!(sd > 0)) return real > mean ? Infinity : 0;
  return (real - mean) / sd;
}
