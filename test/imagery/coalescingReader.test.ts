import { describe, expect, it } from 'vitest';
import { inspectTiff } from '../../src/core/tiff/inspectTiff.ts';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';
import { coalescingReader } from '../../src/imagery/coalescingReader.ts';
import { InlinePool } from '../../src/imagery/inlinePool.ts';
import { Raster, type RangeReader } from '../../src/imagery/Raster.ts';
import type { RgbaTile } from '../../src/imagery/renderJobs.ts';
import type { FileRef } from '../../src/platform/types.ts';

// Reads gathered per turn of the event loop: what each caller gets must be exactly the
// bytes it asked for, whatever was read together, and cancelling one read must not
// cancel its neighbours.

const file: FileRef = { id: 'f', name: 'scene.tif', size: 1 << 20 };
const bytes = Uint8Array.from({ length: file.size }, (_, i) => (i * 31 + (i >> 8)) & 0xff);

/** A reader over `bytes` that records every read it is asked for. */
function countingReader(fail?: Error) {
  const reads: { offset: number; length: number; signal?: AbortSignal }[] = [];
  const reader: RangeReader = {
    async readRange(_file, offset, length, signal) {
      reads.push({ offset, length, signal });
      await new Promise((resolve) => setTimeout(resolve, 5));
      if (fail) throw fail;
      if (signal?.aborted) throw new DOMException('cancelled', 'AbortError');
      return bytes.slice(offset, Math.min(file.size, offset + length));
    },
  };
  return { reader, reads };
}

describe('coalescingReader', () => {
  it('reads neighbours asked for in one turn as one read, and gives each caller its own bytes', async () => {
    const { reader, reads } = countingReader();
    const gathered = coalescingReader(reader, { maxGap: 100 });
    const wanted: [number, number][] = [[1000, 500], [0, 1000], [1550, 200], [1500, 10], [1500, 10], [4000, 16]];
    const got = await Promise.all(wanted.map(([o, n]) => gathered.readRange(file, o, n)));
    // [0, 1760) in one read (gaps of 50 and 0 bytes, overlaps and a repeat), 4000 alone (2240 bytes away).
    expect(reads.map((r) => [r.offset, r.length])).toEqual([[0, 1750], [4000, 16]]);
    for (const [i, [o, n]] of wanted.entries()) {
      expect(got[i]).toEqual(bytes.subarray(o, o + n));
      // A private buffer, so the caller may transfer it to a worker.
      expect(got[i].byteOffset).toBe(0);
      expect(got[i].buffer.byteLength).toBe(n);
    }
  });

  it('reads in separate turns separately, and keeps each read under the longest span', async () => {
    const { reader, reads } = countingReader();
    const gathered = coalescingReader(reader, { maxGap: 1 << 20, maxSpan: 1000 });
    await gathered.readRange(file, 0, 100);
    await gathered.readRange(file, 100, 100);
    expect(reads.length).toBe(2);
    reads.length = 0;
    await Promise.all([0, 400, 800, 1200].map((o) => gathered.readRange(file, o, 300)));
    expect(reads.map((r) => [r.offset, r.length])).toEqual([[0, 700], [800, 700]]);
  });

  it('cancels only the read that was cancelled; the shared read stops when all of its readers have', async () => {
    const { reader, reads } = countingReader();
    const gathered = coalescingReader(reader);
    const one = new AbortController(), two = new AbortController();
    const first = gathered.readRange(file, 0, 100, one.signal);
    const second = gathered.readRange(file, 100, 100, two.signal);
    await Promise.resolve();
    one.abort();
    await expect(first).rejects.toMatchObject({ name: 'AbortError' });
    expect(await second).toEqual(bytes.subarray(100, 200));
    expect(reads[0].signal?.aborted).toBe(false);

    const three = new AbortController(), four = new AbortController();
    const both = [gathered.readRange(file, 0, 10, three.signal), gathered.readRange(file, 10, 10, four.signal)];
    await Promise.resolve();
    three.abort();
    four.abort();
    for (const read of both) await expect(read).rejects.toMatchObject({ name: 'AbortError' });
    expect(reads[1].signal?.aborted).toBe(true);
  });

  it('refuses at once a read whose signal has already fired', async () => {
    const { reader, reads } = countingReader();
    const gone = AbortSignal.abort();
    await expect(coalescingReader(reader).readRange(file, 0, 10, gone)).rejects.toMatchObject({ name: 'AbortError' });
    expect(reads.length).toBe(0);
  });

  it('tells every reader of a failed read why it failed', async () => {
    const { reader } = countingReader(new Error('scene.tif: the disk went away'));
    const gathered = coalescingReader(reader);
    const results = await Promise.allSettled([gathered.readRange(file, 0, 10), gathered.readRange(file, 10, 10)]);
    expect(results.map((r) => (r.status === 'rejected' ? (r.reason as Error).message : 'read'))).toEqual(['scene.tif: the disk went away', 'scene.tif: the disk went away']);
  });

  it('renders a screen of composite tiles with a few reads, pixel for pixel as with one read per block', async () => {
    const size = 512;
    const bands = [0, 1, 2].map((b) => Uint16Array.from({ length: size * size }, (_, i) => ((i % size) * (b + 1) + Math.floor(i / size) * 3) % 2000));
    const tiff = writeGeoTiff({
      width: size, height: size, sampleType: 'uint16', bands, epsg: 32633, origin: [500000, 5000000],
      pixelSize: [1, 1], tileSize: 128, compression: 'deflate', overviewFactors: [],
    });
    const ref: FileRef = { id: 'scene', name: 'scene.tif', size: tiff.length };
    const summary = await inspectTiff(async (o, n) => tiff.subarray(o, o + n), tiff.length, ref.name);
    const counted = (reads: number[]): RangeReader => ({
      async readRange(_f, offset, length) {
        reads.push(offset);
        return tiff.slice(offset, offset + length);
      },
    });
    const plainReads: number[] = [], gatheredReads: number[] = [];
    const plain = Raster.fromSummary(counted(plainReads), new InlinePool(), ref, summary);
    const gathered = Raster.fromSummary(coalescingReader(counted(gatheredReads)), new InlinePool(), ref, summary);
    const limits = [0, 1, 2].map(() => ({ min: 0, max: 2000, gamma: 1 }));
    const screen = (raster: Raster) => Promise.all(
      [0, 1, 2, 3].flatMap((by) => [0, 1, 2, 3].map((bx) => raster.renderTile(0, bx, by, [0, 1, 2], limits))),
    ) as Promise<RgbaTile[]>;
    const [a, b] = [await screen(plain), await screen(gathered)];
    expect(b.map((t) => Array.from(t.rgba))).toEqual(a.map((t) => Array.from(t.rgba)));
    expect(plainReads.length).toBe(48); // 16 tiles x 3 bands
    // The writer puts a level's blocks one after another, band after band: the whole
    // screen is one read.
    expect(gatheredReads.length).toBe(1);
  });
});
