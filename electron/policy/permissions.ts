// Browser permissions (camera, geolocation, notifications, ...) are all denied, for
// requests and for checks alike. The one exception is 'persistent-storage' for the
// app's own origin: it only asks that the app's IndexedDB not be evicted under storage
// pressure, which is what keeps a site's patches and ledger safe on disk.

import { isAppUrl } from './app-origin.ts';

export function mayGrantPermission(permission: string, requestingUrl: unknown): boolean {
  return permission === 'persistent-storage' && isAppUrl(requestingUrl);
}

/** The renderer's web preferences: isolated, sandboxed, no Node, web security on. */
export function secureWebPreferences(preloadPath: string) {
  return {
    preload: preloadPath,
    contextIsolation: true,
    sandbox: true,
    nodeIntegration: false,
    nodeIntegrationInWorker: false,
    nodeIntegrationInSubFrames: false,
    webSecurity: true,
    allowRunningInsecureContent: false,
    webviewTag: false,
    navigateOnDragDrop: false,
    spellcheck: false,
    safeDialogs: true,
  } as const;
}
