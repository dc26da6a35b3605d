import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session } from './browser.ts';

// The demo's field polygons carry findings of their own (small crowns, a few overlapping
// outlines). A fix is one click and an ordinary edit: undo brings the finding back.

let session: Session;
let page: Page;

const total = async () => Number(await page.locator('.findings h2 .total').innerText());
const groupCount = async (title: string) => {
  const summary = page.locator('.findings summary', { hasText: title });
  return (await summary.count()) ? Number(await summary.locator('.count').innerText()) : 0;
};

describe('findings on the desk', () => {
  beforeAll(async () => {
    session = await openApp();
    page = session.page;
    await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 60_000 });
    await page.waitForFunction(() => Number(document.querySelector('.findings h2 .total')?.textContent ?? 0) > 0, null, { timeout: 60_000 });
  });
  afterAll(async () => {
    await session?.close();
  });

  it('lists the seeded findings by kind, with counts that add up', async () => {
    const counts = await page.locator('.findings summary .count').allInnerTexts();
    expect(counts.map(Number).reduce((a, b) => a + b, 0)).toBe(await total());
    expect(await groupCount('Overlaps of one species')).toBeGreaterThan(0);
    await screenshot(page, 'findings-list');
  });

  it('fixes an overlap with one click, and undo brings it back', async () => {
    const before = await groupCount('Overlaps of one species');
    const group = page.locator('.findings details', { hasText: 'Overlaps of one species' });
    await group.locator('summary').click();
    await group.locator('li').first().locator('button.fix').click();
    await expect.poll(() => groupCount('Overlaps of one species'), { timeout: 20_000 }).toBe(before - 1);
    await expect.poll(() => page.locator('.findings .notice').innerText()).toMatch(/Ctrl\+Z/);
    await screenshot(page, 'findings-fixed');
    await page.locator('body').click({ position: { x: 5, y: 300 } }).catch(() => {});
    await page.keyboard.press('Control+z');
    await expect.poll(() => groupCount('Overlaps of one species'), { timeout: 20_000 }).toBe(before);
  });

  it('steps through findings with X and brings each to the map', async () => {
    await page.keyboard.press('Escape');
    await page.keyboard.press('x');
    await expect.poll(() => page.locator('.findings li.current').count()).toBe(1);
    await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 30_000 });
    await screenshot(page, 'findings-step');
  });
});
