import { spawn, type ChildProcess } from 'node:child_process';
import { chromium, type Browser } from 'playwright-core';
import { chromiumArgs, chromiumPath } from '../browser.ts';

// Chromium started by us on a persistent profile, so the test holds the browser
// process's PID and can SIGKILL it mid-write, like a power cut or a crash would.

export interface KillableBrowser {
  browser: Browser;
  pid: number;
  kill(): void;
  exited: Promise<void>;
}

const running = new Set<number>();

/** Kills every browser this module started that is still running (after a timed-out test). */
export function killAllLaunched(): void {
  for (const pid of running) {
    try {
      process.kill(-pid, 'SIGKILL');
    } catch {
      // already gone
    }
  }
  running.clear();
}

export async function launchKillable(profile: string): Promise<KillableBrowser> {
  const child: ChildProcess = spawn(chromiumPath, [
    ...chromiumArgs, '--headless=new', `--user-data-dir=${profile}`, '--remote-debugging-port=0', 'about:blank',
  ], { stdio: ['ignore', 'ignore', 'pipe'], detached: true });
  running.add(child.pid!);
  const exited = new Promise<void>((resolve) => child.once('exit', () => {
    running.delete(child.pid!);
    resolve();
  }));
  const wsUrl = await new Promise<string>((resolve, reject) => {
    let text = '';
    const timer = setTimeout(() => reject(new Error(`Chromium did not start: ${text.slice(-500)}`)), 30_000);
    child.stderr!.on('data', (chunk: Buffer) => {
      text += chunk.toString();
      const match = /DevTools listening on (ws:\/\/\S+)/.exec(text);
      if (match) {
        clearTimeout(timer);
        resolve(match[1]);
      }
    });
    child.once('exit', (code) => reject(new Error(`Chromium exited (${code}) before it listened: ${text.slice(-500)}`)));
  });
  child.stderr!.resume();
  const browser = await chromium.connectOverCDP(wsUrl);
  const pid = child.pid!;
  return {
    browser,
    pid,
    exited,
    kill() {
      try {
        process.kill(pid, 'SIGKILL'); // the browser process itself
        process.kill(-pid, 'SIGKILL'); // and its renderers and helpers, in its process group
      } catch {
        // already gone
      }
    },
  };
}
