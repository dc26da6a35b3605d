import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { inspectInWorker } from '../../src/cli/inspectInWorker.ts';
import { InputError } from '../../src/cli/errors.ts';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';
import { makeBands } from '../core/tiff/helpers.ts';
import { bombTiff, goodTiff, hugeTiff, loopTiff, notTiff, plainTiff, truncatedTiff } from '../core/tiff/hostile.ts';

const dir = mkdtempSync(join(tmpdir(), 'fellfield-info-'));
const file = (name: string, bytes: Uint8Array) => {
  const path = join(dir, name);
  writeFileSync(path, bytes);
  return path;
};

async function cli(...args: string[]) {
  const stdout: string[] = [];
  const stderr: string[] = [];
  const code = await main(args, { stdout: (t) => stdout.push(t), stderr: (t) => stderr.push(t) });
  return { code, stdout: stdout.join('\n'), stderr: stderr.join('\n'), stderrLines: stderr };
}

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('fellfield info', () => {
  const scene = file('scene.tif', writeGeoTiff({
    width: 300, height: 200, sampleType: 'uint16', bands: makeBands('uint16', 300, 200, 4, 2),
    epsg: 32633, origin: [351000, 5202000], pixelSize: [1.2, 1.2], tileSize: 64, noData: 0, overviewFactors: [2],
    bandNames: ['blue', 'green', 'red', 'nir'], bandWavelengthsNm: [482, 561, 655, 865],
  }));

  it('prints one JSON object with the keys the contract names', async () => {
    const { code, stdout, stderr } = await cli('info', scene, '--json');
    expect(code).toBe(0);
    expect(stderr).toBe('');
    const json = JSON.parse(stdout);
    expect(json).toMatchObject({
      width: 300, height: 200, bands: 4, dtype: 'uint16', epsg: 32633, crs_name: 'WGS 84 / UTM zone 33N',
      pixel_size: [1.2, 1.2], tiled: true, tile_size: [64, 64], compression: 'deflate', overviews: 1,
      overview_sizes: [[150, 100]], nodata: 0, band_names: ['blue', 'green', 'red', 'nir'],
      band_wavelengths_nm: [482, 561, 655, 865], georeferenced: true, checked_blocks: 8, warnings: [],
    });
    expect(json.extent[0]).toBe(351000);
    expect(json.extent[1]).toBeCloseTo(5202000 - 240, 6);
    expect(json.extent[2]).toBeCloseTo(351360, 6);
    expect(json.extent[3]).toBe(5202000);
  });

  it('prints a readable table by default', async () => {
    const { code, stdout } = await cli('info', scene);
    expect(code).toBe(0);
    expect(stdout).toContain('300 x 200 pixels, 4 bands, uint16');
    expect(stdout).toContain('EPSG:32633, WGS 84 / UTM zone 33N');
    expect(stdout).toContain('tiles of 64 x 64, band-separate');
    expect(stdout).toContain('deflate, horizontal predictor');
    expect(stdout).toContain('1 blue (482 nm); 2 green (561 nm); 3 red (655 nm); 4 nir (865 nm)');
  });

  it('decodes every tile with --verify', async () => {
    const { code, stdout } = await cli('info', scene, '--json', '--verify');
    expect(code).toBe(0);
    expect(JSON.parse(stdout).checked_blocks).toBe(4 * (5 * 4 + 3 * 2));
  });
});

describe('fellfield info on bad input: exit 2 and one line naming the file', () => {
  const cases: [string, Uint8Array, RegExp][] = [
    ['truncated.tif', truncatedTiff(), /truncated\.tif: tile \d+ of the image lies past the end of the file .*: the file is truncated$/],
    ['huge.tif', hugeTiff(), /huge\.tif: the image declares 1000000 x 1000000 pixels, past the limit/],
    ['notes.tif', notTiff(), /notes\.tif: not a TIFF file/],
    ['loop.tif', loopTiff(), /loop\.tif: the IFD chain loops back to offset 8 \(a damaged or hostile file\)$/],
    ['bomb.tif', bombTiff(1024), /bomb\.tif: tile 0 of the full image inflates past its declared 4096 bytes$/],
    ['cut.tif', goodTiff().slice(0, 30), /cut\.tif: .*truncated/],
  ];
  for (const [name, bytes, message] of cases) {
    it(name, async () => {
      const path = file(name, bytes);
      for (const json of [[], ['--json']]) {
        const { code, stdout, stderrLines } = await cli('info', path, ...json);
        expect(code).toBe(2);
        expect(stdout).toBe('');
        expect(stderrLines).toHaveLength(1);
        expect(stderrLines[0]).toMatch(/^fellfield info: /);
        expect(stderrLines[0]).toMatch(message);
      }
    });
  }

  it('a missing file, a directory, no file, two files, a bad timeout', async () => {
    expect((await cli('info', join(dir, 'nothing.tif'))).stderr).toMatch(/nothing\.tif: cannot open the file \(no such file\)$/);
    expect((await cli('info', dir)).stderr).toMatch(/not a regular file|it is a directory/);
    expect(await cli('info')).toMatchObject({ code: 2, stderr: 'fellfield info: give one file: fellfield info FILE.tif' });
    expect((await cli('info', 'a.tif', 'b.tif')).code).toBe(2);
    expect((await cli('info', 'a.tif', '--timeout', 'soon')).stderr).toMatch(/--timeout must be a positive number/);
    expect((await cli('info', 'a.tif', '--colour')).stderr).toMatch(/Unknown option '--colour'/);
  });

  it('no georeferencing: a warning and exit 0; with --require-georef, exit 2', async () => {
    const path = file('plain.tif', plainTiff());
    const warned = await cli('info', path, '--json');
    expect(warned.code).toBe(0);
    expect(JSON.parse(warned.stdout)).toMatchObject({ georeferenced: false, epsg: null, pixel_size: [1, 1], extent: [0, 0, 32, 32] });
    expect(warned.stderrLines).toEqual([`fellfield info: ${path}: warning: no georeferencing (no GeoTIFF tags): the image is shown in pixel space`]);
    const refused = await cli('info', path, '--require-georef');
    expect(refused.code).toBe(2);
    expect(refused.stderrLines).toEqual([`fellfield info: ${path}: no georeferencing (--require-georef)`]);
  });

  it('the watchdog ends a worker that never answers', async () => {
    const started = Date.now();
    const spin = new URL('./fixtures/spinWorker.ts', import.meta.url);
    await expect(inspectInWorker('spin.tif', { timeoutMs: 1500, workerUrl: spin })).rejects.toThrow(
      new InputError('spin.tif: gave up after 2 s reading the file (a damaged or hostile file?)'),
    );
    expect(Date.now() - started).toBeLessThan(10_000);
  });

  it('the installed command exits 2 on a hostile file', () => {
    const bin = fileURLToPath(new URL('../../bin/fellfield.mjs', import.meta.url));
    const result = spawnSync(process.execPath, [bin, 'info', file('loop26.tif', loopTiff())], { encoding: 'utf8', timeout: 30_000 });
    expect(result.status).toBe(2);
    expect(result.stdout).toBe('');
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
    expect(result.stderr).toMatch(/loop26\.tif: the IFD chain loops back to offset 8/);
  });
});
