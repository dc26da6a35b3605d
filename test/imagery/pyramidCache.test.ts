import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';
import { cachedPyramid, needsPyramid } from '../../src/imagery/pyramidCache.ts';
import { MemoryTileStore } from '../../src/imagery/tileStore.ts';
import { openRasterFile } from './nodeRaster.ts';

// A striped file without overviews, read once into a tiled pyramid: the same values at
// full resolution, each coarser pixel the mean of the 2 x 2 below it (GDAL's AVERAGE
// overview rule, common practice), and a second open served from the store alone.

const dir = mkdtempSync(join(tmpdir(), 'fellfield-pyramid-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const W = 600, H = 410;

function band(k: number) {
  const v = new Uint16Array(W * H);
  for (let i = 0; i < v.length; i++) v[i] = ((i % W) * (k + 2) + Math.floor(i / W) * 7 + ((i * 31) % 13)) % 2000;
  return v;
}

describe('pyramid cache', () => {
  const bands = [band(0), band(1)];
  const path = join(dir, 'striped.tif');
  writeFileSync(path, writeGeoTiff({
    width: W, height: H, sampleType: 'uint16', bands, epsg: 32633, origin: [500000, 5000000], pixelSize: [1, 1],
    compression: 'lzw', stripped: true, overviewFactors: [],
  }));

  it('builds once, with progress, and reads back the full resolution exactly', async () => {
    const source = await openRasterFile(path);
    expect(needsPyramid(source.summary)).toBe(true);
    const store = new MemoryTileStore();
    const progress: number[] = [];
    const pyramid = await cachedPyramid(source, store, { onProgress: (p) => progress.push(p.fraction ?? 0) });
    expect(progress.at(-1)).toBe(1);
    expect(pyramid.summary.tiled).toBe(true);
    expect(pyramid.summary.levels.map((l) => [l.width, l.height])).toEqual([[600, 410], [300, 205], [150, 103]]);
    const box = { x0: 240, y0: 250, x1: 600, y1: 410 };
    const [a] = await pyramid.readWindow(0, box, [1]);
    const [b] = await source.readWindow(0, box, [1]);
    expect(a).toEqual(b);

    // Level 1 pixel (c, r) is the rounded mean of level 0's (2c..2c+1, 2r..2r+1).
    const [coarse] = await pyramid.readWindow(1, { x0: 0, y0: 0, x1: 300, y1: 205 }, [0]);
    for (const [c, r] of [[0, 0], [127, 64], [128, 128], [299, 204], [150, 100]]) {
      const cells = [[0, 0], [1, 0], [0, 1], [1, 1]].map(([dx, dy]) => [2 * c + dx, 2 * r + dy]).filter(([x, y]) => x < W && y < H);
      const mean = cells.reduce((s, [x, y]) => s + bands[0][y * W + x], 0) / cells.length;
      expect(coarse[r * 300 + c]).toBe(Math.round(mean));
    }

    // A second open reads the store only: nothing new is written.
    const before = store.tiles.size;
    let built = false;
    const again = await cachedPyramid(await openRasterFile(path), store, { onProgress: () => (built = true) });
    expect(built).toBe(false);
    expect(store.tiles.size).toBe(before);
    expect((await again.pixelValues(599, 409))).toEqual([bands[0][409 * W + 599], bands[1][409 * W + 599]]);
  });

  it('names the file when a cached tile has gone', async () => {
    const store = new MemoryTileStore();
    const pyramid = await cachedPyramid(await openRasterFile(path), store);
    store.tiles.delete([...store.tiles.keys()][0]);
    await expect(pyramid.readWindow(0, { x0: 0, y0: 0, x1: 4, y1: 4 }, [0])).rejects.toThrow('striped.tif: a tile of its pyramid cache is missing (stored data may have been cleared by the browser)');
  });
});
