import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session } from './browser.ts';

// The training sheet on the demo site in Chromium: balance, baselines and folds of the
// stored field polygons, worked out by the same core as fellfield pixels and folds.

let session: Session;
let page: Page;

describe('training sheet', () => {
  beforeAll(async () => {
    session = await openApp();
    page = session.page;
    await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 60_000 });
  });
  afterAll(async () => {
    await session?.close();
  });

  it('shows balance, baselines and folds for the demo, and follows the scheme', async () => {
    await page.getByRole('button', { name: 'Training sheet' }).click();
    await page.getByRole('button', { name: 'Work it out' }).click();
    const sheet = page.getByRole('region', { name: 'Training sheet' });
    await expect.poll(() => sheet.locator('table').count(), { timeout: 30_000 }).toBe(2);
    const classes = await sheet.locator('table').first().locator('tbody tr').count();
    expect(classes).toBeGreaterThanOrEqual(5);
    await expect.poll(() => sheet.locator('.baselines').innerText()).toMatch(/always calling \w+ \(\d+\.\d % of pixels right\)/);
    expect(await sheet.locator('table').nth(1).locator('tbody tr').count()).toBe(5);
    await screenshot(page, 'training-sheet');
    await sheet.getByLabel('conifers by species, the rest as other').check();
    await page.getByRole('button', { name: 'Work it out' }).click();
    await expect.poll(() => sheet.locator('h2').first().innerText()).toMatch(/conifers by species, the rest as other/);
    await expect.poll(() => sheet.locator('table').first().innerText()).toMatch(/\bother\b/);
  });
});
