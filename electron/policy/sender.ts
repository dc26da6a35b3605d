// Every IPC call must come from the main frame of our own window, showing our origin.
// Frames are identified by (processId, routingId), the pair Electron uses for a frame;
// the URL is checked too, so a main frame that somehow left our origin is refused.

import { isAppUrl } from './app-origin.ts';

export interface FrameIdentity {
  url: string;
  processId: number;
  routingId: number;
}

export type SenderVerdict = { ok: true } | { ok: false; reason: string };

export function checkSender(frame: FrameIdentity | null | undefined, ourMainFrame: FrameIdentity | null | undefined): SenderVerdict {
  if (!ourMainFrame) return { ok: false, reason: 'the app window is not open' };
  if (!frame) return { ok: false, reason: 'the sending frame is gone' };
  if (frame.processId !== ourMainFrame.processId || frame.routingId !== ourMainFrame.routingId) {
    return { ok: false, reason: 'the call did not come from the main frame of the app window' };
  }
  if (!isAppUrl(frame.url)) return { ok: false, reason: 'the sending frame is not showing the app' };
  return { ok: true };
}
