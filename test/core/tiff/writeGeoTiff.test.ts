import { fromArrayBuffer } from 'geotiff';
import { describe, expect, it } from 'vitest';
import { averageOverview } from '../../../src/core/tiff/overview.ts';
import { writeGeoTiff, type SampleType, type WriteGeoTiffOptions } from '../../../src/core/tiff/writeGeoTiff.ts';
import { arrayBufferOf, makeBands } from './helpers.ts';

// geotiff.js (npm geotiff, an independent reader) reads back what the writer wrote.

const sampleTypes: SampleType[] = ['uint8', 'uint16', 'int16', 'float32'];
const compressions = ['deflate', 'none', 'lzw', 'packbits'] as const;

function options(type: SampleType, extra: Partial<WriteGeoTiffOptions> = {}): WriteGeoTiffOptions {
  const width = 70;
  const height = 45;
  return {
    width, height, sampleType: type, bands: makeBands(type, width, height, 3, 7),
    epsg: 32632, origin: [612000, 5143000], pixelSize: [0.5, 0.5], tileSize: 16,
    overviewFactors: [2, 4], ...extra,
  };
}

async function readAll(bytes: Uint8Array) {
  const tiff = await fromArrayBuffer(arrayBufferOf(bytes));
  const count = await tiff.getImageCount();
  const images = [];
  for (let i = 0; i < count; i++) images.push(await tiff.getImage(i));
  return images;
}

describe('writeGeoTiff read back by geotiff.js', () => {
  for (const type of sampleTypes) {
    for (const compression of compressions) {
      for (const predictor of [true, false]) {
        it(`${type}, ${compression}${predictor ? ' with predictor' : ''}: every band of every level`, async () => {
          const o = options(type, { compression, predictor });
          const images = await readAll(writeGeoTiff(o));
          expect(images).toHaveLength(3);
          const sizes = images.map((im) => [im.getWidth(), im.getHeight()]);
          expect(sizes).toEqual([[70, 45], [35, 23], [18, 12]]);
          for (const [level, image] of images.entries()) {
            expect(image.getSamplesPerPixel()).toBe(3);
            expect(image.getTileWidth()).toBe(16);
            const rasters = (await image.readRasters()) as unknown as ArrayLike<number>[];
            for (let b = 0; b < 3; b++) {
              const expected = level === 0 ? o.bands[b] : averageOverview(o.bands[b], 70, 45, level === 1 ? 2 : 4);
              expect(Array.from(rasters[b])).toEqual(Array.from(expected));
            }
          }
        });
      }
    }
  }

  it('writes the georeferencing: EPSG code, origin, pixel size, area pixels', async () => {
    const [image] = await readAll(writeGeoTiff(options('uint16')));
    expect(image.getGeoKeys()?.ProjectedCSTypeGeoKey).toBe(32632);
    expect(image.getGeoKeys()?.GTModelTypeGeoKey).toBe(1);
    expect(image.getOrigin()).toEqual([612000, 5143000, 0]);
    expect(image.getResolution()).toEqual([0.5, -0.5, 0]);
    expect(image.pixelIsArea()).toBe(true);
    expect(image.getBoundingBox()).toEqual([612000, 5143000 - 45 * 0.5, 612000 + 70 * 0.5, 5143000]);
  });

  it('writes a geographic CRS as GeographicTypeGeoKey', async () => {
    const [image] = await readAll(writeGeoTiff({ ...options('uint8'), epsg: 4326, origin: [10.5, 46.2], pixelSize: [1e-5, 1e-5] }));
    expect(image.getGeoKeys()?.GTModelTypeGeoKey).toBe(2);
    expect(image.getGeoKeys()?.GeographicTypeGeoKey).toBe(4326);
  });

  it('writes a user-defined projected CRS as ProjectedCSTypeGeoKey 32767 with its citation (GeoTIFF 1.1, OGC 19-008r4: 32767 is user-defined)', async () => {
    const [image] = await readAll(writeGeoTiff({ ...options('uint8'), epsg: null, crsCitation: 'Local mine grid' }));
    expect(image.getGeoKeys()?.GTModelTypeGeoKey).toBe(1);
    expect(image.getGeoKeys()?.ProjectedCSTypeGeoKey).toBe(32767);
    expect(image.getGeoKeys()?.GTCitationGeoKey).toBe('Local mine grid');
    expect(image.getOrigin()).toEqual([612000, 5143000, 0]);
  });

  it('writes band-separate planes, deflate with predictor by default, and overview IFDs as reduced resolution', async () => {
    const images = await readAll(writeGeoTiff(options('uint16')));
    const main = images[0].getFileDirectory();
    expect(main.getValue('PlanarConfiguration')).toBe(2);
    expect(main.getValue('Compression')).toBe(8);
    expect(await main.loadValue('Predictor')).toBe(2);
    expect(images[1].getFileDirectory().getValue('NewSubfileType')).toBe(1);
    const [float] = await readAll(writeGeoTiff(options('float32')));
    expect(await float.getFileDirectory().loadValue('Predictor')).toBe(3);
  });

  it('writes no-data, band names and wavelengths in the GDAL tags', async () => {
    const o = options('uint16', { noData: 0, bandNames: ['blue', 'green & <red>', 'nir'], bandWavelengthsNm: [480, 545, 832] });
    const [image] = await readAll(writeGeoTiff(o));
    expect(image.getGDALNoData()).toBe(0);
    expect(await image.getGDALMetadata(1)).toMatchObject({ wavelength_nm: '545' });
  });

  it('writes strips when asked, the last strip holding only the rows left', async () => {
    const o = options('int16', { stripped: true, overviewFactors: [3] });
    const images = await readAll(writeGeoTiff(o));
    expect(images[0].isTiled).toBe(false);
    expect(images[0].getFileDirectory().getValue('RowsPerStrip')).toBe(3); // 16 * 16 / 70
    const rasters = (await images[0].readRasters()) as unknown as ArrayLike<number>[];
    expect(Array.from(rasters[2])).toEqual(Array.from(o.bands[2]));
    const overview = (await images[1].readRasters()) as unknown as ArrayLike<number>[];
    expect(Array.from(overview[0])).toEqual(Array.from(averageOverview(o.bands[0], 70, 45, 3)));
  });

  it('adds overviews by default until one fits a single tile', async () => {
    const width = 600;
    const height = 260;
    const bands = makeBands('uint8', width, height, 1);
    const images = await readAll(writeGeoTiff({ width, height, sampleType: 'uint8', bands, epsg: 32632, origin: [0, 0], pixelSize: [1, 1] }));
    expect(images.map((im) => im.getWidth())).toEqual([600, 300, 150]);
    const none = await readAll(writeGeoTiff({ width, height, sampleType: 'uint8', bands, epsg: 32632, origin: [0, 0], pixelSize: [1, 1], overviewFactors: [] }));
    expect(none).toHaveLength(1);
  });
});

describe('overview averaging', () => {
  it('is the mean of each block, ignoring no-data, and no-data where all of a block is', () => {
    const band = new Uint16Array([
      1, 3, 0, 0, 5,
      5, 7, 0, 0, 6,
      0, 2, 9, 9, 0,
    ]);
    expect(Array.from(averageOverview(band, 5, 3, 2, 0))).toEqual([4, 0, 6, 2, 9, 0]);
    expect(Array.from(averageOverview(band, 5, 3, 2))).toEqual([4, 0, 6, 1, 9, 0]); // 5.5 rounds up; 0 counts here
  });

  it('skips NaN in floats', () => {
    const band = new Float32Array([NaN, 2, 4, NaN]);
    expect(Array.from(averageOverview(band, 2, 2, 2))).toEqual([3]);
    expect(Array.from(averageOverview(new Float32Array([NaN]), 1, 1, 2))).toEqual([NaN]);
  });
});

describe('writeGeoTiff validation', () => {
  const base = options('uint16');
  const cases: [string, Partial<WriteGeoTiffOptions>, RegExp][] = [
    ['a zero width', { width: 0 }, /width and height/],
    ['a band of the wrong type', { bands: [new Uint8Array(70 * 45)] }, /not a Uint16Array/],
    ['a band of the wrong length', { bands: [new Uint16Array(10)] }, /holds 10 samples/],
    ['no bands', { bands: [] }, /at least one band/],
    ['a tile size not a multiple of 16', { tileSize: 20 }, /multiple of 16/],
    ['a negative pixel size', { pixelSize: [0.5, -0.5] }, /pixelSize/],
    ['a no-data value out of range', { noData: 70000 }, /does not fit uint16/],
    ['decreasing overview factors', { overviewFactors: [4, 2] }, /increase/],
    ['band names for the wrong band count', { bandNames: ['a'] }, /1 entries for 3 bands/],
    ['a non-EPSG code', { epsg: 12.5 }, /EPSG code/],
  ];
  for (const [what, change, message] of cases) {
    it(`refuses ${what}`, () => {
      expect(() => writeGeoTiff({ ...base, ...change })).toThrow(message);
    });
  }
});
