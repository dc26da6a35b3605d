// Reading a file served over HTTP by byte ranges (RFC 9110, section 14): the size from
// a HEAD request (or from the Content-Range of a one-byte read when HEAD is refused),
// then one `Range: bytes=first-last` request per read.

import { PlatformError } from './errors.ts';

export type FetchLike = (input: string, init?: RequestInit) => Promise<globalThis.Response>;

/** The size in bytes of the resource at `url`. */
export async function fetchSize(fetchImpl: FetchLike, url: string, name: string): Promise<number> {
  const head = await request(fetchImpl, url, { method: 'HEAD' }, name);
  if (head.ok) {
    const length = Number(head.headers.get('content-length'));
    if (Number.isSafeInteger(length) && length >= 0) return length;
  } else if (head.status === 404) {
    throw new PlatformError('not-found', 'not found in the demo folder (run `npm run demo:data`)', name);
  }
  // No usable HEAD: ask for the first byte and read the total from Content-Range.
  const probe = await request(fetchImpl, url, { headers: { Range: 'bytes=0-0' } }, name);
  await probe.body?.cancel();
  if (probe.status === 404) throw new PlatformError('not-found', 'not found in the demo folder (run `npm run demo:data`)', name);
  const total = parseContentRangeTotal(probe.headers.get('content-range'));
  if (probe.status === 206 && total !== undefined) return total;
  if (probe.status === 416 && total !== undefined) return total; // an empty file
  throw new PlatformError('io', `the server did not report the file's size (HTTP ${probe.status})`, name);
}

/** Bytes [offset, end) of the resource at `url`. */
export async function fetchRange(
  fetchImpl: FetchLike,
  url: string,
  name: string,
  offset: number,
  end: number,
  signal?: AbortSignal,
): Promise<Uint8Array> {
  if (end <= offset) return new Uint8Array(0);
  const response = await request(fetchImpl, url, { headers: { Range: `bytes=${offset}-${end - 1}` }, signal }, name);
  const bytes = new Uint8Array(await readBody(response, name));
  if (response.status === 206) {
    if (bytes.length !== end - offset) {
      throw new PlatformError('io', `asked for ${end - offset} bytes at ${offset}, the server sent ${bytes.length}`, name);
    }
    return bytes;
  }
  if (response.status === 200) {
    // A server may ignore Range (RFC 9110, 14.2) and send the whole file: cut it here.
    return bytes.slice(offset, end);
  }
  throw new PlatformError('io', `the server answered HTTP ${response.status} to a range read`, name);
}

/** The complete length from `Content-Range: bytes a-b/total` or `bytes * /total`. */
export function parseContentRangeTotal(header: string | null): number | undefined {
  const match = header ? /^bytes (?:\d+-\d+|\*)\/(\d+)$/.exec(header.trim()) : null;
  return match ? Number(match[1]) : undefined;
}

async function request(fetchImpl: FetchLike, url: string, init: RequestInit, name: string): Promise<globalThis.Response> {
  try {
    return await fetchImpl(url, init);
  } catch (error) {
    throw asPlatformError(error, name);
  }
}

async function readBody(response: globalThis.Response, name: string): Promise<ArrayBuffer> {
  try {
    return await response.arrayBuffer();
  } catch (error) {
    throw asPlatformError(error, name);
  }
}

function asPlatformError(error: unknown, name: string): PlatformError {
  if (error instanceof PlatformError) return error;
  if (error instanceof Error && error.name === 'AbortError') return new PlatformError('aborted', 'the read was cancelled', name);
  const why = error instanceof Error ? error.message : String(error);
  return new PlatformError('io', `could not reach the demo server (${why})`, name);
}
