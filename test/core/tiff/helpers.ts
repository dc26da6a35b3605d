import type { BandArray, SampleType } from '../../../src/core/tiff/writeGeoTiff.ts';
import type { ReadRange } from '../../../src/core/tiff/byteSource.ts';
import { blockIndex, blockLayout } from '../../../src/core/tiff/blocks.ts';
import { decodeTile } from '../../../src/core/tiff/decodeTile.ts';
import type { TiffSummary } from '../../../src/core/tiff/inspectTiff.ts';

/** A small seeded generator (mulberry32), so every test raster is the same each run. */
export function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const ctors = { uint8: Uint8Array, uint16: Uint16Array, int16: Int16Array, float32: Float32Array };

/** Smooth gradients plus noise, different per band, over the sample type's range. */
export function makeBands(type: SampleType, width: number, height: number, count: number, seed = 1): BandArray[] {
  const random = seeded(seed);
  return Array.from({ length: count }, (_, b) => {
    const band = new ctors[type](width * height);
    for (let y = 0; y < height; y++) {
      for (let x = 0; x < width; x++) {
        const smooth = Math.sin((x + b * 7) / 9) * Math.cos(y / 11);
        const noise = random() - 0.5;
        let v: number;
        if (type === 'uint8') v = Math.round(127 + 100 * smooth + 20 * noise);
        else if (type === 'uint16') v = Math.round(1024 + 900 * smooth + 60 * noise + b * 50);
        else if (type === 'int16') v = Math.round(-2000 * smooth + 300 * noise - b * 10);
        else v = smooth * 0.7 + noise * 0.01 + b;
        band[y * width + x] = v;
      }
    }
    return band;
  });
}

/** A ReadRange over bytes in memory, counting the calls and bytes read. */
export function memoryReader(bytes: Uint8Array): ReadRange & { calls: number; bytesRead: number } {
  const read = (async (offset: number, length: number) => {
    read.calls++;
    read.bytesRead += length;
    return bytes.slice(offset, Math.min(bytes.length, offset + length));
  }) as ReadRange & { calls: number; bytesRead: number };
  read.calls = 0;
  read.bytesRead = 0;
  return read;
}

export function arrayBufferOf(bytes: Uint8Array): ArrayBuffer {
  return bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
}

/** Reads a whole band of a level through inspectTiff's block table and decodeTile. */
export function readBand(bytes: Uint8Array, summary: TiffSummary, levelIndex: number, band: number): number[] {
  const level = summary.levels[levelIndex];
  const out = new Array<number>(level.width * level.height);
  for (let by = 0; by < level.blocksDown; by++) {
    for (let bx = 0; bx < level.blocksAcross; bx++) {
      const index = blockIndex(summary, levelIndex, summary.planar === 2 ? band : 0, bx * level.blockWidth, by * level.blockHeight);
      const layout = blockLayout(summary, levelIndex, index);
      const start = level.offsets[index];
      const values = decodeTile(bytes.subarray(start, start + level.byteCounts[index]), layout);
      for (let r = 0; r < layout.height; r++) {
        for (let c = 0; c < layout.width; c++) {
          const x = bx * level.blockWidth + c;
          const y = by * level.blockHeight + r;
          if (x >= level.width || y >= level.height) continue;
          out[y * level.width + x] = values[(r * layout.width + c) * layout.samples + (summary.planar === 2 ? 0 : band)];
        }
      }
    }
  }
  return out;
}
