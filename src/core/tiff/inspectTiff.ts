import { crsName as knownCrsName } from '../crsNames.ts';
import { ByteSource, type ReadRange } from './byteSource.ts';
import { TiffError } from './errors.ts';
import { parseGdalMetadata, WAVELENGTH_ITEM } from './gdalMetadata.ts';
import { parseGeoKeys } from './geoKeys.ts';
import { IfdReader, readHeader, type RawIfd } from './ifd.ts';
import { bytesPerSample, compressionName, decodableCompressions, dtypeOf, Tag, type Dtype } from './tags.ts';

export type { ReadRange };

export interface TiffLimits {
  /** Most image directories followed; default 256. */
  maxIfds?: number;
  /** Most pixels (width x height) of any image; default 10^10. */
  maxPixels?: number;
  /** Most bytes of any one tag value read; default 64 MiB. */
  maxTagBytes?: number;
  /** Most bytes of one decoded tile or strip, and of one compressed one; default 256 MiB. */
  maxBlockBytes?: number;
}

export const defaultLimits: Required<TiffLimits> = {
  maxIfds: 256,
  maxPixels: 1e10,
  maxTagBytes: 64 * 1024 * 1024,
  maxBlockBytes: 256 * 1024 * 1024,
};

/** One resolution level: the full image (index 0) or an overview. */
export interface TiffLevel {
  width: number;
  height: number;
  tiled: boolean;
  /** Tile size, or (image width, rows per strip) for strips. */
  blockWidth: number;
  blockHeight: number;
  blocksAcross: number;
  blocksDown: number;
  /** Offset and byte count of each block; band-separate files hold all of band 1's first. */
  offsets: Float64Array;
  byteCounts: Float64Array;
  compression: number;
  predictor: number;
  /** Where this level's IFD is, and its position in the chain. */
  ifdOffset: number;
  ifdIndex: number;
}

export interface TiffSummary {
  fileName: string;
  fileSize: number;
  width: number;
  height: number;
  bands: number;
  dtype: Dtype;
  bitsPerSample: number;
  /** TIFF SampleFormat: 1 unsigned integer, 2 signed integer, 3 floating point. */
  sampleFormat: number;
  /** 1 pixel-interleaved, 2 band-separate. */
  planar: 1 | 2;
  photometric: number;
  littleEndian: boolean;
  bigTiff: boolean;
  /** False when the file has no usable geotransform: then the fields below are pixel space. */
  georeferenced: boolean;
  epsg: number | null;
  crsName: string | null;
  /** Positive sizes; y runs down the image. Pixel space: [1, 1]. */
  pixelSize: [number, number];
  /** Top-left corner of the top-left pixel. Pixel space: [0, height], so y = height - row. */
  origin: [number, number];
  /** [minx, miny, maxx, maxy]. Pixel space: [0, 0, width, height]. */
  extent: [number, number, number, number];
  tiled: boolean;
  tileSize: [number, number] | null;
  /** Compression name of the full image ('none', 'deflate', 'lzw', 'packbits', 'jpeg', ...). */
  compression: string;
  compressionCode: number;
  predictor: number;
  overviews: number;
  /** levels[0] is the full image, then the overviews from largest to smallest. */
  levels: TiffLevel[];
  nodata: number | null;
  bandNames: (string | null)[] | null;
  bandWavelengthsNm: (number | null)[] | null;
  /** Dataset-level GDAL metadata items. */
  metadata: Record<string, string>;
  /** Whether decodeTile handles this compression, predictor and data type. */
  decodable: boolean;
  /** Things a user should know that do not stop the file being read. */
  warnings: string[];
}

/**
 * Reads a TIFF's header and IFDs through a range reader and summarises it, without
 * reading any image data. Every offset and count is checked against the file size, the
 * IFD chain is followed with a visited set and a limit, and declared sizes past the
 * limits are refused before anything of that size is allocated. Throws TiffError.
 */
export async function inspectTiff(
  read: ReadRange, fileSize: number, fileName: string, limits?: TiffLimits,
): Promise<TiffSummary> {
  const lim = { ...defaultLimits, ...limits };
  const source = new ByteSource(read, fileSize, fileName);
  await source.prefetch(64 * 1024);
  const header = await readHeader(source);
  const reader = new IfdReader(source, header, lim.maxTagBytes);
  const ifds = await reader.walk(lim.maxIfds);
  const warnings: string[] = [];

  const main = await readImage(reader, ifds[0], 0, lim);
  const levels: TiffLevel[] = [main.level];
  let masks = 0;
  let pages = 0;
  for (let i = 1; i < ifds.length; i++) {
    const subfile = await optionalNumber(reader, ifds[i], Tag.NewSubfileType, 0);
    if (subfile & 4) {
      masks++;
      continue;
    }
    if (!(subfile & 1)) {
      pages++;
      continue;
    }
    const image = await readImage(reader, ifds[i], i, lim);
    const same = image.bands === main.bands && image.dtype === main.dtype && image.planar === main.planar;
    if (!same || image.level.width > main.level.width || image.level.height > main.level.height) {
      warnings.push(`the reduced-resolution image in IFD ${i} does not match the main image; it is ignored`);
      continue;
    }
    levels.push(image.level);
  }
  levels.sort((a, b) => b.width - a.width || a.ifdIndex - b.ifdIndex);
  if (masks > 0) warnings.push(`${masks} transparency mask image(s) ignored`);
  if (pages > 0) warnings.push(`${pages} further full-resolution page(s) ignored; only the first image is read`);

  const geo = await readGeoreference(reader, ifds[0], main.level.width, main.level.height, warnings);
  const nodata = await readNoData(reader, ifds[0], warnings);
  const meta = await readMetadata(reader, ifds[0], main.bands);

  const decodable =
    decodableCompressions.has(main.level.compression) &&
    [1, 2, 3].includes(main.level.predictor) &&
    !(main.level.predictor === 3 && !main.dtype.startsWith('float')) &&
    !(main.level.predictor === 2 && main.dtype === 'float64');
  if (!decodableCompressions.has(main.level.compression)) {
    warnings.push(`${compressionName(main.level.compression)} compression cannot be decoded here; the image cannot be shown`);
  } else if (!decodable) {
    warnings.push(`predictor ${main.level.predictor} on ${main.dtype} samples cannot be decoded here`);
  }
  if (main.photometric === 3) warnings.push('the palette (colour map) is ignored; index values are shown');

  const tiled = main.level.tiled;
  return {
    fileName,
    fileSize,
    width: main.level.width,
    height: main.level.height,
    bands: main.bands,
    dtype: main.dtype,
    bitsPerSample: main.bitsPerSample,
    sampleFormat: main.sampleFormat,
    planar: main.planar,
    photometric: main.photometric,
    littleEndian: header.littleEndian,
    bigTiff: header.bigTiff,
    ...geo,
    tiled,
    tileSize: tiled ? [main.level.blockWidth, main.level.blockHeight] : null,
    compression: compressionName(main.level.compression),
    compressionCode: main.level.compression,
    predictor: main.level.predictor,
    overviews: levels.length - 1,
    levels,
    nodata,
    ...meta,
    decodable,
    warnings,
  };
}

/** Throws 'no-georeference' unless the summary has a geotransform and an EPSG code. */
export function requireGeoreference(summary: TiffSummary): void {
  if (!summary.georeferenced) {
    throw new TiffError('no-georeference', summary.fileName, 'has no georeferencing (no tiepoint and pixel scale, nor a transformation)');
  }
  if (summary.epsg === null) {
    throw new TiffError('no-georeference', summary.fileName, 'has a geotransform but no EPSG code for its CRS');
  }
}

interface ImageInfo {
  level: TiffLevel;
  bands: number;
  dtype: Dtype;
  bitsPerSample: number;
  sampleFormat: number;
  planar: 1 | 2;
  photometric: number;
}

async function optionalNumber(reader: IfdReader, ifd: RawIfd, tag: number, fallback: number): Promise<number> {
  const entry = ifd.entries.get(tag);
  if (!entry || entry.count === 0) return fallback;
  return (await reader.numbers(entry, `tag ${tag}`, 1))[0];
}

async function readImage(reader: IfdReader, ifd: RawIfd, index: number, lim: Required<TiffLimits>): Promise<ImageInfo> {
  const name = reader.fileName;
  const where = index === 0 ? 'the image' : `the image in IFD ${index}`;
  const width = await optionalNumber(reader, ifd, Tag.ImageWidth, 0);
  const height = await optionalNumber(reader, ifd, Tag.ImageLength, 0);
  if (!(width >= 1) || !(height >= 1) || !Number.isInteger(width) || !Number.isInteger(height)) {
    throw new TiffError('not-tiff', name, `${where} declares no usable size (${width} x ${height}); the file is damaged or not an image`);
  }
  if (width * height > lim.maxPixels) {
    throw new TiffError(
      'too-large', name,
      `${where} declares ${width} x ${height} pixels, past the limit of ${lim.maxPixels.toExponential(0)} pixels`,
    );
  }
  const bands = await optionalNumber(reader, ifd, Tag.SamplesPerPixel, 1);
  if (!(bands >= 1) || bands > 65535) throw new TiffError('unsupported', name, `${where} declares ${bands} samples per pixel`);
  const bitsEntry = ifd.entries.get(Tag.BitsPerSample);
  const bits = bitsEntry ? Array.from(await reader.numbers(bitsEntry, 'BitsPerSample', bands)) : [1];
  const formatEntry = ifd.entries.get(Tag.SampleFormat);
  const formats = formatEntry ? Array.from(await reader.numbers(formatEntry, 'SampleFormat', bands)) : [1];
  if (new Set(bits).size > 1 || new Set(formats).size > 1) {
    throw new TiffError('unsupported', name, `${where} mixes sample types across bands (bits ${bits.join(', ')})`);
  }
  const bitsPerSample = bits[0];
  const sampleFormat = formats[0];
  const dtype = dtypeOf(bitsPerSample, sampleFormat);
  if (!dtype) {
    const kind = sampleFormat === 3 ? 'floating-point' : sampleFormat === 2 ? 'signed' : 'unsigned';
    throw new TiffError('unsupported', name, `${bitsPerSample}-bit ${kind} samples are not supported`);
  }
  const planarValue = await optionalNumber(reader, ifd, Tag.PlanarConfiguration, 1);
  const planar: 1 | 2 = planarValue === 2 && bands > 1 ? 2 : 1;
  const compression = await optionalNumber(reader, ifd, Tag.Compression, 1);
  const predictor = await optionalNumber(reader, ifd, Tag.Predictor, 1);
  const photometric = await optionalNumber(reader, ifd, Tag.Photometric, 1);

  // Block layout: tiles, or strips of RowsPerStrip rows (default: one strip).
  const tiled = ifd.entries.has(Tag.TileWidth) || ifd.entries.has(Tag.TileOffsets);
  let blockWidth: number;
  let blockHeight: number;
  if (tiled) {
    blockWidth = await optionalNumber(reader, ifd, Tag.TileWidth, 0);
    blockHeight = await optionalNumber(reader, ifd, Tag.TileLength, 0);
  } else {
    blockWidth = width;
    blockHeight = Math.min(height, await optionalNumber(reader, ifd, Tag.RowsPerStrip, height));
  }
  if (!(blockWidth >= 1) || !(blockHeight >= 1)) {
    throw new TiffError('bad-tile', name, `${where} declares an unusable ${tiled ? 'tile' : 'strip'} size (${blockWidth} x ${blockHeight})`);
  }
  const blockSamples = planar === 2 ? 1 : bands;
  const blockBytes = blockWidth * blockHeight * blockSamples * bytesPerSample(dtype);
  if (blockBytes > lim.maxBlockBytes) {
    throw new TiffError(
      'too-large', name,
      `${where} declares ${tiled ? 'tiles' : 'strips'} of ${blockWidth} x ${blockHeight} pixels (${blockBytes} bytes), past the limit of ${lim.maxBlockBytes} bytes`,
    );
  }
  const blocksAcross = Math.ceil(width / blockWidth);
  const blocksDown = Math.ceil(height / blockHeight);
  const needed = blocksAcross * blocksDown * (planar === 2 ? bands : 1);

  const offsetsEntry = ifd.entries.get(tiled ? Tag.TileOffsets : Tag.StripOffsets);
  const countsEntry = ifd.entries.get(tiled ? Tag.TileByteCounts : Tag.StripByteCounts);
  const kind = tiled ? 'tile' : 'strip';
  if (!offsetsEntry || !countsEntry) {
    throw new TiffError('bad-tile', name, `${where} has no ${kind} offsets or byte counts`);
  }
  if (offsetsEntry.count < needed || countsEntry.count < needed) {
    throw new TiffError(
      'bad-tile', name,
      `${where} lists ${Math.min(offsetsEntry.count, countsEntry.count)} ${kind}s but its size needs ${needed}`,
    );
  }
  const offsets = await reader.numbers(offsetsEntry, `the ${kind} offsets`, needed);
  const byteCounts = await reader.numbers(countsEntry, `the ${kind} byte counts`, needed);
  const fileSize = reader.source.fileSize;
  for (let b = 0; b < needed; b++) {
    if (byteCounts[b] > lim.maxBlockBytes) {
      throw new TiffError('too-large', name, `${kind} ${b} of ${where} declares ${byteCounts[b]} compressed bytes, past the limit`);
    }
    if (byteCounts[b] > 0 && offsets[b] + byteCounts[b] > fileSize) {
      throw new TiffError(
        'truncated', name,
        `${kind} ${b} of ${where} lies past the end of the file (bytes ${offsets[b]}-${offsets[b] + byteCounts[b]} of ${fileSize}): the file is truncated`,
      );
    }
  }
  return {
    level: {
      width, height, tiled, blockWidth, blockHeight, blocksAcross, blocksDown, offsets, byteCounts,
      compression, predictor, ifdOffset: ifd.offset, ifdIndex: index,
    },
    bands, dtype, bitsPerSample, sampleFormat, planar, photometric,
  };
}

type Georeference = Pick<TiffSummary, 'georeferenced' | 'epsg' | 'crsName' | 'pixelSize' | 'origin' | 'extent'>;

async function readGeoreference(
  reader: IfdReader, ifd: RawIfd, width: number, height: number, warnings: string[],
): Promise<Georeference> {
  const get = async (tag: number, what: string) => {
    const entry = ifd.entries.get(tag);
    return entry ? reader.numbers(entry, what, 64) : null;
  };
  const scale = await get(Tag.ModelPixelScale, 'ModelPixelScale');
  const tiepoint = await get(Tag.ModelTiepoint, 'ModelTiepoint');
  const matrix = await get(Tag.ModelTransformation, 'ModelTransformation');
  const directory = ifd.entries.get(Tag.GeoKeyDirectory);
  const asciiEntry = ifd.entries.get(Tag.GeoAsciiParams);
  const keys = directory
    ? parseGeoKeys(await reader.numbers(directory, 'GeoKeyDirectory', 4 + 4 * 512), asciiEntry ? await reader.text(asciiEntry, 'GeoAsciiParams') : null)
    : null;

  let transform: { origin: [number, number]; pixelSize: [number, number] } | null = null;
  if (scale && scale.length >= 2 && tiepoint && tiepoint.length >= 6) {
    const [sx, sy] = scale;
    const [i, j, , x, y] = tiepoint;
    transform = { origin: [x - i * sx, y + j * sy], pixelSize: [sx, sy] };
  } else if (matrix && matrix.length >= 16) {
    if (matrix[1] !== 0 || matrix[4] !== 0) {
      warnings.push('the image is rotated or sheared (ModelTransformation); it is shown in pixel space');
    } else {
      transform = { origin: [matrix[3], matrix[7]], pixelSize: [matrix[0], -matrix[5]] };
    }
  }
  if (transform) {
    const [px, py] = transform.pixelSize;
    if (!(px > 0) || !(py > 0) || !transform.origin.every(Number.isFinite)) {
      warnings.push(`the geotransform is unusable (pixel size ${px} x ${py}); the image is shown in pixel space`);
      transform = null;
    } else if (keys?.rasterType === 2) {
      // PixelIsPoint: the tiepoint is a pixel's centre; GDAL moves the origin to its corner.
      transform.origin = [transform.origin[0] - px / 2, transform.origin[1] + py / 2];
    }
  }

  const epsg = keys?.epsg ?? null;
  const name = (epsg !== null ? knownCrsName(epsg) : null) ?? keys?.citation ?? null;
  if (!transform) {
    if (!keys) warnings.push('no georeferencing (no GeoTIFF tags): the image is shown in pixel space');
    else warnings.push('a CRS but no geotransform (no tiepoint and pixel scale): the image is shown in pixel space');
    return {
      georeferenced: false, epsg, crsName: name,
      pixelSize: [1, 1], origin: [0, height], extent: [0, 0, width, height],
    };
  }
  if (epsg === null) {
    warnings.push(keys ? 'the CRS has no EPSG code (user-defined); coordinates cannot be reprojected' : 'a geotransform but no CRS (no GeoKeys)');
  }
  const [px, py] = transform.pixelSize;
  const [ox, oy] = transform.origin;
  return {
    georeferenced: true, epsg, crsName: name,
    pixelSize: [px, py], origin: [ox, oy], extent: [ox, oy - height * py, ox + width * px, oy],
  };
}

async function readNoData(reader: IfdReader, ifd: RawIfd, warnings: string[]): Promise<number | null> {
  const entry = ifd.entries.get(Tag.GdalNoData);
  if (!entry) return null;
  const text = (await reader.text(entry, 'GDAL_NODATA')).trim();
  if (/^[-+]?nan$/i.test(text)) return NaN;
  const value = Number(text);
  if (text === '' || !Number.isFinite(value)) {
    warnings.push(`the no-data value "${text.slice(0, 40)}" is not a number; it is ignored`);
    return null;
  }
  return value;
}

async function readMetadata(
  reader: IfdReader, ifd: RawIfd, bands: number,
): Promise<Pick<TiffSummary, 'bandNames' | 'bandWavelengthsNm' | 'metadata'>> {
  const entry = ifd.entries.get(Tag.GdalMetadata);
  if (!entry) return { bandNames: null, bandWavelengthsNm: null, metadata: {} };
  const parsed = parseGdalMetadata(await reader.text(entry, 'GDAL_METADATA'), bands);
  const names = parsed.descriptions.map((d) => d ?? null);
  const wavelengths = parsed.bands.map((items) => {
    const v = Number(items[WAVELENGTH_ITEM]);
    return items[WAVELENGTH_ITEM] !== undefined && Number.isFinite(v) ? v : null;
  });
  return {
    bandNames: names.some((n) => n !== null) ? names : null,
    bandWavelengthsNm: wavelengths.some((w) => w !== null) ? wavelengths : null,
    metadata: parsed.dataset,
  };
}
