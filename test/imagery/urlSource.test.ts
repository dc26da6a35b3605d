import { join, resolve } from 'node:path';
import { existsSync, statSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inspectTiff } from '../../src/core/tiff/inspectTiff.ts';
import { Raster } from '../../src/imagery/Raster.ts';
import { InlinePool } from '../../src/imagery/inlinePool.ts';
import { urlReader } from '../../src/imagery/urlSource.ts';
import { openRasterFile } from './nodeRaster.ts';

// A GeoTIFF read over HTTP by byte ranges from the project's local server (which answers
// Range requests per RFC 9110): the same windows as from the file on disk, and only the
// bytes of the blocks asked for.

const repo = resolve(import.meta.dirname, '../..');
const demo = join(repo, 'demo');
const haveDemo = existsSync(join(demo, 'ms.tif'));
let server: { url: string; close(): Promise<void> };
const requested: { range: string | null }[] = [];

describe.runIf(haveDemo)('imagery by URL', () => {
  beforeAll(async () => {
    const { startServer } = await import(join(repo, 'scripts', 'serve.mjs'));
    server = await startServer({ port: 0, root: demo, demoDir: demo });
  });
  afterAll(async () => server?.close());

  const counting = (input: string, init?: RequestInit) => {
    requested.push({ range: new Headers(init?.headers).get('range') });
    return fetch(input, init);
  };

  it('opens a file by its address and reads the same window as from disk, by ranges', async () => {
    const reader = urlReader(counting);
    const file = await reader.open(new URL('demo/ms.tif', server.url).href);
    expect(file).toMatchObject({ name: 'ms.tif', size: statSync(join(demo, 'ms.tif')).size });
    const summary = await inspectTiff((o, n) => reader.readRange(file, o, n), file.size, file.name);
    const remote = Raster.fromSummary(reader, new InlinePool(), file, summary);
    const local = await openRasterFile(join(demo, 'ms.tif'));
    requested.length = 0;
    const box = { x0: 250, y0: 250, x1: 262, y1: 270 };
    const [a, b] = await Promise.all([remote.readWindow(0, box, [4, 6]), local.readWindow(0, box, [4, 6])]);
    expect(a).toEqual(b);
    // The window straddles the corner of four 256 x 256 blocks: four reads per band, two bands.
    expect(requested.length).toBe(8);
    expect(requested.every((r) => /^bytes=\d+-\d+$/.test(r.range ?? ''))).toBe(true);
  });

  it('says plainly what is wrong with a bad address', async () => {
    const reader = urlReader();
    await expect(reader.open(new URL('demo/none.tif', server.url).href)).rejects.toThrow(/none\.tif: the server has no such file \(HTTP 404\)/);
    await expect(reader.open('ftp://example.invalid/a.tif')).rejects.toThrow('ftp://example.invalid/a.tif: only http and https addresses can be read');
    await expect(reader.open('not a url')).rejects.toThrow('not a url: not a web address');
  });
});
