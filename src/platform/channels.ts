// The IPC contract between the Electron main process and the renderer, defined once
// and imported by electron/main.ts, electron/preload.ts and src/platform/electron.ts.
// Every call is an `invoke` that resolves to a result envelope: errors cross the
// process boundary as plain data, because Electron flattens thrown errors to text.

import type { PlatformErrorCode } from './errors.ts';
import type { AppFileInfo, FileRef, PickOptions, RecalledFile } from './types.ts';

/** Channel names, one per bridge call. */
export const CHANNELS = {
  pickFiles: 'fellfield:pick-files',
  readRange: 'fellfield:read-range',
  saveFile: 'fellfield:save-file',
  openDemoFile: 'fellfield:open-demo-file',
  appFileWrite: 'fellfield:app-file-write',
  appFileRead: 'fellfield:app-file-read',
  appFileList: 'fellfield:app-file-list',
  appFileRemove: 'fellfield:app-file-remove',
  rememberImagery: 'fellfield:remember-imagery',
  recallImagery: 'fellfield:recall-imagery',
} as const;

export type ChannelKey = keyof typeof CHANNELS;

export interface ReadRangeRequest {
  id: string;
  offset: number;
  length: number;
}

export interface SaveFileRequest {
  suggestedName: string;
  data: Uint8Array | string;
}

export interface DemoFileRequest {
  name: string;
}

export interface AppFileWriteRequest {
  name: string;
  data: Uint8Array | string;
}

export interface AppFileReadRequest {
  name: string;
  /** Absent: the whole file. */
  offset?: number;
  length?: number;
}

export interface AppFileNameRequest {
  name: string;
}

/** Keep these picked files (by their ids) as the site's imagery. */
export interface RememberImageryRequest {
  siteId: string;
  ids: string[];
}

export interface RecallImageryRequest {
  siteId: string;
}

/** Request and response payload of each channel. */
export interface ChannelPayloads {
  pickFiles: { request: PickOptions; response: FileRef[] };
  readRange: { request: ReadRangeRequest; response: Uint8Array };
  saveFile: { request: SaveFileRequest; response: boolean };
  openDemoFile: { request: DemoFileRequest; response: FileRef };
  appFileWrite: { request: AppFileWriteRequest; response: null };
  appFileRead: { request: AppFileReadRequest; response: Uint8Array | null };
  appFileList: { request: Record<string, never>; response: AppFileInfo[] };
  appFileRemove: { request: AppFileNameRequest; response: null };
  rememberImagery: { request: RememberImageryRequest; response: null };
  recallImagery: { request: RecallImageryRequest; response: RecalledFile[] };
}

export type Request<K extends ChannelKey> = ChannelPayloads[K]['request'];
export type Response<K extends ChannelKey> = ChannelPayloads[K]['response'];

export interface BridgeFailure {
  code: PlatformErrorCode;
  message: string;
  file?: string;
}

export type BridgeResult<T> = { ok: true; value: T } | { ok: false; error: BridgeFailure };

/** What the preload exposes on `window[BRIDGE_GLOBAL]`, and nothing else. */
export type BridgeApi = {
  [K in ChannelKey]: (request: Request<K>) => Promise<BridgeResult<Response<K>>>;
};

/** The global name under which the preload exposes the bridge. */
export const BRIDGE_GLOBAL = 'fellfieldBridge';

/** The largest single range read, so one request cannot ask for a whole scene at once. */
export const MAX_RANGE_BYTES = 64 * 1024 * 1024;

/** The largest app file written or read whole in one call (a site copy, a pack of tiles). */
export const MAX_APP_FILE_BYTES = 1024 * 1024 * 1024;

/** The most files one site's imagery memory keeps (a site has a few dates of two files each). */
export const MAX_REMEMBERED_FILES = 64;

/** The longest site id the imagery memory takes. */
export const MAX_SITE_ID = 200;
