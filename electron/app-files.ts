// The app's own files in the main process: one folder of ours under Electron's userData,
// holding the copies of the sites and the pyramid caches. The renderer names a file
// (checked by checkAppFileName), never a path. A write is atomic: the data goes to a
// temporary name beginning with '.', is flushed to the disk (fsync), then renamed over
// the old file, and the folder is flushed so the rename itself survives a power cut.
// A crash before the rename leaves the old file whole (the temporary one is swept up
// on the next start); a full disk fails the write and leaves the old file as it was.

import { randomBytes } from 'node:crypto';
import * as nodeFs from 'node:fs/promises';
import path from 'node:path';
import { isAppFileName } from '../src/platform/app-file-name.ts';
import { MAX_APP_FILE_BYTES } from '../src/platform/channels.ts';
import { PlatformError } from '../src/platform/errors.ts';
import type { AppFileInfo } from '../src/platform/types.ts';
import { parseAppFileName, parseAppFileRead, parseAppFileWrite, parseNothing } from './policy/payloads.ts';
import { readFileRange } from './read-file-range.ts';

/** The file system calls the handlers make: node:fs/promises, or a wrapper of it that fails on cue in tests. */
export type AppFilesFs = Pick<typeof nodeFs, 'open' | 'rename' | 'unlink' | 'readdir' | 'stat' | 'mkdir' | 'readFile'>;

const PARTIAL = /^\..+\.partial$/;

export interface AppFilesHandlers {
  appFileWrite(payload: unknown): Promise<null>;
  appFileRead(payload: unknown): Promise<Uint8Array | null>;
  appFileList(payload: unknown): Promise<AppFileInfo[]>;
  appFileRemove(payload: unknown): Promise<null>;
}

/** The folder of the app's files inside Electron's userData folder. */
export function appFilesDir(userData: string): string {
  return path.join(userData, 'app-files');
}

export function createAppFilesHandlers(dir: string, fs: AppFilesFs = nodeFs): AppFilesHandlers {
  return {
    async appFileWrite(payload) {
      const { name, data } = parseAppFileWrite(payload);
      await writeAtomically(fs, dir, name, data);
      return null;
    },

    async appFileRead(payload) {
      const request = parseAppFileRead(payload);
      const filePath = path.join(dir, request.name);
      if (request.offset !== undefined && request.length !== undefined) {
        try {
          return await readFileRange(filePath, request.offset, request.length, request.name);
        } catch (error) {
          if (error instanceof PlatformError && error.code === 'not-found') return null;
          throw error;
        }
      }
      let size: number;
      try {
        size = (await fs.stat(filePath)).size;
      } catch (error) {
        if (isMissing(error)) return null;
        throw failure(error, request.name, 'read');
      }
      if (size > MAX_APP_FILE_BYTES) throw new PlatformError('bad-request', `is ${size} bytes, too large to read whole (read it by ranges)`, request.name);
      try {
        return new Uint8Array(await fs.readFile(filePath));
      } catch (error) {
        if (isMissing(error)) return null;
        throw failure(error, request.name, 'read');
      }
    },

    async appFileList(payload) {
      parseNothing(payload);
      let entries;
      try {
        entries = await fs.readdir(dir, { withFileTypes: true });
      } catch (error) {
        if (isMissing(error)) return [];
        throw failure(error, 'the folder of the app files', 'read');
      }
      const listed: AppFileInfo[] = [];
      for (const entry of entries) {
        if (!entry.isFile() || !isAppFileName(entry.name)) continue;
        try {
          const info = await fs.stat(path.join(dir, entry.name));
          listed.push({ name: entry.name, size: info.size, modified: Math.round(info.mtimeMs) });
        } catch (error) {
          if (!isMissing(error)) throw failure(error, entry.name, 'read');
        }
      }
      return listed;
    },

    async appFileRemove(payload) {
      const { name } = parseAppFileName(payload);
      try {
        await fs.unlink(path.join(dir, name));
      } catch (error) {
        if (!isMissing(error)) throw failure(error, name, 'remove');
      }
      return null;
    },
  };
}

/**
 * Replaces `dir/name` atomically (see the top of this file): the old content or the new,
 * never a mix; a failure is a PlatformError naming the file. Makes `dir` when missing.
 */
export async function writeAtomically(fs: AppFilesFs, dir: string, name: string, data: Uint8Array | string): Promise<void> {
  const final = path.join(dir, name);
  const temporary = path.join(dir, `.${name}.${randomBytes(6).toString('hex')}.partial`);
  let file: nodeFs.FileHandle | undefined;
  try {
    await fs.mkdir(dir, { recursive: true });
    file = await fs.open(temporary, 'wx');
    await file.writeFile(data);
    await file.sync();
    await file.close();
    file = undefined;
    await fs.rename(temporary, final);
  } catch (error) {
    await file?.close().catch(() => undefined);
    await fs.unlink(temporary).catch(() => undefined);
    throw failure(error, name, 'write');
  }
  await syncFolder(fs, dir);
}

/** Flushes the folder's entries (the rename) where the system allows it; Windows does not open folders. */
async function syncFolder(fs: AppFilesFs, dir: string): Promise<void> {
  let folder: nodeFs.FileHandle | undefined;
  try {
    folder = await fs.open(dir, 'r');
    await folder.sync();
  } catch {
    // best effort: the data itself is already flushed
  } finally {
    await folder?.close().catch(() => undefined);
  }
}

/** Removes the temporary files of writes cut short by a crash; run once at start. */
export async function sweepPartials(dir: string, fs: AppFilesFs = nodeFs): Promise<string[]> {
  let names: string[];
  try {
    names = await fs.readdir(dir);
  } catch {
    return [];
  }
  const swept: string[] = [];
  for (const name of names.filter((n) => PARTIAL.test(n))) {
    try {
      await fs.unlink(path.join(dir, name));
      swept.push(name);
    } catch {
      // another start is sweeping too, or the file is busy: the next start tries again
    }
  }
  return swept;
}

function isMissing(error: unknown): boolean {
  return (error as NodeJS.ErrnoException)?.code === 'ENOENT';
}

/** One line for the user: what failed, why in plain words, and what to do. */
function failure(error: unknown, name: string, doing: 'write' | 'read' | 'remove'): PlatformError {
  if (error instanceof PlatformError) return error;
  const code = (error as NodeJS.ErrnoException)?.code;
  if (code === 'ENOSPC' || code === 'EDQUOT') {
    return new PlatformError('full', 'not written: the disk is full (the version written before is kept); free some disk space', name);
  }
  if (code === 'EACCES' || code === 'EPERM' || code === 'EROFS') {
    return new PlatformError('io', `could not ${doing} it: the app's data folder does not allow it (${code})`, name);
  }
  return new PlatformError('io', `could not ${doing} it (${code ?? (error instanceof Error ? error.message : String(error))})`, name);
}
