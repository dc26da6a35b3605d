import { describe, expect, it } from 'vitest';
import { extentOfWindow, readWindow, readWindowBands, windowForExtent } from '../../../src/core/raster/index.ts';
import { inspectTiff } from '../../../src/core/tiff/inspectTiff.ts';
import { isTiffError } from '../../../src/core/tiff/errors.ts';
import { writeGeoTiff } from '../../../src/core/tiff/writeGeoTiff.ts';
import { makeBands } from '../tiff/helpers.ts';

// Windows read through the range reader must equal the same rectangle cut straight out
// of the arrays that were written, whatever tiles they straddle.

const W = 150;
const H = 110;
const bands = makeBands('uint16', W, H, 3, 7);

function countingReader(bytes: Uint8Array) {
  const calls: [number, number][] = [];
  const read = async (offset: number, length: number) => {
    calls.push([offset, length]);
    return bytes.slice(offset, offset + length);
  };
  return { read, calls };
}

async function open(options: Partial<Parameters<typeof writeGeoTiff>[0]> = {}) {
  const bytes = writeGeoTiff({
    width: W, height: H, sampleType: 'uint16', bands, epsg: 32633, origin: [500000, 5200000], pixelSize: [0.5, 0.5],
    tileSize: 32, compression: 'deflate', predictor: true, overviewFactors: [2], ...options,
  });
  const reader = countingReader(bytes);
  const summary = await inspectTiff(reader.read, bytes.length, 'scene.tif');
  reader.calls.length = 0;
  return { summary, ...reader };
}

function cut(band: ArrayLike<number>, stride: number, x: number, y: number, w: number, h: number): number[] {
  const out: number[] = [];
  for (let r = y; r < y + h; r++) for (let c = x; c < x + w; c++) out.push(band[r * stride + c]);
  return out;
}

describe('readWindow', () => {
  it('returns the written pixels of a window across tile borders, in the file type', async () => {
    const { summary, read } = await open();
    const values = await readWindow(read, summary, { level: 0, band: 1, x: 25, y: 30, width: 50, height: 41 });
    expect(values).toBeInstanceOf(Uint16Array);
    expect(Array.from(values)).toEqual(cut(bands[1], W, 25, 30, 50, 41));
  });

  it('reads only the tiles that cover the window', async () => {
    const { summary, read, calls } = await open();
    // Columns 40-70 and rows 0-20 touch tiles (1,0) and (2,0) of band 3's 5 x 4 grid.
    await readWindow(read, summary, { level: 0, band: 2, x: 40, y: 0, width: 31, height: 21 });
    expect(calls).toHaveLength(2);
  });

  it('reads several bands at once and the last partial tiles at the image edge', async () => {
    const { summary, read } = await open();
    const got = await readWindowBands(read, summary, { level: 0, bands: [2, 0], x: 120, y: 90, width: 30, height: 20 });
    expect(Array.from(got[0])).toEqual(cut(bands[2], W, 120, 90, 30, 20));
    expect(Array.from(got[1])).toEqual(cut(bands[0], W, 120, 90, 30, 20));
  });

  it('maps extents to windows and back', async () => {
    const { summary } = await open();
    const window = windowForExtent(summary, [500010.2, 5199950.1, 500020, 5199990], 0)!;
    expect(window).toEqual({ level: 0, x: 20, y: 20, width: 20, height: 80 });
    expect(extentOfWindow(summary, window)).toEqual([500010, 5199950, 500020, 5199990]);
    // Overview 1 has pixels twice the size.
    expect(windowForExtent(summary, [500010.2, 5199950.1, 500020, 5199990], 1)).toEqual({ level: 1, x: 10, y: 10, width: 10, height: 40 });
    expect(windowForExtent(summary, [400000, 5199950, 400010, 5199990])).toBeNull();
    // Clipped at the image's edge.
    expect(windowForExtent(summary, [499990, 5199000, 500005, 5200100])).toEqual({ level: 0, x: 0, y: 0, width: 10, height: H });
  });

  it('refuses windows outside the image, unknown bands and levels, and windows past the cap', async () => {
    const { summary, read } = await open();
    await expect(readWindow(read, summary, { level: 0, band: 0, x: 140, y: 0, width: 11, height: 5 })).rejects.toThrow(/not inside level 0 \(150 x 110\)/);
    await expect(readWindow(read, summary, { level: 0, band: 3, x: 0, y: 0, width: 1, height: 1 })).rejects.toThrow(/no band 4 \(the file has 3\)/);
    await expect(readWindow(read, summary, { level: 5, band: 0, x: 0, y: 0, width: 1, height: 1 })).rejects.toThrow(/no level 5/);
    const capped = readWindow(read, summary, { level: 0, band: 0, x: 0, y: 0, width: 100, height: 100 }, { maxPixels: 9999 });
    await expect(capped).rejects.toSatisfy((e: unknown) => isTiffError(e) && e.code === 'too-large' && /scene\.tif: a window of 100 x 100/.test(e.message));
  });

  it('stops when cancelled', async () => {
    const { summary, read } = await open();
    const controller = new AbortController();
    controller.abort();
    await expect(readWindow(read, summary, { level: 0, band: 0, x: 0, y: 0, width: 10, height: 10 }, { signal: controller.signal })).rejects.toThrow();
  });
});
