import { deflateBlock } from './codecs/deflate.ts';
import { lzwEncode } from './codecs/lzw.ts';
import { packBitsEncode } from './codecs/packbits.ts';
import { floatEncode, horizontalEncode } from './codecs/predictor.ts';
import { buildGdalMetadata } from './gdalMetadata.ts';
import { buildGeoKeys } from './geoKeys.ts';
import { averageOverview, overviewSize, type BandArray } from './overview.ts';
import { FieldType, Tag, hostLittleEndian } from './tags.ts';
import { serializeTiff, type IfdEntry, type ImageToWrite } from './tiffSerializer.ts';

export type SampleType = 'uint8' | 'uint16' | 'int16' | 'float32';
export type { BandArray };

export interface WriteGeoTiffOptions {
  width: number;
  height: number;
  sampleType: SampleType;
  /** Band-sequential: one row-major array of width * height samples per band. */
  bands: BandArray[];
  /**
   * Projected or geographic EPSG code, written as GeoKeys; null for a user-defined
   * projected CRS (ProjectedCSType 32767), named only by `crsCitation`.
   */
  epsg: number | null;
  /** The citation of a user-defined CRS (GTCitationGeoKey); ignored with an EPSG code. */
  crsCitation?: string;
  /** x, y of the top-left corner of the top-left pixel. */
  origin: [number, number];
  /** Positive x and y pixel sizes (y runs down the image). */
  pixelSize: [number, number];
  /** Tile width and height, a multiple of 16; default 256. */
  tileSize?: number;
  /** Default 'deflate' (a zlib stream, TIFF compression 8). */
  compression?: 'deflate' | 'none' | 'lzw' | 'packbits';
  /** zlib level 1-9 for deflate; default 3 (fflate at 6 is twice as slow for ~20% smaller files). */
  deflateLevel?: number;
  /** Default true: horizontal differencing (2) for integers, floating point (3) for float32. */
  predictor?: boolean;
  /** Default [2, 4, 8, ...] until an overview fits one tile; [] for none. */
  overviewFactors?: number[];
  /** Written as GDAL_NODATA; overviews average the other pixels. */
  noData?: number;
  /** Band descriptions, in GDAL_METADATA (tag 42112). */
  bandNames?: string[];
  /** Centre wavelengths in nm, in GDAL_METADATA as the band item "wavelength_nm". */
  bandWavelengthsNm?: number[];
  /** Write strips instead of tiles (for reader tests); default false. */
  stripped?: boolean;
}

const arrayTypes: Record<SampleType, { ctor: new (n: number) => BandArray; bits: number; format: number }> = {
  uint8: { ctor: Uint8Array, bits: 8, format: 1 },
  uint16: { ctor: Uint16Array, bits: 16, format: 1 },
  int16: { ctor: Int16Array, bits: 16, format: 2 },
  float32: { ctor: Float32Array, bits: 32, format: 3 },
};

const compressionCodes = { none: 1, lzw: 5, deflate: 8, packbits: 32773 } as const;

const intRanges: Record<Exclude<SampleType, 'float32'>, [number, number]> = {
  uint8: [0, 255],
  uint16: [0, 65535],
  int16: [-32768, 32767],
};

/**
 * Writes a GeoTIFF: classic little-endian TIFF, band-separate (PlanarConfiguration 2, so
 * a view reads only the bands it needs), tiled (or stripped), with overviews as
 * reduced-resolution IFDs chained after the main one as GDAL writes internal overviews.
 * All IFDs come first in the file, then the blocks from the smallest overview up.
 */
export function writeGeoTiff(options: WriteGeoTiffOptions): Uint8Array {
  const o = validate(options);
  const levels: { width: number; height: number; bands: BandArray[] }[] = [
    { width: o.width, height: o.height, bands: o.bands },
  ];
  for (const factor of o.overviewFactors) {
    const [w, h] = overviewSize(o.width, o.height, factor);
    levels.push({ width: w, height: h, bands: o.bands.map((b) => averageOverview(b, o.width, o.height, factor, o.noData)) });
  }

  const { bits, format } = arrayTypes[o.sampleType];
  const bandCount = o.bands.length;
  const planar = bandCount > 1 ? 2 : 1;
  const compression = compressionCodes[o.compression];
  const predictor = !o.predictor || compression === 1 ? 1 : o.sampleType === 'float32' ? 3 : 2;
  const geo = buildGeoKeys(o.epsg, o.crsCitation);
  const metadata = buildGdalMetadata(o.bandNames, o.bandWavelengthsNm);
  const noDataText = o.noData === undefined ? null : Number.isNaN(o.noData) ? 'nan' : String(o.noData);

  const images: ImageToWrite[] = levels.map((level, index) => {
    const blockHeight = o.stripped ? stripRows(level.width, level.height, o.tileSize) : o.tileSize;
    const blockWidth = o.stripped ? level.width : o.tileSize;
    const blocks: Uint8Array[] = [];
    for (const band of level.bands) {
      for (let y = 0; y < level.height; y += blockHeight) {
        for (let x = 0; x < level.width; x += blockWidth) {
          // A strip's last block holds only the rows left; tiles are always full size.
          const rows = o.stripped ? Math.min(blockHeight, level.height - y) : blockHeight;
          blocks.push(encodeBlock(band, level.width, level.height, x, y, blockWidth, rows, o, predictor));
        }
      }
    }
    const entries: IfdEntry[] = [
      { tag: Tag.NewSubfileType, type: FieldType.LONG, values: [index === 0 ? 0 : 1] },
      { tag: Tag.ImageWidth, type: FieldType.LONG, values: [level.width] },
      { tag: Tag.ImageLength, type: FieldType.LONG, values: [level.height] },
      { tag: Tag.BitsPerSample, type: FieldType.SHORT, values: new Array(bandCount).fill(bits) },
      { tag: Tag.Compression, type: FieldType.SHORT, values: [compression] },
      { tag: Tag.Photometric, type: FieldType.SHORT, values: [1] }, // min-is-black
      { tag: Tag.SamplesPerPixel, type: FieldType.SHORT, values: [bandCount] },
      { tag: Tag.PlanarConfiguration, type: FieldType.SHORT, values: [planar] },
      { tag: Tag.SampleFormat, type: FieldType.SHORT, values: new Array(bandCount).fill(format) },
    ];
    if (o.stripped) entries.push({ tag: Tag.RowsPerStrip, type: FieldType.LONG, values: [blockHeight] });
    else {
      entries.push({ tag: Tag.TileWidth, type: FieldType.LONG, values: [blockWidth] });
      entries.push({ tag: Tag.TileLength, type: FieldType.LONG, values: [blockHeight] });
    }
    if (predictor !== 1) entries.push({ tag: Tag.Predictor, type: FieldType.SHORT, values: [predictor] });
    if (bandCount > 1) {
      entries.push({ tag: Tag.ExtraSamples, type: FieldType.SHORT, values: new Array(bandCount - 1).fill(0) });
    }
    if (index === 0) {
      entries.push({ tag: Tag.ModelPixelScale, type: FieldType.DOUBLE, values: [o.pixelSize[0], o.pixelSize[1], 0] });
      entries.push({ tag: Tag.ModelTiepoint, type: FieldType.DOUBLE, values: [0, 0, 0, o.origin[0], o.origin[1], 0] });
      entries.push({ tag: Tag.GeoKeyDirectory, type: FieldType.SHORT, values: geo.directory });
      if (geo.ascii) entries.push({ tag: Tag.GeoAsciiParams, type: FieldType.ASCII, values: geo.ascii });
      if (metadata) entries.push({ tag: Tag.GdalMetadata, type: FieldType.ASCII, values: metadata });
    }
    if (noDataText !== null) entries.push({ tag: Tag.GdalNoData, type: FieldType.ASCII, values: noDataText });
    return {
      entries,
      blocks,
      offsetsTag: o.stripped ? Tag.StripOffsets : Tag.TileOffsets,
      byteCountsTag: o.stripped ? Tag.StripByteCounts : Tag.TileByteCounts,
    };
  });

  // Smallest overview's blocks first, full resolution last (as cloud-optimised files do).
  const order = images.map((_, i) => images.length - 1 - i);
  return serializeTiff(images, order);
}

type Resolved = Required<Omit<WriteGeoTiffOptions, 'noData' | 'bandNames' | 'bandWavelengthsNm' | 'crsCitation'>> &
  Pick<WriteGeoTiffOptions, 'noData' | 'bandNames' | 'bandWavelengthsNm' | 'crsCitation'>;

function validate(options: WriteGeoTiffOptions): Resolved {
  const { width, height, sampleType, bands, epsg, origin, pixelSize } = options;
  const fail = (message: string): never => {
    throw new RangeError(`writeGeoTiff: ${message}`);
  };
  if (!Number.isInteger(width) || width < 1 || !Number.isInteger(height) || height < 1) {
    fail(`width and height must be positive integers, got ${width} x ${height}`);
  }
  const type = arrayTypes[sampleType] ?? fail(`unknown sample type '${sampleType}'`);
  if (!Array.isArray(bands) || bands.length < 1) fail('at least one band is needed');
  if (bands.length > 65535) fail(`at most 65535 bands, got ${bands.length}`);
  bands.forEach((band, i) => {
    if (!(band instanceof type.ctor)) fail(`band ${i + 1} is not a ${type.ctor.name} for sample type ${sampleType}`);
    if (band.length !== width * height) fail(`band ${i + 1} holds ${band.length} samples, expected ${width * height}`);
  });
  if (epsg !== null && (!Number.isInteger(epsg) || epsg < 1024 || epsg > 32766)) fail(`epsg must be an EPSG code or null, got ${epsg}`);
  if (!origin?.every(Number.isFinite) || origin.length !== 2) fail('origin must be two finite numbers');
  if (!pixelSize?.every((v) => Number.isFinite(v) && v > 0) || pixelSize.length !== 2) {
    fail('pixelSize must be two positive numbers');
  }
  const tileSize = options.tileSize ?? 256;
  if (!Number.isInteger(tileSize) || tileSize < 16 || tileSize % 16 !== 0) {
    fail(`tileSize must be a multiple of 16, got ${tileSize}`);
  }
  const compression = options.compression ?? 'deflate';
  const deflateLevel = options.deflateLevel ?? 3;
  if (!Number.isInteger(deflateLevel) || deflateLevel < 1 || deflateLevel > 9) fail(`deflateLevel must be 1-9, got ${deflateLevel}`);
  if (!(compression in compressionCodes)) fail(`unknown compression '${compression}'`);
  let overviewFactors = options.overviewFactors;
  if (overviewFactors === undefined) {
    overviewFactors = [];
    let size = [width, height];
    for (let f = 2; size[0] > tileSize || size[1] > tileSize; f *= 2) {
      overviewFactors.push(f);
      size = overviewSize(width, height, f);
    }
  }
  overviewFactors.forEach((f, i) => {
    if (!Number.isInteger(f) || f < 2) fail(`overview factors must be integers of 2 or more, got ${f}`);
    if (i > 0 && f <= overviewFactors[i - 1]) fail('overview factors must increase');
  });
  const { noData } = options;
  if (noData !== undefined) {
    if (sampleType === 'float32') {
      if (!Number.isNaN(noData) && !Number.isFinite(noData)) fail(`noData must be finite or NaN, got ${noData}`);
    } else {
      const [lo, hi] = intRanges[sampleType];
      if (!Number.isInteger(noData) || noData < lo || noData > hi) fail(`noData ${noData} does not fit ${sampleType}`);
    }
  }
  for (const [name, list] of [['bandNames', options.bandNames], ['bandWavelengthsNm', options.bandWavelengthsNm]] as const) {
    if (list !== undefined && list.length !== bands.length) fail(`${name} has ${list.length} entries for ${bands.length} bands`);
  }
  return {
    ...options,
    tileSize,
    compression,
    predictor: options.predictor ?? true,
    deflateLevel,
    overviewFactors,
    stripped: options.stripped ?? false,
  };
}

/** Rows per strip: about one tile's worth of pixels. */
function stripRows(width: number, height: number, tileSize: number): number {
  return Math.max(1, Math.min(height, Math.floor((tileSize * tileSize) / width)));
}

/** Cuts one block out of a band (padding past the edge), predicts and compresses it. */
function encodeBlock(
  band: BandArray, width: number, height: number, x0: number, y0: number, blockWidth: number, rows: number,
  o: Resolved, predictor: number,
): Uint8Array {
  const Ctor = arrayTypes[o.sampleType].ctor;
  const block = new Ctor(blockWidth * rows);
  const pad = o.noData ?? 0;
  const cols = Math.min(blockWidth, width - x0);
  const validRows = Math.min(rows, height - y0);
  if (pad !== 0 && (cols < blockWidth || validRows < rows)) block.fill(pad);
  for (let r = 0; r < validRows; r++) {
    const start = (y0 + r) * width + x0;
    block.set(band.subarray(start, start + cols), r * blockWidth);
  }
  let bytes = new Uint8Array(block.buffer, 0, block.byteLength);
  if (!hostLittleEndian) bytes = swapped(bytes, block.BYTES_PER_ELEMENT);
  if (predictor === 2) {
    horizontalEncode(block as Uint8Array | Uint16Array | Int16Array, blockWidth, rows, 1);
    if (!hostLittleEndian) bytes = swapped(new Uint8Array(block.buffer), block.BYTES_PER_ELEMENT);
  } else if (predictor === 3) {
    bytes = floatEncode(bytes, blockWidth, rows, 1, 4);
  }
  switch (o.compression) {
    case 'none':
      return bytes;
    case 'deflate':
      return deflateBlock(bytes, o.deflateLevel as 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8 | 9);
    case 'lzw':
      return lzwEncode(bytes);
    case 'packbits':
      return packBitsEncode(bytes, blockWidth * block.BYTES_PER_ELEMENT);
  }
}

function swapped(bytes: Uint8Array, size: number): Uint8Array {
  const out = new Uint8Array(bytes.length);
  for (let i = 0; i < bytes.length; i += size) for (let k = 0; k < size; k++) out[i + k] = bytes[i + size - 1 - k];
  return out;
}
