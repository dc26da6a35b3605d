import type { Page } from 'playwright-core';
import { expect } from 'vitest';

// Steps on the desk that several end-to-end checks take the same way.

/** Waits until the map has drawn and every edit is saved. */
export async function deskReady(page: Page): Promise<void> {
  await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 120_000 });
  await page.waitForSelector('text=All saved', { timeout: 60_000 });
}

/** Takes the next untagged patch in hand and calls it PIEX (key 2), unsure (K); returns its id. */
export async function tagNextPatch(page: Page): Promise<string> {
  await page.keyboard.press('u');
  const id = (await page.locator('[data-testid="patch-in-hand"] .id b').textContent())!;
  await page.keyboard.press('2');
  await page.keyboard.press('k');
  await expect.poll(() => page.locator('[data-testid="own-tag"]').innerText(), { timeout: 20_000 }).toMatch(/PIEX, unsure/);
  await page.waitForSelector('text=All saved', { timeout: 20_000 });
  return id;
}
