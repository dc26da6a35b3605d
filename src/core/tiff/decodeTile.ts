import { CodecError, inflateCapped } from './codecs/deflate.ts';
import { inflateCappedNative } from './codecs/nativeInflate.ts';
import { lzwDecode } from './codecs/lzw.ts';
import { packBitsDecode } from './codecs/packbits.ts';
import { floatDecode, horizontalDecode } from './codecs/predictor.ts';
import { TiffError } from './errors.ts';
import { bytesPerSample, compressionName, hostLittleEndian, typedArrayOver, type Dtype, type SampleArray } from './tags.ts';

/** What decodeTile needs to know of one tile or strip (see blockLayout in blocks.ts). */
export interface TileLayout {
  /** Pixels per row of the block: the tile width, or the image width for a strip. */
  width: number;
  /** Rows in the block: the tile height, or the rows of this strip. */
  height: number;
  /** Samples per pixel in the block: 1 for band-separate files, the band count for interleaved. */
  samples: number;
  dtype: Dtype;
  /** TIFF compression code (1 none, 5 LZW, 8 or 32946 deflate, 32773 PackBits). */
  compression: number;
  /** TIFF predictor: 1 none, 2 horizontal, 3 floating point. */
  predictor: number;
  littleEndian: boolean;
  /** For messages: the file, and which block ("tile 3 of level 0, band 2"). */
  fileName?: string;
  blockName?: string;
}

/**
 * Decodes one compressed tile or strip into a typed array of exactly
 * width * height * samples values, pixel-interleaved when samples > 1, in host byte order.
 * Decompression is capped at the declared size: a block that would decode past it throws
 * TiffError 'bad-tile' without allocating more. Pure and synchronous (usable in a worker).
 * A block with a byte count of 0 is sparse (GDAL writes them for empty tiles): the caller
 * fills it with no-data instead of decoding it.
 */
export function decodeTile(bytes: Uint8Array, layout: TileLayout): SampleArray {
  const expected = declaredBytes(layout);
  let raw: Uint8Array;
  try {
    switch (layout.compression) {
      case 1:
        if (bytes.length < expected) throw new CodecError(`holds ${bytes.length} bytes, not the declared ${expected}`);
        raw = bytes.slice(0, expected);
        break;
      case 8:
      case 32946:
        raw = inflateCapped(bytes, expected);
        break;
      case 5:
        raw = lzwDecode(bytes, expected);
        break;
      case 32773:
        raw = packBitsDecode(bytes, expected);
        break;
      default:
        throw new TiffError('unsupported', layout.fileName ?? '', `${compressionName(layout.compression)} compression is not supported`);
    }
  } catch (error) {
    throw codecFailure(error, layout);
  }
  return finishBlock(raw, layout);
}

/**
 * decodeTile with deflate inflated by the runtime's own inflater where it has one
 * (Chromium, Electron, Node: several times faster), under the same cap and with the same
 * messages. Other compressions decode as in decodeTile.
 */
export async function decodeTileAsync(bytes: Uint8Array, layout: TileLayout): Promise<SampleArray> {
  if (layout.compression !== 8 && layout.compression !== 32946) return decodeTile(bytes, layout);
  const expected = declaredBytes(layout);
  let raw: Uint8Array;
  try {
    raw = await inflateCappedNative(bytes, expected);
  } catch (error) {
    throw codecFailure(error, layout);
  }
  return finishBlock(raw, layout);
}

/** The block's decoded size in bytes, refused when it cannot be. */
function declaredBytes(layout: TileLayout): number {
  const { width, height, samples, dtype } = layout;
  const expected = width * height * samples * bytesPerSample(dtype);
  if (!Number.isSafeInteger(expected) || expected <= 0) {
    throw new TiffError('bad-tile', layout.fileName ?? '', `${layout.blockName ?? 'a tile'} has an impossible declared size (${width} x ${height} x ${samples})`);
  }
  return expected;
}

/** A codec's complaint as a TiffError naming the file and the block. */
function codecFailure(error: unknown, layout: TileLayout): unknown {
  if (error instanceof CodecError) return new TiffError('bad-tile', layout.fileName ?? '', `${layout.blockName ?? 'a tile'} ${error.message}`);
  return error;
}

/** Undoes the predictor and the byte order of a decompressed block: its samples in host order. */
function finishBlock(decompressed: Uint8Array, layout: TileLayout): SampleArray {
  const { width, height, samples, dtype, predictor, littleEndian } = layout;
  const fileName = layout.fileName ?? '';
  const size = bytesPerSample(dtype);
  const count = width * height * samples;
  let raw = decompressed;
  if (predictor === 3) {
    if (dtype !== 'float32' && dtype !== 'float64') {
      throw new TiffError('unsupported', fileName, `the floating-point predictor on ${dtype} samples is not supported`);
    }
    // Predictor 3 leaves the bytes in little-endian order whatever the file's byte order.
    raw = floatDecode(raw, width, height, samples, size);
    if (!hostLittleEndian) swapBytes(raw, size);
  } else if (littleEndian !== hostLittleEndian) {
    swapBytes(raw, size);
  }

  const values = typedArrayOver(dtype, raw.buffer as ArrayBuffer, count);
  if (predictor === 2) {
    if (values instanceof Float32Array || values instanceof Float64Array) {
      // Horizontal differencing of float samples works on their bit patterns.
      const asInt = values instanceof Float32Array ? new Uint32Array(raw.buffer, 0, count) : null;
      if (!asInt) throw new TiffError('unsupported', fileName, 'horizontal prediction of float64 samples is not supported');
      horizontalDecode(asInt, width, height, samples);
    } else {
      horizontalDecode(values, width, height, samples);
    }
  } else if (predictor !== 1 && predictor !== 3) {
    throw new TiffError('unsupported', fileName, `predictor ${predictor} is not supported`);
  }
  return values;
}

function swapBytes(bytes: Uint8Array, size: number): void {
  if (size === 1) return;
  for (let i = 0; i + size <= bytes.length; i += size) {
    for (let a = i, b = i + size - 1; a < b; a++, b--) {
      const t = bytes[a];
      bytes[a] = bytes[b];
      bytes[b] = t;
    }
  }
}
