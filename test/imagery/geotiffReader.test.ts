import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inspectTiff } from '../../src/core/tiff/inspectTiff.ts';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';
import { averageOverview } from '../../src/core/tiff/overview.ts';
import { BrowserPlatform } from '../../src/platform/browser.ts';
import type { FileRef, Platform } from '../../src/platform/types.ts';
import { GeoTiffWindowReader } from '../../src/imagery/geotiffReader.ts';
import { bombTiff } from '../core/tiff/hostile.ts';
import { startServer } from '../../scripts/serve.mjs';

// geotiff.js reading through the platform bridge (the browser implementation, over real
// HTTP range requests to our local server), with our capped decoder in place of its own.

const width = 300;
const height = 200;
const bands = [0, 1].map((b) => Uint16Array.from({ length: width * height }, (_, i) => ((i * 7 + b * 1013) % 2048)));

let dir: string;
let server: { url: string; close(): Promise<void> };
let platform: Platform;

async function open(name: string): Promise<{ file: FileRef; reader: GeoTiffWindowReader }> {
  const file = await platform.openDemoFile(name);
  const summary = await inspectTiff((offset, length) => platform.readRange(file, offset, length), file.size, name);
  return { file, reader: await GeoTiffWindowReader.open(platform, file, summary) };
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'fellfield-geotiff-reader-'));
  writeFileSync(join(dir, 'two.tif'), writeGeoTiff({
    width, height, sampleType: 'uint16', bands, epsg: 32608, origin: [493000, 4430000], pixelSize: [1.2, 1.2],
    tileSize: 64, compression: 'deflate', predictor: true, overviewFactors: [2, 4],
  }));
  writeFileSync(join(dir, 'bomb.tif'), bombTiff(64));
  server = await startServer({ port: 0, root: dir, demoDir: dir });
  platform = new BrowserPlatform({ demoBaseUrl: new URL('demo/', server.url).href });
});

afterAll(async () => {
  await server?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('GeoTiffWindowReader', () => {
  it('reads a window across tile edges of both bands, equal to what was written', async () => {
    const { reader } = await open('two.tif');
    const [a, b] = await reader.read({ level: 0, window: [50, 30, 190, 140], bands: [0, 1] });
    for (let row = 30; row < 140; row += 13) {
      for (let col = 50; col < 190; col += 11) {
        const i = (row - 30) * 140 + (col - 50);
        expect(a[i]).toBe(bands[0][row * width + col]);
        expect(b[i]).toBe(bands[1][row * width + col]);
      }
    }
  });

  it('reads an overview level as the writer averaged it', async () => {
    const { reader } = await open('two.tif');
    const [overview] = await reader.read({ level: 1, window: [0, 0, 150, 100], bands: [1] });
    const expected = averageOverview(bands[1], width, height, 2);
    expect(Array.from(overview)).toEqual(Array.from(expected as ArrayLike<number>));
  });

  it('refuses windows outside the image or past the pixel cap, naming the file', async () => {
    const { reader } = await open('two.tif');
    await expect(reader.read({ level: 0, window: [0, 0, 301, 10], bands: [0] })).rejects.toThrow(/two\.tif: window .* outside/);
    await expect(reader.read({ level: 0, window: [0, 0, 10, 10], bands: [2] })).rejects.toThrow(/two\.tif: has no band 3/);
  });

  it('stops a tile that inflates past its declared size instead of allocating it', async () => {
    const { reader } = await open('bomb.tif');
    await expect(reader.read({ level: 0, window: [0, 0, 64, 64], bands: [0] })).rejects.toThrow(/bomb\.tif: .*declared/);
  });
});
