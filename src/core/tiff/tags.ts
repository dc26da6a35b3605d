// TIFF 6.0, BigTIFF, GeoTIFF 1.1 and GDAL tag numbers, field types and code names.

export const Tag = {
  NewSubfileType: 254,
  ImageWidth: 256,
  ImageLength: 257,
  BitsPerSample: 258,
  Compression: 259,
  Photometric: 262,
  StripOffsets: 273,
  SamplesPerPixel: 277,
  RowsPerStrip: 278,
  StripByteCounts: 279,
  PlanarConfiguration: 284,
  Predictor: 317,
  TileWidth: 322,
  TileLength: 323,
  TileOffsets: 324,
  TileByteCounts: 325,
  ExtraSamples: 338,
  SampleFormat: 339,
  ModelPixelScale: 33550,
  ModelTiepoint: 33922,
  ModelTransformation: 34264,
  GeoKeyDirectory: 34735,
  GeoDoubleParams: 34736,
  GeoAsciiParams: 34737,
  GdalMetadata: 42112,
  GdalNoData: 42113,
} as const;

/** TIFF field types: code → size in bytes of one value. */
export const FieldType = {
  BYTE: 1,
  ASCII: 2,
  SHORT: 3,
  LONG: 4,
  RATIONAL: 5,
  SBYTE: 6,
  UNDEFINED: 7,
  SSHORT: 8,
  SLONG: 9,
  SRATIONAL: 10,
  FLOAT: 11,
  DOUBLE: 12,
  IFD: 13,
  LONG8: 16,
  SLONG8: 17,
  IFD8: 18,
} as const;

const fieldSizes: Record<number, number> = {
  1: 1, 2: 1, 3: 2, 4: 4, 5: 8, 6: 1, 7: 1, 8: 2, 9: 4, 10: 8, 11: 4, 12: 8, 13: 4, 16: 8, 17: 8, 18: 8,
};

/** Bytes per value of a field type, or 0 for a type this reader does not know. */
export function fieldTypeSize(type: number): number {
  return fieldSizes[type] ?? 0;
}

export const GeoKey = {
  GTModelType: 1024,
  GTRasterType: 1025,
  GTCitation: 1026,
  GeographicType: 2048,
  GeogCitation: 2049,
  GeogAngularUnits: 2054,
  ProjectedCSType: 3072,
  PCSCitation: 3073,
  ProjLinearUnits: 3076,
} as const;

/** TIFF compression codes and the names we report (GDAL's names, lower-cased). */
export const compressionNames: Record<number, string> = {
  1: 'none',
  2: 'ccittrle',
  3: 'ccittfax3',
  4: 'ccittfax4',
  5: 'lzw',
  6: 'ojpeg',
  7: 'jpeg',
  8: 'deflate',
  32773: 'packbits',
  32946: 'deflate',
  34676: 'sgilog',
  34887: 'lerc',
  34925: 'lzma',
  50000: 'zstd',
  50001: 'webp',
  50002: 'jxl',
};

export function compressionName(code: number): string {
  return compressionNames[code] ?? `unknown (${code})`;
}

/** Compression codes whose tiles decodeTile can decode. */
export const decodableCompressions: ReadonlySet<number> = new Set([1, 5, 8, 32773, 32946]);

/** Sample types this project reads and writes. */
export type Dtype = 'uint8' | 'int8' | 'uint16' | 'int16' | 'uint32' | 'int32' | 'float32' | 'float64';

/** The dtype for BitsPerSample and SampleFormat (1 unsigned, 2 signed, 3 float), or null. */
export function dtypeOf(bitsPerSample: number, sampleFormat: number): Dtype | null {
  if (sampleFormat === 1 || sampleFormat === 4) {
    // 4 is "undefined"; read it as unsigned like libtiff does.
    if (bitsPerSample === 8) return 'uint8';
    if (bitsPerSample === 16) return 'uint16';
    if (bitsPerSample === 32) return 'uint32';
  } else if (sampleFormat === 2) {
    if (bitsPerSample === 8) return 'int8';
    if (bitsPerSample === 16) return 'int16';
    if (bitsPerSample === 32) return 'int32';
  } else if (sampleFormat === 3) {
    if (bitsPerSample === 32) return 'float32';
    if (bitsPerSample === 64) return 'float64';
  }
  return null;
}

export function bytesPerSample(dtype: Dtype): number {
  switch (dtype) {
    case 'uint8':
    case 'int8':
      return 1;
    case 'uint16':
    case 'int16':
      return 2;
    case 'uint32':
    case 'int32':
    case 'float32':
      return 4;
    case 'float64':
      return 8;
  }
}

export type SampleArray =
  | Uint8Array
  | Int8Array
  | Uint16Array
  | Int16Array
  | Uint32Array
  | Int32Array
  | Float32Array
  | Float64Array;

/** A typed array of the dtype over a buffer (byte offset 0, `length` elements). */
export function typedArrayOver(dtype: Dtype, buffer: ArrayBuffer, length: number): SampleArray {
  switch (dtype) {
    case 'uint8':
      return new Uint8Array(buffer, 0, length);
    case 'int8':
      return new Int8Array(buffer, 0, length);
    case 'uint16':
      return new Uint16Array(buffer, 0, length);
    case 'int16':
      return new Int16Array(buffer, 0, length);
    case 'uint32':
      return new Uint32Array(buffer, 0, length);
    case 'int32':
      return new Int32Array(buffer, 0, length);
    case 'float32':
      return new Float32Array(buffer, 0, length);
    case 'float64':
      return new Float64Array(buffer, 0, length);
  }
}

/** True where typed arrays store numbers least significant byte first. */
export const hostLittleEndian = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
