import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session } from './browser.ts';
import { layerCanvasStats } from './canvasStats.ts';
import { openRasterFile } from '../test/imagery/nodeRaster.ts';
import { readSiteFile } from '../src/core/export/siteFile.ts';
import { gridOfSummary } from '../src/core/geometry/rasterGrid.ts';
import { countPixels } from '../src/core/pixels/pixelCounts.ts';
import { DEFAULT_BUFFER_M } from '../src/core/pixels/rule.ts';

// The training sheet on the demo site in Chromium: balance, baselines and folds of the
// stored field polygons, worked out by the same core as fellfield pixels and folds; and
// the pure pixels on the desk's map, counted as the core counts them from the site file.

const demo = join(import.meta.dirname, '..', 'demo');

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

  it('draws the pure pixels of the patch in hand on the map (Shift+P), counted as the core counts them', async () => {
    // The patch with the most pure pixels under the default rule, by core/pixels on the site file.
    const { state } = await readSiteFile(readFileSync(join(demo, 'demo.site.json'), 'utf8'), 'demo.site.json');
    const grid = gridOfSummary((await openRasterFile(join(demo, 'ms.tif'))).summary);
    const report = countPixels([...state.patches.values()].map((p) => ({ id: p.id, species: '', rings: p.geometry })), grid, { kind: 'inside', buffer: DEFAULT_BUFFER_M });
    const best = report.patches.reduce((a, b) => (b.pure > a.pure ? b : a));
    expect(best.pure).toBeGreaterThan(2);
    await page.keyboard.press('g');
    await page.keyboard.type(String(best.id));
    await page.keyboard.press('Enter');
    await expect.poll(() => page.locator('[data-testid="patch-in-hand"] .id b').textContent()).toBe(best.id);
    const panel = page.locator('[data-testid="pure-pixels-panel"]');
    await expect.poll(() => panel.locator('[data-testid="pure-count"]').textContent()).toContain(`${best.pure} pure of ${best.touched} touched`);
    const layer = page.locator('.pure-pixels-layer');
    expect(await layer.count()).toBe(0); // not shown until asked
    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    await page.keyboard.press('Shift+P');
    await expect.poll(() => panel.locator('button[aria-pressed="true"]').count()).toBe(1);
    await expect.poll(() => layerCanvasStats(page, '.pure-pixels-layer canvas').then((s) => s.opaqueShare)).toBeGreaterThan(0);
    await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 60_000 });
    await screenshot(page, 'pure-pixels-desk');
    // Another rule redraws them: centre inside keeps at least as many as wholly inside shrunk.
    const before = (await layerCanvasStats(page, '.pure-pixels-layer canvas')).opaqueShare;
    await panel.getByLabel('centre inside').check();
    await expect.poll(() => layerCanvasStats(page, '.pure-pixels-layer canvas').then((s) => s.opaqueShare)).toBeGreaterThan(before);
    await panel.getByLabel('wholly inside, shrunk by').check();
    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    await page.keyboard.press('Shift+P');
    await expect.poll(() => panel.locator('button[aria-pressed="true"]').count()).toBe(0);
    await expect.poll(() => layer.isVisible()).toBe(false);
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
