import { mkdtempSync, readdirSync, rmSync, statSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { createAppFilesHandlers } from '../../electron/app-files.ts';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';
import { DiskTileStore, groupId } from '../../src/imagery/diskTileStore.ts';
import { cachedPyramid, needsPyramid } from '../../src/imagery/pyramidCache.ts';
import type { AppFiles } from '../../src/platform/types.ts';
import { openRasterFile } from './nodeRaster.ts';

// Pyramid tiles on disk among the app's own files, written and read through the desktop
// shell's real handlers (electron/app-files.ts) in a temporary folder. A striped file
// without overviews is read once into the pyramid, and a second session (a new store
// over the same folder) reads it back without building: the same values as the file at
// full resolution. FNV-1a's 32-bit offset basis and prime (0x811c9dc5, 0x01000193) are
// those published by Fowler, Noll and Vo (IETF draft-eastlake-fnv, section 2.2); the
// check value of FNV-1a 32 over "a" is 0xe40c292c (same draft, common test vector).

const dir = mkdtempSync(join(tmpdir(), 'fellfield-disktiles-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const W = 600, H = 410;

/** The app's files of the desktop shell over a folder, called as the bridge calls them. */
function desktopFiles(folder: string): AppFiles {
  const h = createAppFilesHandlers(folder);
  return {
    where: "the app's data folder",
    write: async (name, data) => void (await h.appFileWrite({ name, data })),
    read: (name, range) => h.appFileRead({ name, ...range }),
    list: () => h.appFileList({}),
    remove: async (name) => void (await h.appFileRemove({ name })),
  };
}

function striped(path: string, seed: number): Uint16Array[] {
  const bands = [0, 1].map((k) => {
    const v = new Uint16Array(W * H);
    for (let i = 0; i < v.length; i++) v[i] = ((i % W) * (k + 2 + seed) + Math.floor(i / W) * 7 + ((i * 31) % 13)) % 2000;
    return v;
  });
  writeFileSync(path, writeGeoTiff({
    width: W, height: H, sampleType: 'uint16', bands, epsg: 32633, origin: [500000, 5000000], pixelSize: [1, 1],
    compression: 'lzw', stripped: true, overviewFactors: [],
  }));
  return bands;
}

const packsIn = (folder: string) => readdirSync(folder).filter((f) => f.endsWith('.pack'));

describe('the pyramid tiles on disk', () => {
  it('keeps a striped file pyramid in packs and reads it back in a later session without building', async () => {
    const folder = join(dir, 'a');
    const path = join(dir, 'striped.tif');
    const bands = striped(path, 0);
    const source = await openRasterFile(path);
    expect(needsPyramid(source.summary)).toBe(true);
    let fractions: number[] = [];
    await cachedPyramid(source, new DiskTileStore(desktopFiles(folder)), { onProgress: (p) => fractions.push(p.fraction ?? 0) });
    expect(fractions.at(-1)).toBe(1);
    // 2 bands x (3 x 2 + 2 x 1 + 1) tiles in one pack per row put, and the completion mark
    const packs = packsIn(folder);
    expect(packs.length).toBe(2 * (2 + 1 + 1) + 1);
    expect(readdirSync(folder).filter((f) => f.endsWith('.used'))).toHaveLength(1);

    fractions = [];
    const again = await cachedPyramid(await openRasterFile(path), new DiskTileStore(desktopFiles(folder)), { onProgress: (p) => fractions.push(p.fraction ?? 0) });
    expect(fractions).toEqual([]); // nothing built
    expect(packsIn(folder)).toEqual(packs); // nothing written
    const box = { x0: 240, y0: 250, x1: 600, y1: 410 };
    const [fromDisk] = await again.readWindow(0, box, [1]);
    const [fromFile] = await source.readWindow(0, box, [1]);
    expect(fromDisk).toEqual(fromFile);
    expect(await again.pixelValues(599, 409)).toEqual([bands[0][409 * W + 599], bands[1][409 * W + 599]]);
    const [coarse] = await again.readWindow(1, { x0: 0, y0: 0, x1: 300, y1: 205 }, [0]);
    const mean = (bands[0][0] + bands[0][1] + bands[0][W] + bands[0][W + 1]) / 4;
    expect(coarse[0]).toBe(Math.round(mean)); // the 2 x 2 mean (GDAL's AVERAGE overview rule, common practice)
  });

  it('takes the last pack of a tile, and finds nothing where a pack was cut short', async () => {
    const folder = join(dir, 'b');
    const store = new DiskTileStore(desktopFiles(folder), { memoryBytes: 0 });
    await store.put([['p/0', new Uint8Array([1, 2, 3]).buffer], ['p/1', new Uint8Array([4]).buffer]]);
    await store.put([['p/1', new Uint8Array([5, 6]).buffer]]);
    const later = new DiskTileStore(desktopFiles(folder), { memoryBytes: 0 });
    expect([...new Uint8Array((await later.get('p/0'))!)]).toEqual([1, 2, 3]);
    expect([...new Uint8Array((await later.get('p/1'))!)]).toEqual([5, 6]);
    expect(await later.get('p/2')).toBeUndefined();
    expect(await later.get('q/0')).toBeUndefined();
    const first = join(folder, `tiles-${groupId('p')}-0.pack`);
    truncateSync(first, statSync(first).size - 2);
    expect(await new DiskTileStore(desktopFiles(folder), { memoryBytes: 0 }).get('p/0')).toBeUndefined();
  });

  it('removes the least recently used pyramids, never one in use, to stay under its cap', async () => {
    const folder = join(dir, 'c');
    const files = desktopFiles(folder);
    const tile = () => new Uint8Array(1000).buffer;
    // three pyramids of 2 x 1000 bytes (and headers) used one after another in earlier sessions
    for (const name of ['old', 'middle', 'recent']) {
      const s = new DiskTileStore(files, { capBytes: 10_000 });
      await s.put([[`${name}/0`, tile()]]);
      await s.put([[`${name}/1`, tile()]]);
      await new Promise((r) => setTimeout(r, 20)); // distinct last-use times
    }
    const store = new DiskTileStore(files, { capBytes: 6000 }); // room for three of the four
    expect((await store.get('old/0'))?.byteLength).toBe(1000); // "old" is in use in this session now
    await store.put([['new/0', tile()]]);
    const left = new Set(packsIn(folder).map((f) => f.split('-')[1]));
    expect(left).toEqual(new Set([groupId('old'), groupId('recent'), groupId('new')]));
    expect(readdirSync(folder).some((f) => f.startsWith(`tiles-${groupId('middle')}`))).toBe(false);
  });

  it('names groups by 64 bits of FNV-1a', () => {
    expect(groupId('a').slice(0, 8)).toBe('e40c292c');
    expect(groupId('a')).toMatch(/^[0-9a-f]{16}$/);
    expect(groupId('scene.tif:100:10x10x1:uint16')).not.toBe(groupId('scene.tif:100:10x10x1:uint8'));
  });
});
