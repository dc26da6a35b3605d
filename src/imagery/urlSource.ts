import { fetchRange, fetchSize, type FetchLike } from '../platform/http-range.ts';
import type { FileRef } from '../platform/types.ts';
import { ImageryError } from './inspectInWorker.ts';
import type { RangeReader } from './Raster.ts';

// Imagery kept on a server: a GeoTIFF read by HTTP range requests (RFC 9110, section 14),
// so a view fetches only the blocks it shows, as from a local file.

/** The reader of URLs: open(url) gives a FileRef, readRange reads it by byte ranges. */
export interface UrlReader extends RangeReader {
  open(url: string, signal?: AbortSignal): Promise<FileRef>;
}

export function urlReader(fetchImpl: FetchLike = (input, init) => fetch(input, init)): UrlReader {
  const sizes = new Map<string, number>();
  return {
    async open(url: string): Promise<FileRef> {
      let parsed: URL;
      try {
        parsed = new URL(url);
      } catch {
        throw new ImageryError(`${url}: not a web address`, 'bad-url');
      }
      if (parsed.protocol !== 'http:' && parsed.protocol !== 'https:') throw new ImageryError(`${url}: only http and https addresses can be read`, 'bad-url');
      const name = decodeURIComponent(parsed.pathname.split('/').pop() || parsed.host);
      const size = await told(url, () => fetchSize(fetchImpl, parsed.href, name));
      sizes.set(parsed.href, size);
      return { id: parsed.href, name, size };
    },
    async readRange(file: FileRef, offset: number, length: number, signal?: AbortSignal): Promise<Uint8Array> {
      const size = sizes.get(file.id) ?? file.size;
      if (offset > size) throw new ImageryError(`${file.name}: a read at byte ${offset} lies past the end (${size} bytes)`, 'truncated');
      return told(file.id, () => fetchRange(fetchImpl, file.id, file.name, offset, Math.min(size, offset + length), signal));
    },
  };
}

/** Server problems in words about the address, not about the demo folder the bridge serves. */
async function told<T>(url: string, work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (error) {
    const e = error as Error & { code?: string };
    if (e.code === 'aborted' || e.name === 'AbortError') throw new DOMException('the work was cancelled', 'AbortError');
    if (e.code === 'not-found') throw new ImageryError(`${url}: the server has no such file (HTTP 404)`, 'not-found');
    const why = ((e as { detail?: string }).detail ?? e.message).replace('the demo server', 'the server');
    throw new ImageryError(`${url}: ${why}`, 'unreadable');
  }
}
