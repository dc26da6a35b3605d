// Every IPC handler checks its sender frame (Electron security checklist, item
// "Validate the sender of all IPC messages", https://www.electronjs.org/docs/latest/tutorial/security).
import { describe, expect, it } from 'vitest';
import { checkSender, type FrameIdentity } from '../../electron/policy/sender.ts';

const main: FrameIdentity = { url: 'app://fellfield/index.html', processId: 4, routingId: 1 };

describe('the sender check', () => {
  it('accepts the main frame of our window showing our origin', () => {
    expect(checkSender({ ...main }, main)).toEqual({ ok: true });
    expect(checkSender({ ...main, url: 'app://fellfield/index.html#desk' }, main)).toEqual({ ok: true });
  });

  it('refuses a subframe, another window or another process', () => {
    expect(checkSender({ ...main, routingId: 7 }, main).ok).toBe(false);
    expect(checkSender({ ...main, processId: 5 }, main).ok).toBe(false);
  });

  it('refuses our main frame once it shows another origin', () => {
    for (const url of ['https://example.org/', 'app://fellfield.evil/', 'file:///tmp/x.html', 'about:blank']) {
      const verdict = checkSender({ ...main, url }, { ...main, url });
      expect(verdict, url).toEqual({ ok: false, reason: 'the sending frame is not showing the app' });
    }
  });

  it('refuses when the frame is gone or no window is open', () => {
    expect(checkSender(null, main)).toEqual({ ok: false, reason: 'the sending frame is gone' });
    expect(checkSender(main, undefined)).toEqual({ ok: false, reason: 'the app window is not open' });
  });
});
