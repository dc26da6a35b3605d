import { deflateSync, zlibSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { lzwDecode, lzwEncode } from '../../../src/core/tiff/codecs/lzw.ts';
import { packBitsDecode, packBitsEncode } from '../../../src/core/tiff/codecs/packbits.ts';
import { floatEncode, horizontalEncode } from '../../../src/core/tiff/codecs/predictor.ts';
import { decodeTile, decodeTileAsync, type TileLayout } from '../../../src/core/tiff/decodeTile.ts';
import { hasNativeInflate } from '../../../src/core/tiff/codecs/nativeInflate.ts';
import { TiffError } from '../../../src/core/tiff/errors.ts';
import { seeded } from './helpers.ts';
import { zeroBomb } from './hostile.ts';

const layout = (over: Partial<TileLayout>): TileLayout => ({
  width: 16, height: 16, samples: 1, dtype: 'uint8', compression: 1, predictor: 1, littleEndian: true,
  fileName: 'scene.tif', blockName: 'tile 5 of the full image', ...over,
});

function bytesOf(values: { buffer: ArrayBufferLike; byteOffset: number; byteLength: number }): Uint8Array {
  return new Uint8Array(values.buffer, values.byteOffset, values.byteLength).slice();
}

function catchTiff(run: () => unknown): TiffError {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(TiffError);
    return error as TiffError;
  }
  throw new Error('expected a TiffError');
}

describe('codecs round trip', () => {
  const random = seeded(3);
  const noisy = Uint8Array.from({ length: 50000 }, () => Math.floor(random() * 256));
  const runs = Uint8Array.from({ length: 50000 }, (_, i) => Math.floor(i / 300) % 7);
  const text = new TextEncoder().encode('the treeline rises and falls with the slope '.repeat(400));

  for (const [name, data] of [['noisy', noisy], ['runs', runs], ['text', text], ['empty', new Uint8Array(0)], ['one byte', new Uint8Array([9])]] as const) {
    it(`LZW: ${name} (clears its table when full)`, () => {
      expect(lzwDecode(lzwEncode(data), data.length)).toEqual(data);
    });
    it(`PackBits: ${name}`, () => {
      expect(packBitsDecode(packBitsEncode(data, 1000), data.length)).toEqual(data);
    });
  }

  it('PackBits packs each row on its own', () => {
    const rows = new Uint8Array([1, 1, 1, 1, 1, 1, 1, 1]);
    expect(Array.from(packBitsEncode(rows, 4))).toEqual([253, 1, 253, 1]);
  });
});

describe('decodeTile', () => {
  const random = seeded(9);
  const u16 = Uint16Array.from({ length: 256 }, (_, i) => (i * 37 + Math.floor(random() * 50)) & 0xffff);

  it('decodes deflate with horizontal prediction', () => {
    const predicted = u16.slice();
    horizontalEncode(predicted, 16, 16, 1);
    const out = decodeTile(zlibSync(bytesOf(predicted)), layout({ dtype: 'uint16', compression: 8, predictor: 2 }));
    expect(out).toBeInstanceOf(Uint16Array);
    expect(Array.from(out)).toEqual(Array.from(u16));
  });

  it('decodes pixel-interleaved samples with prediction across pixels', () => {
    const rgb = Uint8Array.from({ length: 16 * 4 * 3 }, (_, i) => (i * 11) & 0xff);
    const predicted = rgb.slice();
    horizontalEncode(predicted, 16, 4, 3);
    const out = decodeTile(lzwEncode(predicted), layout({ height: 4, samples: 3, compression: 5, predictor: 2 }));
    expect(Array.from(out)).toEqual(Array.from(rgb));
  });

  for (const dtype of ['float32', 'float64'] as const) {
    it(`decodes ${dtype} with the floating-point predictor`, () => {
      const wave = Array.from({ length: 256 }, (_, i) => Math.sin(i) * 1e3 - i);
      const values = dtype === 'float32' ? Float32Array.from(wave) : Float64Array.from(wave);
      const size = values.BYTES_PER_ELEMENT;
      const encoded = floatEncode(bytesOf(values), 16, 16, 1, size);
      const out = decodeTile(packBitsEncode(encoded, 16 * size), layout({ dtype, compression: 32773, predictor: 3 }));
      expect(Array.from(out)).toEqual(Array.from(values));
    });
  }

  it('decodes big-endian samples', () => {
    const values = Int32Array.from({ length: 256 }, (_, i) => i * 100000 - 5);
    const be = new Uint8Array(1024);
    const view = new DataView(be.buffer);
    values.forEach((v, i) => view.setInt32(i * 4, v, false));
    expect(Array.from(decodeTile(be, layout({ dtype: 'int32', littleEndian: false })))).toEqual(Array.from(values));
  });

  it('decodes uncompressed data without touching the caller\'s buffer', () => {
    const raw = Uint8Array.from({ length: 256 }, (_, i) => i);
    const copy = raw.slice();
    decodeTile(raw, layout({ predictor: 2 }));
    expect(raw).toEqual(copy);
  });
});

describe('decodeTile on bad tiles', () => {
  it('refuses a deflate stream that inflates far past the declared size, without allocating it', () => {
    const bomb = zeroBomb(2048); // 2 GiB of zeros in about 2 MB
    const before = process.memoryUsage().arrayBuffers;
    const started = performance.now();
    const e = catchTiff(() => decodeTile(bomb, layout({ compression: 8 })));
    expect(e.code).toBe('bad-tile');
    expect(e.message).toBe('scene.tif: tile 5 of the full image inflates past its declared 256 bytes');
    // One step of at most ~33 MB of output (and the garbage of growing it), not the gigabytes.
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(256 * 1024 * 1024);
    expect(performance.now() - started).toBeLessThan(5000); // a generous bound: the point is it stops early
  });

  it('refuses LZW and PackBits data that decodes past the declared size', () => {
    const lzw = lzwEncode(new Uint8Array(1 << 20));
    expect(catchTiff(() => decodeTile(lzw, layout({ compression: 5 }))).message).toMatch(/decodes past its declared 256 bytes/);
    const packbits = new Uint8Array(20000).map((_, i) => (i % 2 === 0 ? 129 : 0));
    expect(catchTiff(() => decodeTile(packbits, layout({ compression: 32773 }))).message).toMatch(/unpacks past its declared 256 bytes/);
  });

  it('refuses data that decodes short of the declared size', () => {
    expect(catchTiff(() => decodeTile(zlibSync(new Uint8Array(100)), layout({ compression: 8 }))).message).toBe(
      'scene.tif: tile 5 of the full image inflates to 100 bytes, not the declared 256',
    );
    expect(catchTiff(() => decodeTile(new Uint8Array(10), layout({}))).code).toBe('bad-tile');
    expect(catchTiff(() => decodeTile(lzwEncode(new Uint8Array(10)), layout({ compression: 5 }))).code).toBe('bad-tile');
  });

  it('refuses a cut or garbled deflate stream', () => {
    const whole = zlibSync(Uint8Array.from({ length: 256 }, (_, i) => (i * 7) & 0xff));
    expect(catchTiff(() => decodeTile(whole.subarray(0, whole.length - 12), layout({ compression: 8 }))).code).toBe('bad-tile');
    expect(catchTiff(() => decodeTile(new Uint8Array([0x78, 0x9c, 0xff, 0xff, 0xff]), layout({ compression: 8 }))).code).toBe('bad-tile');
  });

  it('refuses garbled LZW codes', () => {
    // A clear code then code 300, which no table holds yet.
    const bad = new Uint8Array([0x80, 0x4b, 0x00, 0x00]);
    expect(catchTiff(() => decodeTile(bad, layout({ compression: 5 }))).message).toMatch(/corrupt LZW data/);
  });

  it('says which compression it does not support', () => {
    const e = catchTiff(() => decodeTile(new Uint8Array(10), layout({ compression: 7 })));
    expect(e.code).toBe('unsupported');
    expect(e.message).toBe('scene.tif: jpeg compression is not supported');
  });
});

// The runtime's own inflater (DecompressionStream) must give what the JavaScript one gives,
// keep the same cap against bombs, and fail in the same words.
describe('decodeTileAsync (native inflate)', () => {
  async function catchAsync(run: () => Promise<unknown>): Promise<TiffError> {
    try {
      await run();
    } catch (error) {
      expect(error).toBeInstanceOf(TiffError);
      return error as TiffError;
    }
    throw new Error('expected a TiffError');
  }
  const random = seeded(21);
  const u16 = Uint16Array.from({ length: 256 * 256 }, (_, i) => (i % 256) * 5 + Math.floor(random() * 40));

  it('runs natively here (Node has DecompressionStream)', () => {
    expect(hasNativeInflate).toBe(true);
  });

  it('inflates a 256 x 256 uint16 tile with prediction to the values the JavaScript inflater gives', async () => {
    const predicted = u16.slice();
    horizontalEncode(predicted, 256, 256, 1);
    const tile = layout({ width: 256, height: 256, dtype: 'uint16', compression: 8, predictor: 2 });
    for (const level of [1, 6, 9] as const) {
      const bytes = zlibSync(bytesOf(predicted), { level });
      const fast = await decodeTileAsync(bytes, tile);
      expect(fast).toBeInstanceOf(Uint16Array);
      expect(Array.from(fast)).toEqual(Array.from(decodeTile(bytes, tile)));
      expect(Array.from(fast)).toEqual(Array.from(u16));
    }
  });

  it('takes raw deflate without the zlib header, and a zlib stream whose checksum is wrong, as the JavaScript inflater does', async () => {
    const raw = Uint8Array.from({ length: 256 }, (_, i) => (i * 13) & 0xff);
    expect(Array.from(await decodeTileAsync(deflateSync(raw), layout({ compression: 8 })))).toEqual(Array.from(raw));
    const wrongSum = zlibSync(raw);
    wrongSum[wrongSum.length - 1] ^= 0xff;
    expect(Array.from(await decodeTileAsync(wrongSum, layout({ compression: 8 })))).toEqual(Array.from(raw));
  });

  it('refuses a deflate bomb after one step, in the same words and without allocating it', async () => {
    const bomb = zeroBomb(2048);
    const before = process.memoryUsage().arrayBuffers;
    const e = await catchAsync(() => decodeTileAsync(bomb, layout({ compression: 8 })));
    expect(e.code).toBe('bad-tile');
    expect(e.message).toBe('scene.tif: tile 5 of the full image inflates past its declared 256 bytes');
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(256 * 1024 * 1024);
  });

  it('names a short, cut or garbled stream as the JavaScript inflater does', async () => {
    const short = zlibSync(new Uint8Array(100));
    expect((await catchAsync(() => decodeTileAsync(short, layout({ compression: 8 })))).message).toBe(
      'scene.tif: tile 5 of the full image inflates to 100 bytes, not the declared 256',
    );
    const whole = zlibSync(Uint8Array.from({ length: 256 }, (_, i) => (i * 7) & 0xff));
    const cut = whole.subarray(0, whole.length - 12);
    expect((await catchAsync(() => decodeTileAsync(cut, layout({ compression: 8 })))).message).toBe(catchTiff(() => decodeTile(cut, layout({ compression: 8 }))).message);
    const garbled = new Uint8Array([0x78, 0x9c, 0xff, 0xff, 0xff]);
    expect((await catchAsync(() => decodeTileAsync(garbled, layout({ compression: 8 })))).code).toBe('bad-tile');
  });

  it('decodes other compressions as decodeTile does', async () => {
    const rgb = Uint8Array.from({ length: 256 }, (_, i) => (i * 11) & 0xff);
    expect(Array.from(await decodeTileAsync(lzwEncode(rgb), layout({ compression: 5 })))).toEqual(Array.from(rgb));
  });
});
