// The Electron bridge without Electron, for tests: the real main-process router and
// handlers over real folders, reached through an in-process stand-in for the preload (the
// one piece that needs Electron's IPC). Payloads and answers go through structuredClone
// (HTML Standard), as IPC serialises them.
import path from 'node:path';
import { createBridgeHandlers, createBridgeRouter } from '../../electron/bridge-handlers.ts';
import { FileHandleRegistry } from '../../electron/policy/file-handles.ts';
import type { FrameIdentity } from '../../electron/policy/sender.ts';
import { CHANNELS, type BridgeApi, type ChannelKey } from '../../src/platform/channels.ts';

export const MAIN_FRAME: FrameIdentity = { url: 'app://fellfield/index.html', processId: 2, routingId: 1 };

export interface InProcessBridgeOptions {
  /** the folder holding demo/, app-files/ and imagery-memory/ */
  dir: string;
  /** who calls; default the app window's main frame */
  sender?: FrameIdentity;
  /** what the open dialog answers, asked each time it opens */
  pick?: () => string[];
  /** the save dialog's answer for a suggested name; default a file of that name in `dir` */
  save?: (name: string) => string | undefined;
}

/** A bridge as the preload exposes it, over a new registry (a new run of the app). */
export function inProcessBridge(options: InProcessBridgeOptions): BridgeApi {
  const { dir, sender = MAIN_FRAME, pick = () => [], save = (name) => path.join(dir, name) } = options;
  const handlers = createBridgeHandlers({
    registry: new FileHandleRegistry(),
    demoDir: path.join(dir, 'demo'),
    appFilesDir: path.join(dir, 'app-files'),
    imageryMemoryDir: path.join(dir, 'imagery-memory'),
    showOpenDialog: async () => pick(),
    showSaveDialog: async (name) => save(name),
  });
  const route = createBridgeRouter({ handlers, mainFrame: () => MAIN_FRAME });
  const call = (key: ChannelKey) => async (request: unknown) => structuredClone(await route(key, sender, structuredClone(request)));
  return Object.fromEntries((Object.keys(CHANNELS) as ChannelKey[]).map((key) => [key, call(key)])) as BridgeApi;
}
