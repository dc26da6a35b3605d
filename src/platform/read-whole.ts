// Small files (the demo manifest, GeoJSON) are read whole, in bounded range reads, with
// a size cap so a mistaken pick of a huge file fails clearly instead of filling memory.

import { PlatformError } from './errors.ts';
import type { FileRef, Platform } from './types.ts';

const CHUNK = 8 * 1024 * 1024;
const DEFAULT_MAX_BYTES = 256 * 1024 * 1024;

export async function readWholeFile(
  platform: Platform,
  file: FileRef,
  options: { maxBytes?: number; signal?: AbortSignal } = {},
): Promise<Uint8Array> {
  const maxBytes = options.maxBytes ?? DEFAULT_MAX_BYTES;
  if (file.size > maxBytes) {
    throw new PlatformError('bad-request', `is ${file.size} bytes, more than the ${maxBytes} bytes read whole`, file.name);
  }
  const out = new Uint8Array(file.size);
  for (let offset = 0; offset < file.size; offset += CHUNK) {
    const want = Math.min(CHUNK, file.size - offset);
    const part = await platform.readRange(file, offset, want, options.signal);
    if (part.length !== want) throw new PlatformError('io', `changed while it was read (got ${part.length} of ${want} bytes at ${offset})`, file.name);
    out.set(part, offset);
  }
  return out;
}

/** The file as UTF-8 text. */
export async function readText(
  platform: Platform,
  file: FileRef,
  options: { maxBytes?: number; signal?: AbortSignal } = {},
): Promise<string> {
  return new TextDecoder('utf-8').decode(await readWholeFile(platform, file, options));
}
