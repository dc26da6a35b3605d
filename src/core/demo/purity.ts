import { PAN_PER_MS } from './bands.ts';
import type { SceneGrid } from './scene.ts';

// Pure multispectral pixels. Each multispectral value is the mean of the 4 x 4
// panchromatic-resolution sub-pixels it covers, so a multispectral pixel whose sixteen
// sub-pixels all belong to one crown carries that crown's spectrum and nothing else.

export interface PurityCounts {
  /** Pure multispectral pixels per crown, by crown index. */
  pureByCrown: Uint32Array;
  /** Multispectral pixels touched (at least one sub-pixel) per crown, by crown index. */
  touchedByCrown: Uint32Array;
  pure: number;
  touched: number;
}

export function purityCounts(grid: SceneGrid, owner: Int32Array, crownCount: number): PurityCounts {
  const pureByCrown = new Uint32Array(crownCount);
  const touchedByCrown = new Uint32Array(crownCount);
  let pure = 0;
  let touched = 0;
  // The distinct owners among one pixel's sixteen sub-pixels (at most 16).
  const distinct = new Int32Array(PAN_PER_MS * PAN_PER_MS);
  for (let my = 0; my < grid.msSize; my++) {
    for (let mx = 0; mx < grid.msSize; mx++) {
      let count = 0;
      for (let sy = 0; sy < PAN_PER_MS; sy++) {
        const row = (my * PAN_PER_MS + sy) * grid.size + mx * PAN_PER_MS;
        for (let sx = 0; sx < PAN_PER_MS; sx++) {
          const o = owner[row + sx];
          let known = false;
          for (let k = 0; k < count; k++) if (distinct[k] === o) { known = true; break; }
          if (!known) distinct[count++] = o;
        }
      }
      let anyCrown = false;
      for (let k = 0; k < count; k++) {
        if (distinct[k] > 0) {
          touchedByCrown[distinct[k] - 1]++;
          anyCrown = true;
        }
      }
      if (anyCrown) touched++;
      if (count === 1 && distinct[0] > 0) {
        pureByCrown[distinct[0] - 1]++;
        pure++;
      }
    }
  }
  return { pureByCrown, touchedByCrown, pure, touched };
}
