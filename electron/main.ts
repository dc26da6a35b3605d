// The Electron main process: one window on app://fellfield/, served from dist/, with
// the security policy of electron/policy wired into Electron's hooks. No domain logic.

import { app, BrowserWindow, dialog, ipcMain, protocol, session, type WebContents, type WebFrameMain } from 'electron';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { CHANNELS, type ChannelKey } from '../src/platform/channels.ts';
import { createAppProtocolHandler } from './app-protocol.ts';
import { appFilesDir, sweepPartials } from './app-files.ts';
import { createBridgeHandlers, createBridgeRouter } from './bridge-handlers.ts';
import { imageryMemoryDir } from './imagery-memory.ts';
import { APP_ENTRY_URL, APP_SCHEME, mayLoad, mayNavigate, windowOpenDecision } from './policy/app-origin.ts';
import { FileHandleRegistry } from './policy/file-handles.ts';
import { mayGrantPermission, secureWebPreferences } from './policy/permissions.ts';
import type { FrameIdentity } from './policy/sender.ts';

const here = path.dirname(fileURLToPath(import.meta.url));
const appRoot = app.getAppPath();
const bundleDir = path.join(appRoot, 'dist');
const demoDir = process.env.FELLFIELD_DEMO_DIR ? path.resolve(process.env.FELLFIELD_DEMO_DIR) : path.join(appRoot, 'demo');
const log = (message: string) => console.warn(`[fellfield] ${message}`);

// Standard + secure: relative URLs resolve, and IndexedDB, storage persistence and
// fetch work as on an https origin. Must happen before the app is ready.
protocol.registerSchemesAsPrivileged([
  { scheme: APP_SCHEME, privileges: { standard: true, secure: true, supportFetchAPI: true, corsEnabled: true, stream: true, codeCache: true } },
]);

app.enableSandbox();

let mainWindow: BrowserWindow | undefined;
const ownFiles = appFilesDir(app.getPath('userData'));
const memoryDir = imageryMemoryDir(app.getPath('userData'));
const registry = new FileHandleRegistry();

function frameIdentity(frame: WebFrameMain | null | undefined): FrameIdentity | undefined {
  try {
    return frame ? { url: frame.url, processId: frame.processId, routingId: frame.routingId } : undefined;
  } catch {
    return undefined; // a destroyed frame throws on access
  }
}

function installBridge(): void {
  const handlers = createBridgeHandlers({
    registry,
    appFilesDir: ownFiles,
    imageryMemoryDir: memoryDir,
    log,
    demoDir, // a missing folder is reported on first use, with the command that makes it
    async showOpenDialog(request) {
      if (!mainWindow) return [];
      const result = await dialog.showOpenDialog(mainWindow, {
        title: request.title,
        properties: request.multiple ? ['openFile', 'multiSelections'] : ['openFile'],
        filters: request.extensions.length > 0 ? [{ name: request.extensions.join(', '), extensions: request.extensions }] : [],
      });
      return result.canceled ? [] : result.filePaths;
    },
    async showSaveDialog(suggestedName) {
      if (!mainWindow) return undefined;
      const result = await dialog.showSaveDialog(mainWindow, { defaultPath: suggestedName });
      return result.canceled ? undefined : result.filePath;
    },
  });
  const route = createBridgeRouter({ handlers, mainFrame: () => frameIdentity(mainWindow?.webContents.mainFrame), log });
  for (const key of Object.keys(CHANNELS) as ChannelKey[]) {
    ipcMain.handle(CHANNELS[key], (event, payload: unknown) => route(key, frameIdentity(event.senderFrame), payload));
  }
}

/** Guards every web contents the app ever creates, not only the main window's. */
function guardContents(contents: WebContents): void {
  contents.on('will-navigate', (event) => {
    if (!mayNavigate(event.url)) {
      event.preventDefault();
      log(`blocked navigation to ${event.url}`);
    }
  });
  contents.on('will-frame-navigate', (event) => {
    if (!mayNavigate(event.url)) event.preventDefault();
  });
  contents.on('will-redirect', (event) => {
    if (!mayNavigate(event.url)) event.preventDefault();
  });
  contents.on('will-attach-webview', (event) => event.preventDefault());
  contents.setWindowOpenHandler((details) => {
    log(`blocked a new window for ${details.url}`);
    return windowOpenDecision(details.url);
  });
}

function installSessionPolicy(): void {
  const ses = session.defaultSession;
  ses.setPermissionRequestHandler((_contents, permission, callback, details) => {
    callback(mayGrantPermission(permission, details.requestingUrl));
  });
  ses.setPermissionCheckHandler((_contents, permission, requestingOrigin) => mayGrantPermission(permission, requestingOrigin));
  ses.setDevicePermissionHandler(() => false);
  // No remote content: only our scheme and in-page data/blob URLs may load at all.
  ses.webRequest.onBeforeRequest((details, callback) => {
    const allowed = mayLoad(details.url);
    if (!allowed) log(`blocked a request for ${details.url}`);
    callback({ cancel: !allowed });
  });
  ses.protocol.handle(APP_SCHEME, createAppProtocolHandler({ root: bundleDir, log }));
}

function createWindow(): void {
  mainWindow = new BrowserWindow({
    width: 1400,
    height: 900,
    title: 'Fellfield',
    show: false,
    webPreferences: secureWebPreferences(path.join(here, 'preload.cjs')),
  });
  mainWindow.once('ready-to-show', () => mainWindow?.show());
  mainWindow.on('closed', () => {
    mainWindow = undefined;
    registry.clear();
  });
  void mainWindow.loadURL(APP_ENTRY_URL);
}

app.on('web-contents-created', (_event, contents) => guardContents(contents));
app.on('window-all-closed', () => app.quit());

void app.whenReady().then(async () => {
  if (!existsSync(path.join(bundleDir, 'index.html'))) {
    dialog.showErrorBox('Fellfield', `The app is not built: ${path.join(bundleDir, 'index.html')} is missing. Run \`npm run build\`.`);
    app.quit();
    return;
  }
  // Writes cut short by a crash left temporary files; the files they were replacing are whole.
  const swept = [...await sweepPartials(ownFiles), ...await sweepPartials(memoryDir)];
  if (swept.length) log(`removed ${swept.length} unfinished write(s) from ${ownFiles} and ${memoryDir}`);
  installSessionPolicy();
  installBridge();
  createWindow();
});
