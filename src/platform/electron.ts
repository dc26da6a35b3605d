// The bridge inside the Electron window: every call goes through the preload's narrow
// API to the main process, which owns the dialogs, the handle registry and the reads.

import type { BridgeApi, BridgeResult } from './channels.ts';
import { PlatformError, throwIfAborted } from './errors.ts';
import { checkAppFileName } from './app-file-name.ts';
import { checkRangeArguments } from './range.ts';
import type { AppFileInfo, AppFiles, FileRef, ImageryMemory, PickOptions, Platform, RecalledFile } from './types.ts';

export class ElectronPlatform implements Platform {
  readonly kind = 'electron';
  /** The desktop app always has its own folder; there is nothing to grant. */
  readonly folderGrant = null;
  readonly imageryMemory: ImageryMemory;
  readonly #bridge: BridgeApi;
  readonly #files: AppFiles;

  constructor(bridge: BridgeApi) {
    this.#bridge = bridge;
    this.#files = new BridgeAppFiles(bridge);
    this.imageryMemory = new BridgeImageryMemory(bridge);
  }

  async appFiles(): Promise<AppFiles> {
    return this.#files;
  }

  async pickFiles(options: PickOptions): Promise<FileRef[]> {
    // Every picked file can be remembered here: the main process keeps its path.
    const { title, extensions, multiple } = options;
    return unwrap(await this.#bridge.pickFiles({ title, extensions: [...extensions], multiple }));
  }

  async readRange(file: FileRef, offset: number, length: number, signal?: AbortSignal): Promise<Uint8Array> {
    checkRangeArguments(offset, length, file?.name);
    throwIfAborted(signal, file?.name);
    // An IPC call cannot be withdrawn once sent; on abort the caller is released at once
    // and the late answer is dropped.
    const answer = this.#bridge.readRange({ id: file?.id, offset, length });
    const bytes = unwrap(await raceAbort(answer, signal, file?.name));
    return bytes instanceof Uint8Array ? bytes : new Uint8Array(bytes);
  }

  async saveFile(suggestedName: string, data: Uint8Array | string): Promise<boolean> {
    return unwrap(await this.#bridge.saveFile({ suggestedName, data }));
  }

  async openDemoFile(name: string): Promise<FileRef> {
    return unwrap(await this.#bridge.openDemoFile({ name }));
  }
}

/** The app's files in its data folder, written and read by the main process. */
class BridgeAppFiles implements AppFiles {
  readonly where = "the app's data folder";
  readonly #bridge: BridgeApi;

  constructor(bridge: BridgeApi) {
    this.#bridge = bridge;
  }

  async write(name: string, data: Uint8Array | string): Promise<void> {
    unwrap(await this.#bridge.appFileWrite({ name: checkAppFileName(name), data }));
  }

  async read(name: string, range?: { offset: number; length: number }): Promise<Uint8Array | null> {
    if (range) checkRangeArguments(range.offset, range.length, name);
    const bytes = unwrap(await this.#bridge.appFileRead({ name: checkAppFileName(name), ...range }));
    return bytes === null || bytes instanceof Uint8Array ? bytes : new Uint8Array(bytes);
  }

  async list(): Promise<AppFileInfo[]> {
    return unwrap(await this.#bridge.appFileList({}));
  }

  async remove(name: string): Promise<void> {
    unwrap(await this.#bridge.appFileRemove({ name: checkAppFileName(name) }));
  }
}

/** The imagery memory kept by the main process: files named by id both ways, never by path. */
class BridgeImageryMemory implements ImageryMemory {
  readonly #bridge: BridgeApi;

  constructor(bridge: BridgeApi) {
    this.#bridge = bridge;
  }

  async remember(siteId: string, files: FileRef[]): Promise<void> {
    unwrap(await this.#bridge.rememberImagery({ siteId, ids: files.map((f) => f.id) }));
  }

  async recall(siteId: string): Promise<RecalledFile[]> {
    return unwrap(await this.#bridge.recallImagery({ siteId }));
  }
}

function unwrap<T>(result: BridgeResult<T>): T {
  if (result.ok) return result.value;
  throw new PlatformError(result.error.code, result.error.message, result.error.file);
}

function raceAbort<T>(promise: Promise<T>, signal: AbortSignal | undefined, name: string | undefined): Promise<T> {
  if (!signal) return promise;
  return new Promise<T>((resolve, reject) => {
    const onAbort = () => reject(new PlatformError('aborted', 'the read was cancelled', name));
    signal.addEventListener('abort', onAbort, { once: true });
    promise.then(resolve, reject).finally(() => signal.removeEventListener('abort', onAbort));
  });
}
