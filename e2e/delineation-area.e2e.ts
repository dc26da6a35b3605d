import { afterAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { layerCanvasStats } from './canvasStats.ts';
import { openApp, screenshot, type Session, patchCount } from './browser.ts';

// An independent delineation with its area drawn on the map before it starts: the area
// is no patch, it is kept with the pass, the second interpreter draws inside it, and the
// agreement sheet compares within that area.

let session: Session | null = null;
afterAll(async () => {
  await session?.close();
});

async function mapReady(page: Page) {
  await page.waitForTimeout(150);
  await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 90_000 });
}
async function clickOutline(page: Page, corners: [number, number][]) {
  for (const [x, y] of [...corners, corners[0]]) {
    await page.mouse.click(x, y);
    await page.waitForTimeout(120);
  }
}

describe('a delineation within a drawn area', () => {
  it('keeps the area with the pass and compares within it', async () => {
    session = await openApp();
    const { page } = session;
    await mapReady(page);
    await expect.poll(() => patchCount(page), { timeout: 30_000 }).toBe(225);
    for (let i = 0; i < 2; i++) {
      await page.click('.ol-zoom-in');
      await page.waitForTimeout(350);
    }
    await mapReady(page);

    const panel = page.locator('[data-testid="blind-panel"]');
    await panel.locator('input[aria-label="Second interpreter"]').fill('Dee Draw');
    await panel.locator('[data-testid="delineation-area"]').click();
    await clickOutline(page, [[200, 150], [700, 150], [700, 650], [200, 650]]);
    await expect.poll(() => panel.locator('[role="status"]').textContent()).toMatch(/^Area to delineate drawn: /);
    expect(await patchCount(page)).toBe(225); // the area is not a patch
    const areaDrawn = () => layerCanvasStats(page, '.area-layer canvas').then((s) => s.opaqueShare);
    await expect.poll(areaDrawn).toBeGreaterThan(0.001); // shown on the map before the pass starts
    await panel.locator('button:has-text("Start a delineation")').click();
    await expect.poll(() => panel.locator('[role="status"]').textContent()).toMatch(/^Delineation draw-dee-draw-1 for Dee Draw: they draw the patches within the area drawn/);

    await panel.locator('input[aria-label="New interpreter name"]').fill('Dee Draw');
    await panel.locator('input[aria-label="New interpreter initials"]').fill('DD');
    await panel.locator('button:has-text("Add")').click();
    await expect.poll(() => page.locator('[data-testid="blind-mine"]').count()).toBe(1);
    await expect.poll(() => patchCount(page)).toBe(0);
    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    await page.keyboard.press('a');
    await clickOutline(page, [[400, 350], [470, 350], [470, 420], [400, 420]]);
    await expect.poll(() => patchCount(page)).toBe(1);
    await page.keyboard.press('Escape');
    await page.keyboard.press('1');
    await expect.poll(() => page.locator('[data-testid="save-status"]').textContent()).toContain('All saved');
    expect(await areaDrawn()).toBeGreaterThan(0.001); // and to the one delineating, from the pass
    await screenshot(page, 'delineation-area-drawn');
    await page.locator('[data-testid="blind-mine"] button:has-text("End the pass")').click();
    await expect.poll(() => page.locator('[data-testid="blind-mine"]').count()).toBe(0);
    await expect.poll(areaDrawn).toBe(0);

    await page.locator('nav button:has-text("Agreement sheet")').click();
    const sheet = page.locator('[data-testid="agreement-sheet"]');
    await sheet.locator('select[aria-label="First pass"]').selectOption('field');
    await sheet.locator('select[aria-label="Second pass"]').selectOption('draw-dee-draw-1');
    await expect.poll(() => sheet.locator('[data-testid="delineation-within"]').textContent()).toContain('the area drawn for the delineation');
    await screenshot(page, 'delineation-area-sheet');
  });
});
