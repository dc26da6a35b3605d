// The one interface between the renderer and the outside world. Files are reached only
// through opaque references handed out by a picker or the demo lookup, never by path.

/** A file the user picked (or a demo file): an opaque id, its base name and byte size. */
export interface FileRef {
  id: string;
  name: string;
  size: number;
}

export interface PickOptions {
  /** Title of the picker window or dialog. */
  title: string;
  /** Allowed extensions without the dot, e.g. ['tif', 'tiff']; empty allows any file. */
  extensions: string[];
  /** Allow picking more than one file. Default false. */
  multiple?: boolean;
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
}
