// The bridge in a plain browser: picked files are File objects kept behind opaque ids,
// demo files are read from the serving origin by HTTP ranges, saving is a download
// (or the File System Access API where the browser has it), and the app's own files go
// to a folder the user grants where the browser has a folder picker. A site's imagery is
// picked through the file picker of the File System Access API where there is one, so
// its handles can be kept (handle-memory.ts); elsewhere through a file input.

import { demoNameSegments } from './demo-name.ts';
import { PlatformError, throwIfAborted } from './errors.ts';
import { BrowserFolderGrant, type DirectoryPicker } from './folder-grant.ts';
import { HandleMemory, type KeptHandle } from './handle-memory.ts';
import { fetchRange, fetchSize, type FetchLike } from './http-range.ts';
import { checkRangeArguments, clampRangeEnd } from './range.ts';
import type { AppFiles, FileRef, ImageryMemory, PickOptions, Platform } from './types.ts';

export interface BrowserPlatformOptions {
  /** Base URL of the demo folder. Default: `./demo/` beside the page. */
  demoBaseUrl?: string;
  /** The fetch to use. Default: the global fetch. */
  fetch?: FetchLike;
  /** The document that hosts the file input and download link. Default: the global document. */
  document?: Document;
  /** The folder picker. Default: the browser's showDirectoryPicker, when it has one. */
  directoryPicker?: DirectoryPicker;
  /** The file picker for a site's imagery. Default: the browser's showOpenFilePicker, when it has one. */
  filePicker?: OpenFilePicker;
  /** Where the handles of a site's imagery are kept. Default: the global indexedDB. */
  indexedDB?: IDBFactory;
}

/** showOpenFilePicker's shape (WICG File System Access). */
export type OpenFilePicker = (options: {
  id?: string;
  multiple?: boolean;
  types?: { description?: string; accept: Record<string, string[]> }[];
}) => Promise<FileSystemFileHandle[]>;

type Entry =
  | { kind: 'picked'; file: Blob; ref: FileRef; handle?: FileSystemFileHandle }
  | { kind: 'demo'; url: string; ref: FileRef };

/** The File System Access API's save picker, present in Chromium-based browsers. */
type SavePicker = (options: { suggestedName: string }) => Promise<{
  createWritable(): Promise<{ write(data: Blob): Promise<void>; close(): Promise<void> }>;
}>;

export class BrowserPlatform implements Platform {
  readonly kind = 'browser';
  readonly #entries = new Map<string, Entry>();
  readonly #demoBaseUrl: string | undefined;
  readonly #fetch: FetchLike;
  readonly #document: Document | undefined;
  readonly #filePicker: OpenFilePicker | undefined;
  readonly folderGrant: BrowserFolderGrant | null;
  readonly imageryMemory: ImageryMemory | null;

  constructor(options: BrowserPlatformOptions = {}) {
    this.#demoBaseUrl = options.demoBaseUrl;
    this.#fetch = options.fetch ?? ((input, init) => fetch(input, init));
    this.#document = options.document ?? (typeof document === 'undefined' ? undefined : document);
    const scope = globalThis as { showDirectoryPicker?: DirectoryPicker; showOpenFilePicker?: OpenFilePicker };
    const picker = options.directoryPicker ?? (scope.showDirectoryPicker ? (o) => scope.showDirectoryPicker!(o) : undefined);
    this.folderGrant = picker ? new BrowserFolderGrant(picker) : null;
    this.#filePicker = options.filePicker ?? (typeof scope.showOpenFilePicker === 'function' ? (o) => scope.showOpenFilePicker!(o) : undefined);
    this.imageryMemory = this.#filePicker
      ? new HandleMemory({ handleOf: (ref) => this.#handleOf(ref), adopt: (file, handle) => this.adoptFile(file, file.name, handle) }, options.indexedDB)
      : null;
  }

  /** The granted folder's files; null until the user grants one (or where there is no folder picker). */
  async appFiles(): Promise<AppFiles | null> {
    return (await this.folderGrant?.files()) ?? null;
  }

  /**
   * Registers a File (or Blob with a name) as if the user had picked it, e.g. after a drop;
   * with the handle it was read through, when it came from the File System Access API.
   */
  adoptFile(file: Blob, name: string = file instanceof File ? file.name : 'file', handle?: FileSystemFileHandle): FileRef {
    const ref: FileRef = { id: newId(), name, size: file.size, ...(file instanceof File ? { modified: file.lastModified } : {}) };
    this.#entries.set(ref.id, { kind: 'picked', file, ref, ...(handle ? { handle } : {}) });
    return { ...ref };
  }

  pickFiles(options: PickOptions): Promise<FileRef[]> {
    if (options.remember && this.#filePicker) return this.#pickHandles(this.#filePicker, options);
    const doc = this.#requireDocument('picking files');
    return new Promise((resolve) => {
      const input = doc.createElement('input');
      input.type = 'file';
      input.multiple = options.multiple === true;
      input.accept = options.extensions.map((ext) => `.${ext.replace(/^\./, '')}`).join(',');
      input.addEventListener('change', () => {
        resolve(Array.from(input.files ?? [], (file) => this.adoptFile(file)));
      }, { once: true });
      input.addEventListener('cancel', () => resolve([]), { once: true });
      input.click();
    });
  }

  /** Picks through the File System Access API, keeping each file's handle beside it. */
  async #pickHandles(picker: OpenFilePicker, options: PickOptions): Promise<FileRef[]> {
    const extensions = options.extensions.map((ext) => `.${ext.replace(/^\./, '').toLowerCase()}`);
    const tiffOnly = extensions.length > 0 && extensions.every((ext) => ext === '.tif' || ext === '.tiff');
    let handles: FileSystemFileHandle[];
    try {
      // called before any await, so the click that asked for it still counts
      handles = await picker({
        id: 'fellfield-imagery',
        multiple: options.multiple === true,
        ...(extensions.length ? { types: [{ description: options.title, accept: { [tiffOnly ? 'image/tiff' : 'application/octet-stream']: extensions } }] } : {}),
      });
    } catch (error) {
      if ((error as DOMException)?.name === 'AbortError') return []; // the user cancelled
      throw new PlatformError('io', `could not open the file picker (${error instanceof Error ? error.message : String(error)})`);
    }
    const picked: FileRef[] = [];
    for (const handle of handles) {
      let file: File;
      try {
        file = await handle.getFile();
      } catch (error) {
        throw new PlatformError('not-found', `could not be read (${error instanceof Error ? error.message : String(error)})`, handle.name);
      }
      picked.push(this.adoptFile(file, file.name, handle));
    }
    return picked;
  }

  #handleOf(ref: FileRef): KeptHandle | null {
    const entry = this.#entries.get(ref?.id);
    if (entry?.kind !== 'picked' || !entry.handle) return null;
    return { handle: entry.handle, name: entry.ref.name, size: entry.ref.size, modified: entry.ref.modified ?? 0 };
  }

  async readRange(file: FileRef, offset: number, length: number, signal?: AbortSignal): Promise<Uint8Array> {
    const entry = this.#entries.get(file?.id);
    if (!entry) throw new PlatformError('unknown-file', 'this file was not picked in this window', file?.name);
    checkRangeArguments(offset, length, entry.ref.name);
    throwIfAborted(signal, entry.ref.name);
    const end = clampRangeEnd(entry.ref.size, offset, length, entry.ref.name);
    if (entry.kind === 'demo') return fetchRange(this.#fetch, entry.url, entry.ref.name, offset, end, signal);
    let buffer: ArrayBuffer;
    try {
      buffer = await entry.file.slice(offset, end).arrayBuffer();
    } catch (error) {
      throw new PlatformError('io', `could not read the file (${error instanceof Error ? error.message : String(error)})`, entry.ref.name);
    }
    throwIfAborted(signal, entry.ref.name);
    return new Uint8Array(buffer);
  }

  async saveFile(suggestedName: string, data: Uint8Array | string): Promise<boolean> {
    const blob = new Blob([typeof data === 'string' ? data : new Uint8Array(data)]);
    const picker = (globalThis as { showSaveFilePicker?: SavePicker }).showSaveFilePicker;
    if (picker) {
      let handle;
      try {
        handle = await picker({ suggestedName });
      } catch (error) {
        if (error instanceof Error && error.name === 'AbortError') return false;
        throw new PlatformError('io', `could not open the save dialog (${error instanceof Error ? error.message : String(error)})`, suggestedName);
      }
      try {
        const writable = await handle.createWritable();
        await writable.write(blob);
        await writable.close();
      } catch (error) {
        throw new PlatformError('io', `could not be written (${error instanceof Error ? error.message : String(error)})`, suggestedName);
      }
      return true;
    }
    const doc = this.#requireDocument('saving files');
    const url = URL.createObjectURL(blob);
    const link = doc.createElement('a');
    link.href = url;
    link.download = suggestedName;
    link.rel = 'noopener';
    doc.body.append(link);
    link.click();
    link.remove();
    // The download has taken its copy once the click is handled; free the blob after.
    setTimeout(() => URL.revokeObjectURL(url), 10_000);
    return true;
  }

  async openDemoFile(name: string): Promise<FileRef> {
    const segments = demoNameSegments(name);
    const url = new URL(segments.map(encodeURIComponent).join('/'), this.#demoBase()).href;
    const size = await fetchSize(this.#fetch, url, name);
    const ref: FileRef = { id: newId(), name: segments[segments.length - 1], size };
    this.#entries.set(ref.id, { kind: 'demo', url, ref });
    return { ...ref };
  }

  #demoBase(): string {
    if (this.#demoBaseUrl) return this.#demoBaseUrl.endsWith('/') ? this.#demoBaseUrl : `${this.#demoBaseUrl}/`;
    const doc = this.#requireDocument('finding the demo folder');
    return new URL('./demo/', doc.baseURI).href;
  }

  #requireDocument(what: string): Document {
    if (!this.#document) throw new PlatformError('bad-request', `${what} needs a page (no document here)`);
    return this.#document;
  }
}

function newId(): string {
  return crypto.randomUUID();
}
