// Reads a byte range of a file by path, cut at the end of the file (Blob.slice semantics):
// what the bridge does for picked and demo files and for the app's own files alike.

import { open } from 'node:fs/promises';
import { PlatformError } from '../src/platform/errors.ts';
import { clampRangeEnd } from '../src/platform/range.ts';

/**
 * The bytes from `offset`, at most `length` of them; a range past the end is refused, and
 * a file that cannot be opened is 'not-found'.
 */
export async function readFileRange(filePath: string, offset: number, length: number, name: string): Promise<Uint8Array> {
  let file;
  try {
    file = await open(filePath, 'r');
  } catch {
    throw new PlatformError('not-found', 'can no longer be opened (moved or deleted?)', name);
  }
  try {
    const { size } = await file.stat();
    const end = clampRangeEnd(size, offset, length, name);
    const bytes = new Uint8Array(end - offset);
    let filled = 0;
    while (filled < bytes.length) {
      const { bytesRead } = await file.read(bytes, filled, bytes.length - filled, offset + filled);
      if (bytesRead === 0) break;
      filled += bytesRead;
    }
    return filled === bytes.length ? bytes : bytes.slice(0, filled);
  } finally {
    await file.close();
  }
}
