import { describe, expect, it } from 'vitest';
import { blockLayout } from '../../../src/core/tiff/blocks.ts';
import { decodeTile } from '../../../src/core/tiff/decodeTile.ts';
import { TiffError } from '../../../src/core/tiff/errors.ts';
import { inspectTiff, requireGeoreference } from '../../../src/core/tiff/inspectTiff.ts';
import { FieldType, Tag } from '../../../src/core/tiff/tags.ts';
import { serializeTiff, type IfdEntry } from '../../../src/core/tiff/tiffSerializer.ts';
import { writeGeoTiff } from '../../../src/core/tiff/writeGeoTiff.ts';
import { makeBands, memoryReader, readBand } from './helpers.ts';
import { bombTiff, goodTiff, hugeTiff, longChainTiff, loopTiff, notTiff, plainTiff, truncatedTiff } from './hostile.ts';

function inspect(bytes: Uint8Array, name = 'scene.tif', limits = {}) {
  return inspectTiff(memoryReader(bytes), bytes.length, name, limits);
}

async function failure(promise: Promise<unknown>): Promise<TiffError> {
  try {
    await promise;
  } catch (error) {
    expect(error).toBeInstanceOf(TiffError);
    return error as TiffError;
  }
  throw new Error('expected a TiffError');
}

describe('inspectTiff on files the writer makes', () => {
  const bands = makeBands('uint16', 100, 70, 3, 11);
  const bytes = writeGeoTiff({
    width: 100, height: 70, sampleType: 'uint16', bands, epsg: 32633,
    origin: [350000, 5200000], pixelSize: [1.2, 1.2], tileSize: 32, noData: 0,
    bandNames: ['blue', 'green', 'red'], bandWavelengthsNm: [482, 561, 655],
  });

  it('summarises size, type, CRS, geotransform, layout, encoding and metadata', async () => {
    const s = await inspect(bytes);
    expect(s).toMatchObject({
      width: 100, height: 70, bands: 3, dtype: 'uint16', bitsPerSample: 16, sampleFormat: 1, planar: 2,
      littleEndian: true, bigTiff: false, georeferenced: true, epsg: 32633, crsName: 'WGS 84 / UTM zone 33N',
      pixelSize: [1.2, 1.2], origin: [350000, 5200000], tiled: true, tileSize: [32, 32],
      compression: 'deflate', compressionCode: 8, predictor: 2, overviews: 2, nodata: 0,
      bandNames: ['blue', 'green', 'red'], bandWavelengthsNm: [482, 561, 655], decodable: true, warnings: [],
    });
    expect(s.extent[0]).toBe(350000);
    expect(s.extent[1]).toBeCloseTo(5200000 - 84, 9);
    expect(s.extent[2]).toBeCloseTo(350120, 9);
    expect(s.extent[3]).toBe(5200000);
    expect(s.levels.map((l) => [l.width, l.height])).toEqual([[100, 70], [50, 35], [25, 18]]);
    expect(s.levels[0].offsets).toHaveLength(4 * 3 * 3);
  });

  it('gives each block enough to fetch and decode it alone', async () => {
    const s = await inspect(bytes);
    expect(readBand(bytes, s, 0, 2)).toEqual(Array.from(bands[2]));
  });

  it('reads only the first bytes of the file, not the image data', async () => {
    const big = writeGeoTiff({
      width: 512, height: 512, sampleType: 'uint16', bands: makeBands('uint16', 512, 512, 2),
      epsg: 32633, origin: [0, 0], pixelSize: [1, 1],
    });
    const reader = memoryReader(big);
    await inspectTiff(reader, big.length, 'big.tif');
    expect(reader.calls).toBe(1);
    expect(reader.bytesRead).toBeLessThan(big.length / 10);
  });

  it('reads strips, the last one short', async () => {
    const b = makeBands('int16', 40, 25, 2, 5);
    const stripped = writeGeoTiff({
      width: 40, height: 25, sampleType: 'int16', bands: b, epsg: 4326, origin: [9, 47], pixelSize: [0.001, 0.001],
      tileSize: 16, stripped: true, compression: 'packbits', overviewFactors: [],
    });
    const s = await inspect(stripped);
    expect(s).toMatchObject({ tiled: false, tileSize: null, epsg: 4326, crsName: 'WGS 84', compression: 'packbits', dtype: 'int16' });
    expect(s.levels[0].blockHeight).toBe(6);
    expect(blockLayout(s, 0, 4).height).toBe(1);
    expect(readBand(stripped, s, 0, 1)).toEqual(Array.from(b[1]));
  });
});

describe('inspectTiff georeferencing', () => {
  const tile = new Uint8Array(16 * 16);
  function crafted(extra: IfdEntry[]): Uint8Array {
    const entries: IfdEntry[] = [
      { tag: Tag.ImageWidth, type: FieldType.SHORT, values: [16] },
      { tag: Tag.ImageLength, type: FieldType.SHORT, values: [16] },
      { tag: Tag.BitsPerSample, type: FieldType.SHORT, values: [8] },
      { tag: Tag.RowsPerStrip, type: FieldType.SHORT, values: [16] },
      ...extra,
    ];
    return serializeTiff([{ entries, blocks: [tile], offsetsTag: Tag.StripOffsets, byteCountsTag: Tag.StripByteCounts }], [0]);
  }
  const scale: IfdEntry = { tag: Tag.ModelPixelScale, type: FieldType.DOUBLE, values: [2, 3, 0] };
  const tiepoint: IfdEntry = { tag: Tag.ModelTiepoint, type: FieldType.DOUBLE, values: [1, 2, 0, 1000, 2000, 0] };
  const keys = (rasterType: number, pcs: number): IfdEntry => ({
    tag: Tag.GeoKeyDirectory, type: FieldType.SHORT, values: [1, 1, 0, 3, 1024, 0, 1, 1, 1025, 0, 1, rasterType, 3072, 0, 1, pcs],
  });

  it('moves the origin from a tiepoint at another pixel', async () => {
    const s = await inspect(crafted([scale, tiepoint, keys(1, 32631)]));
    expect(s.origin).toEqual([998, 2006]);
    expect(s.extent).toEqual([998, 2006 - 48, 998 + 32, 2006]);
  });

  it('shifts a PixelIsPoint origin by half a pixel, as GDAL does', async () => {
    const s = await inspect(crafted([scale, tiepoint, keys(2, 32631)]));
    expect(s.origin).toEqual([997, 2007.5]);
  });

  it('reads a ModelTransformation without rotation, and refuses a rotated one to pixel space', async () => {
    const m = (b: number) => ({ tag: Tag.ModelTransformation, type: FieldType.DOUBLE, values: [2, b, 0, 100, 0, -2, 0, 200, 0, 0, 0, 0, 0, 0, 0, 1] });
    expect((await inspect(crafted([m(0), keys(1, 32631)]))).origin).toEqual([100, 200]);
    const rotated = await inspect(crafted([m(0.5), keys(1, 32631)]));
    expect(rotated.georeferenced).toBe(false);
    expect(rotated.warnings.join()).toMatch(/rotated/);
  });

  it('reports a user-defined CRS as no EPSG code, with its citation as the name', async () => {
    const ascii: IfdEntry = { tag: Tag.GeoAsciiParams, type: FieldType.ASCII, values: 'Local grid|' };
    const directory: IfdEntry = {
      tag: Tag.GeoKeyDirectory, type: FieldType.SHORT,
      values: [1, 1, 0, 3, 1024, 0, 1, 1, 1026, Tag.GeoAsciiParams, 11, 0, 3072, 0, 1, 32767],
    };
    const s = await inspect(crafted([scale, tiepoint, directory, ascii]));
    expect(s).toMatchObject({ georeferenced: true, epsg: null, crsName: 'Local grid' });
    expect(s.warnings.join()).toMatch(/no EPSG code/);
    expect(() => requireGeoreference(s)).toThrow(/no EPSG code/);
  });

  it('reads GDAL_NODATA of nan', async () => {
    const s = await inspect(crafted([{ tag: Tag.GdalNoData, type: FieldType.ASCII, values: 'nan' }]));
    expect(s.nodata).toBeNaN();
  });

  it('says when compression cannot be decoded', async () => {
    const s = await inspect(crafted([{ tag: Tag.Compression, type: FieldType.SHORT, values: [7] }]));
    expect(s).toMatchObject({ compression: 'jpeg', decodable: false });
    expect(s.warnings.join()).toMatch(/jpeg compression cannot be decoded/);
  });
});

describe('inspectTiff on bad input', () => {
  it('a truncated file: the tiles past its end', async () => {
    const e = await failure(inspect(truncatedTiff()));
    expect(e.code).toBe('truncated');
    expect(e.message).toMatch(/^scene\.tif: tile \d+ of the image lies past the end of the file .* the file is truncated$/);
  });

  it('a file cut inside its header or IFD', async () => {
    const whole = goodTiff();
    expect((await failure(inspect(whole.slice(0, 40)))).code).toBe('truncated');
    expect((await failure(inspect(whole.slice(0, 5)))).message).toMatch(/header is cut short/);
  });

  it('a declared 10^6 x 10^6 image: refused before anything of that size', async () => {
    const bytes = hugeTiff();
    expect(bytes.length).toBeLessThan(400);
    const reader = memoryReader(bytes);
    const e = await failure(inspectTiff(reader, bytes.length, 'huge.tif'));
    expect(e.code).toBe('too-large');
    expect(e.message).toBe('huge.tif: the image declares 1000000 x 1000000 pixels, past the limit of 1e+10 pixels');
    expect(reader.bytesRead).toBeLessThanOrEqual(bytes.length);
  });

  it('a file that is no TIFF', async () => {
    const e = await failure(inspect(notTiff(), 'photo.png'));
    expect(e.code).toBe('not-tiff');
    expect(e.message).toMatch(/^photo\.png: not a TIFF file \(it starts with bytes 89 50 4e 47\)$/);
    expect((await failure(inspect(new Uint8Array(0), 'empty.tif'))).message).toBe('empty.tif: not a TIFF file (only 0 bytes)');
  });

  it('a TIFF without georeferencing: a summary in pixel space and a warning', async () => {
    const s = await inspect(plainTiff(), 'plain.tif');
    expect(s).toMatchObject({
      georeferenced: false, epsg: null, crsName: null, pixelSize: [1, 1], origin: [0, 32], extent: [0, 0, 32, 32],
    });
    expect(s.warnings).toEqual(['no georeferencing (no GeoTIFF tags): the image is shown in pixel space']);
    expect(() => requireGeoreference(s)).toThrow(
      expect.objectContaining({ code: 'no-georeference', message: 'plain.tif: has no georeferencing (no tiepoint and pixel scale, nor a transformation)' }),
    );
  });

  it('an IFD chain that loops back on itself (26 bytes)', async () => {
    const bytes = loopTiff();
    expect(bytes.length).toBe(26);
    const e = await failure(inspect(bytes));
    expect(e.code).toBe('ifd-loop');
    expect(e.message).toBe('scene.tif: the IFD chain loops back to offset 8 (a damaged or hostile file)');
  });

  it('an IFD or a first-IFD offset past the end of the file', async () => {
    const bytes = new Uint8Array([0x49, 0x49, 42, 0, 0x00, 0x10, 0, 0, 0, 0]);
    const e = await failure(inspect(bytes));
    expect(e.code).toBe('truncated');
    expect(e.message).toMatch(/image directory 0 \(IFD at offset 4096\) lies past the end of the file/);
    const none = new Uint8Array([0x49, 0x49, 42, 0, 0, 0, 0, 0]);
    expect((await failure(inspect(none))).message).toBe('scene.tif: the TIFF header points to no image directory');
    const bigCut = new Uint8Array([0x49, 0x49, 43, 0, 8, 0, 0, 0, 16]);
    expect((await failure(inspect(bigCut))).code).toBe('truncated');
  });

  it('fewer tile offsets than the image size needs', async () => {
    const entries: IfdEntry[] = [
      { tag: Tag.ImageWidth, type: FieldType.LONG, values: [64] },
      { tag: Tag.ImageLength, type: FieldType.LONG, values: [64] },
      { tag: Tag.BitsPerSample, type: FieldType.SHORT, values: [8] },
      { tag: Tag.TileWidth, type: FieldType.LONG, values: [16] },
      { tag: Tag.TileLength, type: FieldType.LONG, values: [16] },
    ];
    const bytes = serializeTiff([{ entries, blocks: [new Uint8Array(256)], offsetsTag: Tag.TileOffsets, byteCountsTag: Tag.TileByteCounts }], [0]);
    const e = await failure(inspect(bytes));
    expect(e.code).toBe('bad-tile');
    expect(e.message).toBe('scene.tif: the image lists 1 tiles but its size needs 16');
  });

  it('too many IFDs', async () => {
    const e = await failure(inspect(longChainTiff(300)));
    expect(e.code).toBe('too-many-ifds');
    expect(e.message).toMatch(/more than 256 image directories/);
    expect((await failure(inspect(longChainTiff(10), 'x.tif', { maxIfds: 5 }))).code).toBe('too-many-ifds');
  });

  it('a tag value past the tag limit', async () => {
    const e = await failure(inspect(goodTiff(), 'scene.tif', { maxTagBytes: 16 }));
    expect(e.code).toBe('too-large');
  });

  it('a tile that inflates far past its size: inspect passes, decodeTile refuses', async () => {
    const bytes = bombTiff(1024);
    expect(bytes.length).toBeLessThan(1.2e6);
    const s = await inspect(bytes, 'bomb.tif');
    const level = s.levels[0];
    const before = process.memoryUsage().arrayBuffers;
    let error: unknown;
    try {
      decodeTile(bytes.subarray(level.offsets[0], level.offsets[0] + level.byteCounts[0]), blockLayout(s, 0, 0));
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(TiffError);
    expect((error as TiffError).code).toBe('bad-tile');
    expect((error as TiffError).message).toBe('bomb.tif: tile 0 of the full image inflates past its declared 4096 bytes');
    // One step of at most ~33 MB of output (and the garbage of growing it), not the gigabytes.
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(256 * 1024 * 1024);
  });
});
