import type { ReadRange } from '../core/tiff/byteSource.ts';
import { isTiffError } from '../core/tiff/errors.ts';
import { inspectTiff, type TiffLimits, type TiffSummary } from '../core/tiff/inspectTiff.ts';
import { InputError } from './errors.ts';
import { openFileRange } from './readFileRange.ts';

/** A GeoTIFF opened by path: its summary and a range reader for readWindow. */
export interface OpenGeoTiff {
  path: string;
  summary: TiffSummary;
  read: ReadRange;
  close(): Promise<void>;
}

/**
 * Opens a GeoTIFF on disk for range reads and summarises it (header and directories
 * only). Unreadable or damaged files become one InputError line naming the file.
 */
export async function openGeoTiffFile(path: string, limits?: TiffLimits): Promise<OpenGeoTiff> {
  const file = await openFileRange(path);
  try {
    const summary = await inspectTiff(file.read, file.size, path, limits);
    return { path, summary, read: file.read, close: file.close };
  } catch (error) {
    await file.close();
    if (isTiffError(error)) throw new InputError(error.message);
    throw error;
  }
}
