import { openSync, readSync, closeSync, statSync } from 'node:fs';
import { basename } from 'node:path';
import { inspectTiff } from '../../src/core/tiff/inspectTiff.ts';
import { Raster } from '../../src/imagery/Raster.ts';
import { InlinePool } from '../../src/imagery/inlinePool.ts';
import type { FileRef } from '../../src/platform/types.ts';

// A Raster over a file on disk, read by byte ranges with node:fs, its jobs run in this
// thread by the worker's own code: the app's reading path, minus the Web Worker.

function readRange(path: string, offset: number, length: number): Uint8Array {
  const fd = openSync(path, 'r');
  try {
    const bytes = new Uint8Array(length);
    const n = readSync(fd, bytes, 0, length, offset);
    return bytes.subarray(0, n).slice();
  } finally {
    closeSync(fd);
  }
}

export async function openRasterFile(path: string, runner = new InlinePool()): Promise<Raster> {
  const size = statSync(path).size;
  const summary = await inspectTiff(async (offset, length) => readRange(path, offset, length), size, basename(path));
  const file: FileRef = { id: path, name: basename(path), size };
  return Raster.fromSummary({ readRange: async (_f, offset, length) => readRange(path, offset, Math.min(length, size - offset)) }, runner, file, summary);
}
