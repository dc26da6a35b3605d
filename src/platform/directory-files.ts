// The app's own files in a folder handle of the File System Access API (a folder the
// user granted, or in tests the origin-private file system, which hands out the same
// FileSystemDirectoryHandle). A write goes through createWritable(): the WHATWG File
// System Standard applies a writable stream's changes to the file only when the stream
// is closed (Chromium writes a swap file beside it and moves it over the file on close),
// so a reader finds the old content or the new, and a failed write leaves the old one.

import { checkAppFileName, isAppFileName } from './app-file-name.ts';
import { PlatformError } from './errors.ts';
import { clampRangeEnd, checkRangeArguments } from './range.ts';
import type { AppFileInfo, AppFiles } from './types.ts';

/** Chromium's swap file of a write in progress: "<name>.crswap". */
const SWAP = /\.crswap$/;

export class DirectoryAppFiles implements AppFiles {
  readonly #dir: FileSystemDirectoryHandle;
  readonly where: string;

  constructor(dir: FileSystemDirectoryHandle, where = `the folder "${dir.name}"`) {
    this.#dir = dir;
    this.where = where;
  }

  async write(name: string, data: Uint8Array | string): Promise<void> {
    checkAppFileName(name);
    let created = false;
    let writable: FileSystemWritableFileStream | undefined;
    try {
      const handle = await this.#dir.getFileHandle(name).catch(async (error: unknown) => {
        if ((error as DOMException)?.name !== 'NotFoundError') throw error;
        created = true;
        return this.#dir.getFileHandle(name, { create: true });
      });
      writable = await handle.createWritable();
      await writable.write(typeof data === 'string' ? data : (data as Uint8Array<ArrayBuffer>));
      await writable.close();
    } catch (error) {
      await writable?.abort().catch(() => undefined);
      // a file this write created is empty: take it away rather than leave an empty copy
      if (created) await this.#dir.removeEntry(name).catch(() => undefined);
      throw this.#failure(error, name, 'write');
    }
  }

  async read(name: string, range?: { offset: number; length: number }): Promise<Uint8Array | null> {
    checkAppFileName(name);
    if (range) checkRangeArguments(range.offset, range.length, name);
    // A File is a snapshot: replaced by a write while it is read, it reads as NotReadableError;
    // the new content is then read instead.
    for (let attempt = 1; ; attempt++) {
      let file: File;
      try {
        file = await (await this.#dir.getFileHandle(name)).getFile();
      } catch (error) {
        if ((error as DOMException)?.name === 'NotFoundError' || (error as DOMException)?.name === 'TypeMismatchError') return null;
        throw this.#failure(error, name, 'read');
      }
      const part = range ? file.slice(range.offset, clampRangeEnd(file.size, range.offset, range.length, name)) : file;
      try {
        return new Uint8Array(await part.arrayBuffer());
      } catch (error) {
        if ((error as DOMException)?.name !== 'NotReadableError' || attempt === 3) throw this.#failure(error, name, 'read');
      }
    }
  }

  async list(): Promise<AppFileInfo[]> {
    const listed: AppFileInfo[] = [];
    try {
      for await (const [name, handle] of this.#dir.entries()) {
        if (handle.kind !== 'file' || SWAP.test(name) || !isAppFileName(name)) continue;
        const file = await (handle as FileSystemFileHandle).getFile().catch(() => null);
        if (file) listed.push({ name, size: file.size, modified: file.lastModified });
      }
    } catch (error) {
      throw this.#failure(error, this.where, 'read');
    }
    return listed;
  }

  async remove(name: string): Promise<void> {
    checkAppFileName(name);
    try {
      await this.#dir.removeEntry(name);
    } catch (error) {
      if ((error as DOMException)?.name !== 'NotFoundError') throw this.#failure(error, name, 'remove');
    }
  }

  /** One line for the user: what failed, why in plain words, and what to do. */
  #failure(error: unknown, name: string, doing: 'write' | 'read' | 'remove'): PlatformError {
    if (error instanceof PlatformError) return error;
    const kind = (error as DOMException)?.name;
    if (kind === 'QuotaExceededError') {
      return new PlatformError('full', 'not written: the disk is full (the version written before is kept); free some disk space', name);
    }
    if (kind === 'NotAllowedError' || kind === 'SecurityError') {
      return new PlatformError('refused', `the browser no longer lets the app ${doing} files in ${this.where}; allow it again on the start page`, name);
    }
    if (kind === 'NotFoundError' || kind === 'InvalidStateError') {
      return new PlatformError('not-found', `${this.where} is gone or was moved; choose a folder again on the start page`, name);
    }
    const said = error instanceof Error ? error.message : String(error);
    return new PlatformError('io', `could not ${doing} it in ${this.where} (${kind ?? 'Error'}: ${said})`, name);
  }
}
