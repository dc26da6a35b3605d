import { open, type FileHandle } from 'node:fs/promises';
import type { ReadRange } from '../core/tiff/byteSource.ts';
import { InputError } from './errors.ts';

/** Largest single read we make; a request past it is refused, not allocated. */
const MAX_READ = 512 * 1024 * 1024;

export interface FileRange {
  read: ReadRange;
  size: number;
  close(): Promise<void>;
}

/** Opens a file for reads at offsets (never the whole file); one clear line on failure. */
export async function openFileRange(path: string): Promise<FileRange> {
  let handle: FileHandle;
  try {
    handle = await open(path, 'r');
  } catch (error) {
    throw new InputError(`${path}: cannot open the file (${describeFsError(error)})`);
  }
  const stat = await handle.stat();
  if (!stat.isFile()) {
    await handle.close();
    throw new InputError(`${path}: not a regular file`);
  }
  const read: ReadRange = async (offset, length) => {
    if (length > MAX_READ) throw new RangeError(`refusing to read ${length} bytes at once`);
    const buffer = new Uint8Array(length);
    let done = 0;
    while (done < length) {
      const { bytesRead } = await handle.read(buffer, done, length - done, offset + done);
      if (bytesRead === 0) break;
      done += bytesRead;
    }
    return done === length ? buffer : buffer.subarray(0, done);
  };
  return { read, size: stat.size, close: () => handle.close() };
}

export function describeFsError(error: unknown): string {
  const code = (error as NodeJS.ErrnoException)?.code;
  switch (code) {
    case 'ENOENT':
      return 'no such file';
    case 'EACCES':
    case 'EPERM':
      return 'permission denied';
    case 'EISDIR':
      return 'it is a directory';
    default:
      return code ?? (error as Error)?.message ?? 'unknown error';
  }
}
