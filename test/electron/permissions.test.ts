// Permission requests and checks are denied (Electron security checklist, "Handle
// session permission requests from remote content"); web preferences follow the same
// checklist: context isolation, sandbox, no Node integration, web security, no webview.
import { describe, expect, it } from 'vitest';
import { mayGrantPermission, secureWebPreferences } from '../../electron/policy/permissions.ts';

// Permission names as Electron 45's session handlers type them (node_modules/electron/electron.d.ts).
const PERMISSIONS = ['ar', 'clipboard-read', 'clipboard-sanitized-write', 'display-capture', 'fileSystem', 'fullscreen',
  'geolocation', 'hid', 'idle-detection', 'media', 'mediaKeySystem', 'midi', 'midiSysex', 'notifications', 'openExternal',
  'pointerLock', 'serial', 'storage-access', 'usb', 'window-management', 'unknown'];

describe('permissions', () => {
  it('denies every permission to our own origin and to any other', () => {
    for (const permission of PERMISSIONS) {
      expect(mayGrantPermission(permission, 'app://fellfield/index.html'), permission).toBe(false);
      expect(mayGrantPermission(permission, 'https://example.org/'), permission).toBe(false);
    }
  });

  it('grants persistent storage to the app origin only', () => {
    expect(mayGrantPermission('persistent-storage', 'app://fellfield/index.html')).toBe(true);
    expect(mayGrantPermission('persistent-storage', 'app://fellfield')).toBe(true); // checks pass an origin
    expect(mayGrantPermission('persistent-storage', 'app://fellfield.evil/')).toBe(false);
    expect(mayGrantPermission('persistent-storage', 'https://example.org/')).toBe(false);
    expect(mayGrantPermission('persistent-storage', undefined)).toBe(false);
  });

  it('builds isolated, sandboxed web preferences', () => {
    const prefs = secureWebPreferences('/app/dist-electron/preload.cjs');
    expect(prefs).toMatchObject({
      preload: '/app/dist-electron/preload.cjs',
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      webviewTag: false,
    });
  });
});
