// Bounds of a byte-range read, shared by every implementation of the bridge (and by the
// Electron main process, which must not trust the renderer's numbers).

import { PlatformError } from './errors.ts';

/** Checks offset and length before any read: whole, non-negative, finite numbers. */
export function checkRangeArguments(offset: number, length: number, file?: string, maxLength = Number.MAX_SAFE_INTEGER): void {
  if (!Number.isSafeInteger(offset) || offset < 0) {
    throw new PlatformError('bad-request', `offset must be a whole number >= 0, got ${String(offset)}`, file);
  }
  if (!Number.isSafeInteger(length) || length < 0) {
    throw new PlatformError('bad-request', `length must be a whole number >= 0, got ${String(length)}`, file);
  }
  if (length > maxLength) {
    throw new PlatformError('bad-request', `length ${length} is over the limit of ${maxLength} bytes per read`, file);
  }
}

/**
 * Where a read of `length` bytes at `offset` ends in a file of `size` bytes: cut at the
 * end of the file, refused when it starts past the end (or at the end, for a non-empty read).
 */
export function clampRangeEnd(size: number, offset: number, length: number, file?: string): number {
  if (offset > size || (length > 0 && offset >= size)) {
    throw new PlatformError('out-of-range', `offset ${offset} is past the end of the file (${size} bytes)`, file);
  }
  return Math.min(size, offset + length);
}
