import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { writeGeoTiff, type SampleType } from '../../src/core/tiff/writeGeoTiff.ts';
import { stretchValue } from '../../src/core/render/stretch.ts';
import type { RgbaTile } from '../../src/imagery/renderJobs.ts';
import { multispectralWindow, renderSharpenedTile } from '../../src/imagery/sharpenedTile.ts';
import { openRasterFile } from './nodeRaster.ts';

// Reading windows and rendering tiles of small rasters made by the project's writer, in
// every encoding the reader supports, tiled and striped. (The same encodings written by
// GDAL are read back in test/reference/, by the reader's own tests.)

const dir = mkdtempSync(join(tmpdir(), 'fellfield-raster-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const W = 70, H = 45;
const arrays = { uint8: Uint8Array, uint16: Uint16Array, int16: Int16Array, float32: Float32Array };
function bandValues(type: SampleType, band: number) {
  const values = new arrays[type](W * H);
  for (let i = 0; i < values.length; i++) {
    const x = i % W, y = Math.floor(i / W);
    const v = (x * 7 + y * 13 + band * 31) % 200;
    values[i] = type === 'int16' ? v - 100 : type === 'float32' ? v / 8 : v;
  }
  return values;
}

function write(name: string, options: { type: SampleType; compression: 'deflate' | 'none' | 'lzw' | 'packbits'; stripped: boolean; bands?: number; pixel?: number; origin?: [number, number]; size?: [number, number] }) {
  const [width, height] = options.size ?? [W, H];
  const bands = Array.from({ length: options.bands ?? 3 }, (_, b) => {
    if (!options.size) return bandValues(options.type, b);
    const v = new arrays[options.type](width * height);
    for (let i = 0; i < v.length; i++) v[i] = 100 + ((i * (b + 3)) % 50);
    return v;
  });
  const path = join(dir, name);
  writeFileSync(path, writeGeoTiff({
    width, height, sampleType: options.type, bands, epsg: 32633,
    origin: options.origin ?? [500000, 5000000], pixelSize: [options.pixel ?? 2, options.pixel ?? 2],
    tileSize: 32, compression: options.compression, stripped: options.stripped, overviewFactors: options.stripped ? [] : [2],
  }));
  return { path, bands };
}

describe('Raster windows over every encoding', () => {
  const types: SampleType[] = ['uint8', 'uint16', 'int16', 'float32'];
  const compressions = ['none', 'deflate', 'lzw', 'packbits'] as const;
  for (const type of types) {
    for (const compression of compressions) {
      for (const stripped of [false, true]) {
        it(`reads ${type}, ${compression}, ${stripped ? 'striped' : 'tiled'} back exactly`, async () => {
          const { path, bands } = write(`${type}-${compression}-${stripped}.tif`, { type, compression, stripped });
          const raster = await openRasterFile(path);
          expect(raster.summary.tiled).toBe(!stripped);
          // A window across block edges, partly outside the image.
          const box = { x0: 20, y0: 10, x1: 80, y1: 40 };
          const got = await raster.readWindow(0, box, [0, 2]);
          for (const [k, band] of [0, 2].entries()) {
            for (let y = box.y0; y < box.y1; y++) {
              for (let x = box.x0; x < box.x1; x++) {
                const value = got[k][(y - box.y0) * 60 + (x - box.x0)];
                if (x >= W) expect(value).toBeNaN();
                else expect(value).toBe(bands[band][y * W + x]);
              }
            }
          }
          expect(await raster.pixelValues(69, 44)).toEqual([0, 1, 2].map((b) => bands[b][44 * W + 69]));
        });
      }
    }
  }

  it('renders the same composite tile from strips as from tiles', async () => {
    const tiled = await openRasterFile(write('t.tif', { type: 'uint16', compression: 'deflate', stripped: false }).path);
    const striped = await openRasterFile(write('s.tif', { type: 'uint16', compression: 'deflate', stripped: true }).path);
    const limits = [0, 1, 2].map(() => ({ min: 10, max: 180, gamma: 1.2 }));
    // A 32 x 32 tile of the tiled file lies inside the first 256 x 256 tile of the striped one.
    const a = (await tiled.renderTile(0, 1, 0, [0, 1, 2], limits)) as RgbaTile;
    const b = (await striped.renderTile(0, 0, 0, [0, 1, 2], limits)) as RgbaTile;
    expect(striped.tileSize(0)).toEqual([256, 256]);
    for (let y = 0; y < 32; y++) {
      for (let x = 0; x < 32; x++) {
        for (let c = 0; c < 4; c++) expect(a.rgba[(y * 32 + x) * 4 + c]).toBe(b.rgba[(y * 256 + x + 32) * 4 + c]);
      }
    }
    // Beyond the image's 70 columns the striped tile is transparent.
    expect(b.rgba[(0 * 256 + 100) * 4 + 3]).toBe(0);
    expect(a.rgba[3]).toBe(255);
    expect(a.rgba[0]).toBe(stretchValue(bandValues('uint16', 0)[32], limits[0]));
  });

  it('finds the multispectral window of a pan tile, also with the rasters offset', async () => {
    const pan = await openRasterFile(write('pan.tif', { type: 'uint16', compression: 'deflate', stripped: false, bands: 1, pixel: 0.5, size: [128, 128], origin: [500000, 5000000] }).path);
    const ms = await openRasterFile(write('ms.tif', { type: 'uint16', compression: 'deflate', stripped: false, bands: 3, pixel: 2, size: [40, 40], origin: [499996, 5000004] }).path);
    const found = multispectralWindow(pan, ms, 0, 1, 2);
    // Pan tile (1, 2) starts 16 m east and 32 m south of the pan corner: ms pixel (10, 18).
    expect(found).toMatchObject({ msLevel: 0, x0: 10, y0: 18, step: 0.25, msBox: { x0: 10, y0: 18, x1: 18, y1: 26 } });
    // At the pan overview (1 m pixels) the ms full level (2 m) is still the coarsest not coarser.
    expect(multispectralWindow(pan, ms, 1, 0, 0).msLevel).toBe(0);
    const tile = (await renderSharpenedTile(pan, ms, 0, 0, 0, { method: 'ihs', bands: [0, 1, 2], limits: [0, 1, 2].map(() => ({ min: 0, max: 300, gamma: 1 })), gain: 1 })) as RgbaTile;
    expect(tile.width).toBe(32);
    expect(tile.rgba.filter((_, i) => i % 4 === 3).every((a) => a === 255)).toBe(true);
  });

  it('tells of a broken tile in the middle of a file and still shows the others', async () => {
    const { path } = write('broken.tif', { type: 'uint16', compression: 'deflate', stripped: false });
    const intact = await openRasterFile(path);
    const level = intact.summary.levels[0];
    const index = 1; // the second tile of band 1
    const bytes = readFileSync(path);
    bytes.fill(0xff, level.offsets[index], level.offsets[index] + level.byteCounts[index]);
    writeFileSync(path, bytes);
    const raster = await openRasterFile(path);
    const heard: string[] = [];
    raster.onProblem((message, count) => heard.push(`${count}: ${message}`));
    const limits = [{ min: 0, max: 200, gamma: 1 }];
    await expect(raster.renderTile(0, 1, 0, [0], limits)).rejects.toThrow(/broken\.tif: tile 1 of the full image/);
    await expect(raster.renderTile(0, 1, 0, [0], limits)).rejects.toThrow();
    expect(heard).toHaveLength(1); // told once per tile
    expect(heard[0]).toMatch(/^1: broken\.tif: tile 1 of the full image/);
    const other = (await raster.renderTile(0, 0, 0, [0], limits)) as RgbaTile;
    expect(other.width).toBe(32);
  });
});
