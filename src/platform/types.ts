// The one interface between the renderer and the outside world. Files are reached only
// through opaque references handed out by a picker or the demo lookup, never by path.

/** A file the user picked (or a demo file): an opaque id, its base name and byte size. */
export interface FileRef {
  id: string;
  name: string;
  size: number;
  /** The file's last modification (ms since 1970) when the platform knows it (picked files; not demo files). */
  modified?: number;
}

export interface PickOptions {
  /** Title of the picker window or dialog. */
  title: string;
  /** Allowed extensions without the dot, e.g. ['tif', 'tiff']; empty allows any file. */
  extensions: string[];
  /** Allow picking more than one file. Default false. */
  multiple?: boolean;
  /**
   * The files are a site's imagery, to be found again on later opens (see ImageryMemory):
   * a browser with the File System Access API then picks through it, so it can keep the
   * files' handles. Default false.
   */
  remember?: boolean;
}

/** One of the app's own files: its plain name, size in bytes and last write (ms since 1970). */
export interface AppFileInfo {
  name: string;
  size: number;
  modified: number;
}

/**
 * The app's own files (the copies of its sites, its pyramid caches) in a folder of its
 * own: in Electron a folder under the app's data folder, in a browser a folder the user
 * granted. Names follow checkAppFileName (src/platform/app-file-name.ts): no folders.
 */
export interface AppFiles {
  /** Where the files are kept, in words for the user (e.g. 'the folder "Fellfield copies"'). */
  readonly where: string;
  /**
   * Replaces (or creates) a file atomically: a reader finds the old content or the new,
   * never a mix, and a failed write (a full disk) leaves the old content as it was.
   */
  write(name: string, data: Uint8Array | string): Promise<void>;
  /** The file's bytes, or `length` bytes from `offset` (cut at the end); null when there is no such file. */
  read(name: string, range?: { offset: number; length: number }): Promise<Uint8Array | null>;
  /** Every file of the app's, in no particular order. */
  list(): Promise<AppFileInfo[]>;
  /** Removes a file; nothing happens when it is not there. */
  remove(name: string): Promise<void>;
}

/** What the browser lets the app do with the folder the user chose for its files. */
export type FolderState =
  | { state: 'none' } // no folder chosen yet (or the choice was lost with the browser's storage)
  | { state: 'ask'; name: string } // chosen before; the browser wants the user's leave again
  | { state: 'ready'; name: string };

/**
 * In a plain browser, the folder the user grants through the File System Access API for
 * the app's files. Choosing and allowing again open the browser's own prompts, so they
 * must be called from a click.
 */
export interface FolderGrant {
  /** Where things stand now (the choice is kept in the browser's storage between visits). */
  state(): Promise<FolderState>;
  /** Shows the folder picker; resolves to the new state (unchanged when the user cancels). */
  choose(): Promise<FolderState>;
  /** Asks again for leave to write to the folder chosen before. */
  allowAgain(): Promise<FolderState>;
  /** The folder's files when it is 'ready', else null. */
  files(): Promise<AppFiles | null>;
}

/** What became of one file a site's imagery memory kept, when it is asked for again. */
export type RecalledFile =
  /** still where it was, with the size and modification time it had when it was picked */
  | { name: string; state: 'ready'; file: FileRef }
  /** no longer there (moved, renamed or deleted) */
  | { name: string; state: 'missing' }
  /** there, but its size or modification time is not what it was when it was picked */
  | { name: string; state: 'changed' }
  /** the browser did not allow reading it again (the user said no, or was not asked) */
  | { name: string; state: 'not-allowed' };

/**
 * Where the imagery picked for each site is found again on this machine, so a stored site
 * opens without the user picking its files every time. In Electron the main process keeps
 * the files' paths (the renderer never sees them); in a browser with the File System
 * Access API the picked files' handles are kept in IndexedDB.
 */
export interface ImageryMemory {
  /**
   * Keeps `files` (handed out by pickFiles with `remember`, or by recall, on this platform)
   * as the site's imagery, replacing what was kept for it. Files the platform cannot find
   * again (in a browser, files picked without the File System Access API) are left out.
   */
  remember(siteId: string, files: FileRef[]): Promise<void>;
  /**
   * The files kept for the site, each ready to read or why not; [] when none were kept.
   * With `ask`, a browser asks the user's leave to read them again where it wants it
   * (which only works while handling a click).
   */
  recall(siteId: string, options?: { ask?: boolean }): Promise<RecalledFile[]>;
}

export interface Platform {
  readonly kind: 'electron' | 'browser';
  /** Asks the user for files; resolves to [] when the user cancels. */
  pickFiles(options: PickOptions): Promise<FileRef[]>;
  /**
   * Reads `length` bytes from `offset`. A range that runs past the end is cut at the
   * end of the file (like Blob.slice); an offset past the end is refused.
   */
  readRange(file: FileRef, offset: number, length: number, signal?: AbortSignal): Promise<Uint8Array>;
  /** Offers data to be saved; resolves to false when the user cancels. */
  saveFile(suggestedName: string, data: Uint8Array | string): Promise<boolean>;
  /** A file of the generated demo site by name, e.g. 'manifest.json' or 'pan.tif'. */
  openDemoFile(name: string): Promise<FileRef>;
  /**
   * The app's own files, or null where there is no place for them yet (a browser whose
   * user has not granted a folder, or that has no File System Access API).
   */
  appFiles(): Promise<AppFiles | null>;
  /** The folder grant of a plain browser with the File System Access API; null elsewhere. */
  readonly folderGrant: FolderGrant | null;
  /** Finding a site's imagery again; null where files cannot be found again (a browser without the File System Access API). */
  readonly imageryMemory: ImageryMemory | null;
}
