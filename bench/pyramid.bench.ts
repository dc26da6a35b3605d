// imagery.pyramid-disk: the pyramid cache of a striped file without overviews (seeded,
// 2048 x 2048 uint16, or 4096 x 4096 with --size large), built into the tile store on
// disk through the desktop shell's own file handlers, beside the same build into memory
// (the floor: reading, cutting and averaging with no store cost). A second line reads
// every full-resolution tile back from a new store over the same folder (a later
// session), beside reading them from memory. Ratios near 1 mean the disk costs little.
import { mkdtempSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { openSync, readSync, closeSync } from 'node:fs';
import { createAppFilesHandlers } from '../electron/app-files.ts';
import { inspectTiff } from '../src/core/tiff/inspectTiff.ts';
import { writeGeoTiff } from '../src/core/tiff/writeGeoTiff.ts';
import { DiskTileStore } from '../src/imagery/diskTileStore.ts';
import { InlinePool } from '../src/imagery/inlinePool.ts';
import { cachedPyramid } from '../src/imagery/pyramidCache.ts';
import { Raster } from '../src/imagery/Raster.ts';
import { MemoryTileStore, type TileStore } from '../src/imagery/tileStore.ts';
import type { AppFiles } from '../src/platform/types.ts';
import { result, time, type Benchmark } from './harness.ts';
import { seededBand } from './imagery/scene.ts';

function desktopFiles(folder: string): AppFiles {
  const h = createAppFilesHandlers(folder);
  return {
    where: 'bench',
    write: async (name, data) => void (await h.appFileWrite({ name, data })),
    read: (name, range) => h.appFileRead({ name, ...range }),
    list: () => h.appFileList({}),
    remove: async (name) => void (await h.appFileRemove({ name })),
  };
}

async function openRaster(path: string): Promise<Raster> {
  const size = statSync(path).size;
  const read = (offset: number, length: number) => {
    const fd = openSync(path, 'r');
    try {
      const bytes = new Uint8Array(Math.min(length, size - offset));
      readSync(fd, bytes, 0, bytes.length, offset);
      return bytes;
    } finally {
      closeSync(fd);
    }
  };
  const summary = await inspectTiff(async (o, l) => read(o, l), size, basename(path));
  return Raster.fromSummary({ readRange: async (_f, o, l) => read(o, l) }, new InlinePool(), { id: path, name: basename(path), size }, summary);
}

async function readLevel0(pyramid: Raster): Promise<number> {
  const level = pyramid.summary.levels[0];
  let bytes = 0;
  for (let band = 0; band < pyramid.summary.bands; band++) {
    for (let by = 0; by < level.blocksDown; by++) {
      const box = { x0: 0, y0: by * 256, x1: level.blocksAcross * 256, y1: (by + 1) * 256 };
      for (const block of await pyramid.blocksCovering(0, band, box)) bytes += block.bytes.byteLength;
    }
  }
  return bytes;
}

export const benchmarks: Benchmark[] = [
  {
    name: 'imagery.pyramid-disk',
    async run(size) {
      const side = size === 'large' ? 4096 : 2048;
      const work = mkdtempSync(join(tmpdir(), 'fellfield-bench-pyramid-'));
      try {
        const path = join(work, 'striped.tif');
        writeFileSync(path, writeGeoTiff({
          width: side, height: side, sampleType: 'uint16', bands: [seededBand(side, side, 5)], epsg: 32633,
          origin: [500000, 5000000], pixelSize: [0.5, 0.5], compression: 'lzw', stripped: true, overviewFactors: [],
        }));
        let run = 0;
        const build = async (store: () => TileStore) => cachedPyramid(await openRaster(path), store());
        const memory = new MemoryTileStore();
        const floor = await time(() => build(() => new MemoryTileStore()));
        const ours = await time(() => build(() => new DiskTileStore(desktopFiles(join(work, `run-${run++}`)))));
        const folder = join(work, `run-${run - 1}`);
        const packs = readdirSync(folder).filter((f) => f.endsWith('.pack')).length;
        const tiles = (await build(() => memory)).summary.levels.reduce((n, l) => n + l.offsets.length, 0);
        const fromMemory = await cachedPyramid(await openRaster(path), memory);
        const readFloor = await time(() => readLevel0(fromMemory));
        const readOurs = await time(async () => readLevel0(await cachedPyramid(await openRaster(path), new DiskTileStore(desktopFiles(folder), { memoryBytes: 0 }))));
        return [
          result('imagery.pyramid-disk', side * side, ours, 'the same build into memory (floor)', floor, { tiles, packs, step: 'build' }),
          result('imagery.pyramid-disk', side * side, readOurs, 'the same tiles read from memory (floor)', readFloor, { step: 'read full resolution, new session' }),
        ];
      } finally {
        rmSync(work, { recursive: true, force: true });
      }
    },
  },
];
