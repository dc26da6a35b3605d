import { inspectTiff, type TiffSummary } from '../../src/core/tiff/inspectTiff.ts';
import { blockLayout } from '../../src/core/tiff/blocks.ts';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';
import type { TileLayout } from '../../src/core/tiff/decodeTile.ts';
import { seeded } from '../harness.ts';

// Seeded imagery for the imagery benchmarks: 11-bit values in uint16, smooth ground
// with crown-sized texture and sensor noise, so deflate works as hard as on real scenes.

export function seededBand(width: number, height: number, seed: number): Uint16Array {
  const random = seeded(seed);
  const values = new Uint16Array(width * height);
  const fx = 0.02 + random() * 0.02, fy = 0.02 + random() * 0.02;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const ground = 420 + 220 * Math.sin(x * fx) * Math.cos(y * fy);
      const crowns = 180 * Math.max(0, Math.sin(x * 0.41 + seed) * Math.sin(y * 0.37));
      values[y * width + x] = Math.max(0, Math.min(2047, Math.round(ground + crowns + (random() - 0.5) * 60)));
    }
  }
  return values;
}

export interface EncodedScene {
  bytes: Uint8Array;
  summary: TiffSummary;
  /** Level 0 tiles of band 0: compressed bytes and their layout. */
  tiles: { bytes: Uint8Array; layout: TileLayout }[];
}

/** A tiled, deflate-compressed one-band GeoTIFF and its level-0 tiles. */
export async function encodedScene(width: number, seed = 1): Promise<EncodedScene> {
  const bytes = writeGeoTiff({
    width, height: width, sampleType: 'uint16', bands: [seededBand(width, width, seed)], epsg: 32633,
    origin: [500000, 5000000], pixelSize: [0.5, 0.5], tileSize: 256, compression: 'deflate', overviewFactors: [],
  });
  const summary = await inspectTiff(async (o, n) => bytes.subarray(o, o + n), bytes.length, 'bench.tif');
  const level = summary.levels[0];
  const tiles = Array.from(level.offsets, (offset, i) => ({
    bytes: bytes.slice(offset, offset + level.byteCounts[i]),
    layout: blockLayout(summary, 0, i),
  }));
  return { bytes, summary, tiles };
}
