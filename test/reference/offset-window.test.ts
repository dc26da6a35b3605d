import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fromArrayBuffer } from 'geotiff';
import { afterAll, describe, expect, it } from 'vitest';
import { readWindowBands } from '../../src/core/raster/readWindow.ts';
import { inspectTiff } from '../../src/core/tiff/inspectTiff.ts';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';
import { makeBands } from '../core/tiff/helpers.ts';

// The raster window reader behind `fellfield offset`, checked against geotiff.js 3.0.5
// (npm), an independent TIFF reader, on files laid out by GDAL's gdal_translate
// (Debian gdal-bin 3.6): pixel-interleaved and band-separate, tiled and striped,
// deflate and LZW with the horizontal predictor, and an overview level.

const hasGdal = existsSync('/usr/bin/gdal_translate');
const dir = mkdtempSync(join(tmpdir(), 'fellfield-window-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const W = 203;
const H = 157;
const source = join(dir, 'source.tif');
writeFileSync(source, writeGeoTiff({
  width: W, height: H, sampleType: 'uint16', bands: makeBands('uint16', W, H, 4, 3), epsg: 32633,
  origin: [500000, 5200000], pixelSize: [1.2, 1.2], tileSize: 64, overviewFactors: [2],
}));

function translate(name: string, options: string[]): string {
  const out = join(dir, name);
  execFileSync('gdal_translate', ['-q', ...options, source, out]);
  return out;
}

async function compare(path: string, level: number, window: { x: number; y: number; width: number; height: number }, bands: number[]) {
  const bytes = new Uint8Array(readFileSync(path));
  const read = async (offset: number, length: number) => bytes.subarray(offset, offset + length);
  const summary = await inspectTiff(read, bytes.length, path);
  const ours = await readWindowBands(read, summary, { level, bands, ...window });
  const tiff = await fromArrayBuffer(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
  const image = await tiff.getImage(level);
  const theirs = (await image.readRasters({
    window: [window.x, window.y, window.x + window.width, window.y + window.height], samples: bands,
  })) as unknown as ArrayLike<number>[];
  return { summary, ours: ours.map((a) => Array.from(a)), theirs: bands.map((_, k) => Array.from(theirs[k])) };
}

describe('readWindow against geotiff.js 3.0.5', () => {
  it('agrees on our own band-separate tiled file, full level and overview', async () => {
    const full = await compare(source, 0, { x: 17, y: 40, width: 150, height: 100 }, [3, 1]);
    expect(full.ours).toEqual(full.theirs);
    const overview = await compare(source, 1, { x: 5, y: 3, width: 90, height: 70 }, [0]);
    expect(overview.ours).toEqual(overview.theirs);
  });

  describe.skipIf(!hasGdal)('on files laid out by gdal_translate (gdal-bin 3.6)', () => {
    const layouts: [string, string[]][] = [
      ['pixel-interleaved strips, deflate', ['-co', 'INTERLEAVE=PIXEL', '-co', 'COMPRESS=DEFLATE', '-co', 'PREDICTOR=2', '-co', 'BLOCKYSIZE=10']],
      ['pixel-interleaved tiles, LZW', ['-co', 'INTERLEAVE=PIXEL', '-co', 'TILED=YES', '-co', 'BLOCKXSIZE=32', '-co', 'BLOCKYSIZE=48', '-co', 'COMPRESS=LZW', '-co', 'PREDICTOR=2']],
      ['band-separate strips, uncompressed', ['-co', 'INTERLEAVE=BAND']],
      ['float32 pixel-interleaved tiles, floating-point predictor', ['-ot', 'Float32', '-co', 'INTERLEAVE=PIXEL', '-co', 'TILED=YES', '-co', 'COMPRESS=DEFLATE', '-co', 'PREDICTOR=3']],
    ];
    for (const [i, [label, options]] of layouts.entries()) {
      it(label, async () => {
        const path = translate(`layout-${i}.tif`, options);
        const { summary, ours, theirs } = await compare(path, 0, { x: 31, y: 9, width: 160, height: 131 }, [2, 0, 3]);
        expect(summary.planar).toBe(options.includes('INTERLEAVE=BAND') ? 2 : 1);
        expect(ours).toEqual(theirs);
        expect(ours[0].length).toBe(160 * 131);
      });
    }
  });
});
