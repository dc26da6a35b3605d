// The platform bridge: the Electron implementation when the preload's API is present,
// the plain browser one otherwise. One instance per page.

import { BRIDGE_GLOBAL, type BridgeApi } from './channels.ts';
import { BrowserPlatform } from './browser.ts';
import { ElectronPlatform } from './electron.ts';
import type { Platform } from './types.ts';

export type { AppFileInfo, AppFiles, FileRef, FolderGrant, FolderState, PickOptions, Platform } from './types.ts';
export { PlatformError, type PlatformErrorCode } from './errors.ts';
export { readWholeFile, readText } from './read-whole.ts';

let current: Platform | undefined;

export function getPlatform(): Platform {
  current ??= choosePlatform(globalThis as Record<string, unknown>);
  return current;
}

/** Picks the implementation for a given global object (exported for tests). */
export function choosePlatform(scope: Record<string, unknown>): Platform {
  const bridge = scope[BRIDGE_GLOBAL] as BridgeApi | undefined;
  if (bridge && typeof bridge === 'object' && typeof bridge.readRange === 'function') {
    return new ElectronPlatform(bridge);
  }
  return new BrowserPlatform();
}
