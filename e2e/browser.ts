import { mkdtempSync, mkdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { inject } from 'vitest';

export const chromiumPath = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
export const artifactsDir = join(import.meta.dirname, 'artifacts');

// Flags for a closed network and no GPU: without the background-networking ones
// Chromium keeps dialling out and failing.
export const chromiumArgs = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--disable-quic',
];

export interface Session {
  context: BrowserContext;
  page: Page;
  profile: string;
  close(): Promise<void>;
}

/** A persistent profile in a fresh folder: real IndexedDB, kept across a relaunch when asked. */
export async function openApp(options: { profile?: string; path?: string; initScript?: () => void } = {}): Promise<Session> {
  const profile = options.profile ?? mkdtempSync(join(tmpdir(), 'fellfield-e2e-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: chromiumPath,
    headless: true,
    args: chromiumArgs,
    viewport: { width: 1280, height: 800 },
  });
  if (options.initScript) await context.addInitScript(options.initScript);
  const page = context.pages()[0] ?? (await context.newPage());
  const problems: string[] = [];
  page.on('pageerror', (error) => problems.push(error.message));
  await page.goto(new URL(options.path ?? '', baseUrl()).href);
  return {
    context,
    page,
    profile,
    async close() {
      await context.close();
      if (!options.profile) rmSync(profile, { recursive: true, force: true });
      if (problems.length) throw new Error(`the page reported errors: ${problems.join('; ')}`);
    },
  };
}

export function baseUrl(): string {
  return inject('appUrl');
}

/** How many patches the desk's patch panel counts. */
export async function patchCount(page: Page): Promise<number> {
  const line = await page.locator('.patch-panel > p.detail').last().textContent();
  return Number(line?.match(/(\d+) patch(?:es)? ·/)?.[1]);
}

export async function screenshot(page: Page, name: string): Promise<Buffer> {
  mkdirSync(artifactsDir, { recursive: true });
  return page.screenshot({ path: join(artifactsDir, `${name}.png`) });
}

export type { Browser };
