// The renderer never holds a path. Files the user picked in a dialog (and demo files
// found by name) are entered here and handed out as random ids; a read names an id,
// and an id that was never handed out is refused.

import { randomUUID } from 'node:crypto';
import path from 'node:path';
import { PlatformError } from '../../src/platform/errors.ts';
import type { FileRef } from '../../src/platform/types.ts';

export interface FileHandle {
  ref: FileRef;
  path: string;
  source: 'picked' | 'demo';
  /** the file's modification time as the system gave it when it was entered (ms, with its fraction) */
  mtimeMs?: number;
}

export class FileHandleRegistry {
  readonly #byId = new Map<string, FileHandle>();
  readonly #idByPath = new Map<string, string>();

  /**
   * Enters a file and returns its reference; the same path keeps the same id. `mtimeMs`
   * (picked files) is kept, and handed out rounded as the reference's `modified`.
   */
  add(absolutePath: string, size: number, source: FileHandle['source'], mtimeMs?: number): FileRef {
    const known = this.#idByPath.get(absolutePath);
    const existing = known ? this.#byId.get(known) : undefined;
    const modified = mtimeMs === undefined ? {} : { modified: Math.round(mtimeMs) };
    if (existing && existing.source === source) {
      existing.ref = { id: existing.ref.id, name: existing.ref.name, size, ...modified };
      existing.mtimeMs = mtimeMs;
      return { ...existing.ref };
    }
    const ref: FileRef = { id: randomUUID(), name: path.basename(absolutePath), size, ...modified };
    this.#byId.set(ref.id, { ref, path: absolutePath, source, mtimeMs });
    this.#idByPath.set(absolutePath, ref.id);
    return { ...ref };
  }

  /** The handle behind an id; 'unknown-file' when the id was never handed out. */
  get(id: unknown): FileHandle {
    const handle = typeof id === 'string' ? this.#byId.get(id) : undefined;
    if (!handle) throw new PlatformError('unknown-file', 'no such file was picked (unknown file reference)');
    return handle;
  }

  /** Forgets every handle, e.g. when the window is closed. */
  clear(): void {
    this.#byId.clear();
    this.#idByPath.clear();
  }

  get size(): number {
    return this.#byId.size;
  }
}
