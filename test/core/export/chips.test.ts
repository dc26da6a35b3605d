import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import { afterAll, describe, expect, it } from 'vitest';
import { writeChips } from '../../../src/core/export/chips.ts';
import { encodeNpy } from '../../../src/core/export/chipsNpy.ts';
import type { RasterBands, SamplePatch } from '../../../src/core/export/samples.ts';
import type { RasterGrid } from '../../../src/core/geometry/rasterGrid.ts';
import type { Ring } from '../../../src/core/geometry/types.ts';
import { patchPixels } from '../../../src/core/pixels/patchPixels.ts';

// Chips read back by independent readers: numpy 1.24.2 (Debian python3-numpy, numpy.load
// follows the NPY format spec of numpy.lib.format) and GDAL 3.6.2 (gdalinfo -json and
// gdallocationinfo, Debian gdal-bin) for the GeoTIFFs: shape, type, values, georeference.

const dir = mkdtempSync(join(tmpdir(), 'fellfield-chips-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const ms: RasterGrid = { originX: 500000, originY: 4200040, pixelWidth: 2, pixelHeight: 2, width: 20, height: 20, epsg: 32633 };
const panGrid: RasterGrid = { ...ms, pixelWidth: 0.5, pixelHeight: 0.5, width: 80, height: 80 };
const msValue = (b: number, r: number, c: number) => 1000 * (b + 1) + 20 * r + c;
const msBands: RasterBands = {
  grid: ms, names: ['blue', 'green', 'red', 'NIR'], noData: 0,
  bands: [0, 1, 2, 3].map((b) => Uint16Array.from({ length: 400 }, (_, i) => msValue(b, Math.floor(i / 20), i % 20))),
};
const pan: RasterBands = { grid: panGrid, names: ['pan'], bands: [Uint16Array.from({ length: 6400 }, (_, i) => i % 4000)], noData: 0 };
const square = (x: number, y: number, s: number): Ring => [[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]];
const patches: SamplePatch[] = [
  // Pure pixels rows 10-11, columns 5-6 (x 500010-500014, y 4200016-4200020); of the four
  // equally near their mean the first, row 10, col 5, is the centre.
  { id: 'p1', species: 'pice', cls: 'conifer', fold: 1, pixels: patchPixels([[square(500010, 4200016, 4)]], ms, { kind: 'inside', buffer: 0 }) },
  // At the scene's corner: its 5 x 5 chip runs off the west and north edges.
  { id: 'p2', species: 'salx', cls: 'other', fold: 'test', pixels: patchPixels([[square(500000, 4200038, 2)]], ms, { kind: 'inside', buffer: 0 }) },
];

const python = (code: string) => execFileSync('/usr/bin/python3', ['-c', code], { encoding: 'utf8' });

describe('NPY chips read by numpy', () => {
  const set = writeChips(patches, ms, msBands, pan, { size: 5, format: 'npy' });
  for (const f of set.files) writeFileSync(join(dir, f.name), f.bytes);

  it('have the shape (bands, rows, columns), the type and the values of the window', () => {
    expect(set.files.map((f) => f.name)).toEqual(['p1_001_ms.npy', 'p1_001_pan.npy', 'p2_001_ms.npy', 'p2_001_pan.npy']);
    const out = JSON.parse(python(`
import json, numpy as np
a = np.load(${JSON.stringify(join(dir, 'p1_001_ms.npy'))})
p = np.load(${JSON.stringify(join(dir, 'p1_001_pan.npy'))})
print(json.dumps({"shape": a.shape, "dtype": str(a.dtype), "c": a[2, 2, 2].item(), "tl": a[0, 0, 0].item(), "pshape": p.shape, "ptl": p[0, 0, 0].item()}))`));
    expect(out.shape).toEqual([4, 5, 5]);
    expect(out.dtype).toBe('uint16');
    expect(out.c).toBe(msValue(2, 10, 5)); // the centre pixel of band 3
    expect(out.tl).toBe(msValue(0, 8, 3)); // two up and two left of it
    expect(out.pshape).toEqual([1, 20, 20]);
    // The pan window starts at the same corner: MS (8, 3) is pan (32, 12).
    expect(out.ptl).toBe((32 * 80 + 12) % 4000);
  });

  it('fill what lies off the scene with no-data and say so', () => {
    const corner = JSON.parse(python(`
import json, numpy as np
a = np.load(${JSON.stringify(join(dir, 'p2_001_ms.npy'))})
print(json.dumps({"shape": a.shape, "off": a[0, 0, 0].item(), "on": a[0, 2, 2].item()}))`));
    expect(corner).toEqual({ shape: [4, 5, 5], off: 0, on: msValue(0, 0, 0) });
    expect(set.messages).toContain('chip p2_001_ms.npy runs off the scene: filled with 0');
  });

  it('lists every chip in the index CSV', () => {
    const rows = Papa.parse<Record<string, string>>(set.index.trimEnd(), { header: true }).data;
    expect(rows).toHaveLength(4);
    expect(rows[0]).toMatchObject({ file: 'p1_001_ms.npy', kind: 'ms', patch_id: 'p1', class: 'conifer', fold: '1', centre_row: '10', centre_col: '5', x_left: '500006', y_top: '4200024', width: '5', bands: '4', dtype: 'uint16', complete: 'true' });
    expect(rows[3]).toMatchObject({ kind: 'pan', fold: 'test', width: '20', complete: 'false' });
  });

  it('write headers numpy accepts for every type and a one-dimensional shape', () => {
    const cases = [
      ['u8', encodeNpy(new Uint8Array([1, 2, 3]), [3]), 'uint8', [3]],
      ['i16', encodeNpy(new Int16Array([-5, 7]), [2, 1]), 'int16', [2, 1]],
      ['f32', encodeNpy(new Float32Array([0.5, -1.25, 3, 4]), [2, 2]), 'float32', [2, 2]],
    ] as const;
    for (const [name, bytes, dtype, shape] of cases) {
      expect((10 + new DataView(bytes.buffer).getUint16(8, true)) % 64).toBe(0); // data aligned on 64 bytes
      const path = join(dir, `${name}.npy`);
      writeFileSync(path, bytes);
      const out = JSON.parse(python(`import json, numpy as np; a = np.load(${JSON.stringify(path)}); print(json.dumps({"d": str(a.dtype), "s": a.shape, "v": a.ravel().tolist()}))`));
      expect([out.d, out.s]).toEqual([dtype, shape]);
    }
    expect(() => encodeNpy(new Uint8Array(3), [2, 2])).toThrow(/holds 4 values/);
  });
});

describe('GeoTIFF chips read by GDAL', () => {
  const set = writeChips(patches.slice(0, 1), ms, msBands, pan, { size: 5, format: 'geotiff' });
  for (const f of set.files) writeFileSync(join(dir, f.name), f.bytes);

  it('carry the window\'s size, type, bands, values and georeference', () => {
    const info = JSON.parse(execFileSync('gdalinfo', ['-json', join(dir, 'p1_001_ms.tif')], { encoding: 'utf8' }));
    expect(info.size).toEqual([5, 5]);
    expect(info.bands).toHaveLength(4);
    expect(info.bands[0].type).toBe('UInt16');
    expect(info.geoTransform).toEqual([500006, 2, 0, 4200024, 0, -2]);
    expect(info.coordinateSystem.wkt).toMatch(/ID\["EPSG",32633\]\]$/);
    const value = execFileSync('gdallocationinfo', ['-valonly', '-b', '3', join(dir, 'p1_001_ms.tif'), '2', '2'], { encoding: 'utf8' });
    expect(Number(value.trim())).toBe(msValue(2, 10, 5));
    const panInfo = JSON.parse(execFileSync('gdalinfo', ['-json', join(dir, 'p1_001_pan.tif')], { encoding: 'utf8' }));
    expect(panInfo.size).toEqual([20, 20]);
    expect(panInfo.geoTransform).toEqual([500006, 0.5, 0, 4200024, 0, -0.5]);
  });
});
