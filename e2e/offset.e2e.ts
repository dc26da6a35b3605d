import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session } from './browser.ts';

// The field shift on the demo desk: estimate it for the imported field polygons, see it
// close to the generator's known shift (demo/truth.json), apply it and see the stored
// outlines move, undo and see them back exactly where they were.

let session: Session;
let page: Page;
const truth = JSON.parse(readFileSync(join(import.meta.dirname, '..', 'demo', 'truth.json'), 'utf8')) as {
  offset: { dx: number; dy: number }; grid: { panPixel: number };
};

async function mapReady() {
  await page.waitForTimeout(200);
  await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 90_000 });
}

/** A digest of the stored patches' canvases: equal when the same outlines are drawn in the same view. */
const patchPixels = () => page.evaluate(() => {
  let h = 0;
  let ink = 0;
  for (const canvas of document.querySelectorAll<HTMLCanvasElement>('.stored-patches-layer canvas')) {
    const data = canvas.getContext('2d')!.getImageData(0, 0, canvas.width, canvas.height).data;
    for (let i = 3; i < data.length; i += 4) {
      if (data[i] > 0) ink++;
      h = (Math.imul(h, 31) + data[i - 1] * 7 + data[i - 2] * 3 + data[i - 3] + data[i]) | 0;
    }
  }
  return { h, ink };
});

const direction = () => page.locator('[data-testid="offset-applied"] li').last().getAttribute('data-direction');

describe('the field shift on the desk', () => {
  beforeAll(async () => {
    session = await openApp();
    page = session.page;
    await mapReady();
    await page.waitForSelector('[data-testid="offset-panel"]', { timeout: 60_000 });
  });
  afterAll(async () => {
    await session?.close();
  });

  it('estimates the shift of the imported polygons close to the demo truth, and moves nothing', async () => {
    const panel = page.locator('[data-testid="offset-panel"]');
    await panel.locator('summary').first().click();
    await expect.poll(() => panel.locator('select').first().inputValue()).toMatch(/^import:/);
    const before = await patchPixels();
    await panel.getByLabel(/also a shift per area/).check();
    await panel.locator('button', { hasText: /^Estimate for 225 patches$/ }).click();
    const result = page.locator('[data-testid="offset-result"]');
    await result.waitFor({ timeout: 150_000 });
    expect(await result.getAttribute('data-reliable')).toBe('true');
    const dx = Number(await result.getAttribute('data-dx'));
    const dy = Number(await result.getAttribute('data-dy'));
    const uncertainty = Number(await result.getAttribute('data-uncertainty'));
    // Issue 9: within a quarter of a panchromatic pixel, with an uncertainty that covers the truth.
    const error = Math.hypot(dx - truth.offset.dx, dy - truth.offset.dy);
    expect(error).toBeLessThan(truth.grid.panPixel / 4);
    expect(error).toBeLessThanOrEqual(uncertainty);
    await expect.poll(() => result.innerText()).toMatch(/m west, 1\.5\d m north/);
    expect(await page.locator('[data-testid="offset-applied"]').count()).toBe(0);
    expect(await patchPixels()).toEqual(before);
    // The shift per area: four cells, each judged against the common shift.
    expect(await page.locator('[data-testid="offset-areas"]').innerText()).toMatch(/^(One shift fits every area|One shift does not fit every area|Too few areas)/);
    expect(await panel.locator('ul.areas li').count()).toBe(4);
    await page.locator('[data-testid="offset-heat"]').scrollIntoViewIfNeeded();
    await screenshot(page, 'offset-estimate');
    await page.locator('[data-testid="offset-areas"]').scrollIntoViewIfNeeded();
    await screenshot(page, 'offset-areas');
  });

  it('applies it: the stored outlines move, drawn beside the field outlines', async () => {
    // Go to a field polygon (the centre of the basin is a lake), close enough that
    // outlines are drawn one by one, then let go of it so the look stays the same.
    await page.locator('input[placeholder^="Go to a patch id"]').fill('F001');
    await page.keyboard.press('Enter');
    await page.waitForTimeout(1000);
    await page.locator('[data-testid="map"]').hover();
    await page.keyboard.press('Escape');
    await page.keyboard.press('Escape');
    await mapReady();
    const before = await patchPixels();
    expect(before.ink).toBeGreaterThan(0);
    // The preview: where the field put the polygon (dashed) and where the shift would put it.
    expect(await page.locator('.offset-layer canvas').count()).toBeGreaterThan(0);
    await screenshot(page, 'offset-preview');
    await page.locator('[data-testid="offset-apply"]').click();
    await expect.poll(direction, { timeout: 30_000 }).toBe('apply');
    await expect.poll(() => page.locator('[data-testid="offset-apply"]').innerText()).toBe('Applied');
    await mapReady();
    await expect.poll(async () => (await patchPixels()).h, { timeout: 20_000 }).not.toBe(before.h);
    await screenshot(page, 'offset-applied');

    // Undo (one step for the whole set): every outline back where it was, pixel for pixel.
    await page.locator('[data-testid="map"]').hover();
    await page.keyboard.press('Control+z');
    await expect.poll(direction, { timeout: 30_000 }).toBe('restore');
    await mapReady();
    await expect.poll(async () => (await patchPixels()).h, { timeout: 20_000 }).toBe(before.h);
    await expect.poll(() => page.locator('[data-testid="offset-panel"] .notice').innerText()).toMatch(/Undone: 225 patches back where the field put them/);
    expect(await page.locator('[data-testid="offset-apply"]').isEnabled()).toBe(true);
    await screenshot(page, 'offset-undone');

    // Redo, then put the originals back with the button: back again, and the shift listed as restored.
    await page.keyboard.press('Control+Shift+z');
    await expect.poll(direction, { timeout: 30_000 }).toBe('apply');
    await page.locator('[data-testid="offset-applied"] button', { hasText: 'Restore originals' }).click();
    await expect.poll(direction, { timeout: 30_000 }).toBe('restore');
    await mapReady();
    await expect.poll(async () => (await patchPixels()).h, { timeout: 20_000 }).toBe(before.h);
  });

  it('says plainly when the radius does not fit the scene, and a cancelled estimate leaves nothing behind', async () => {
    const panel = page.locator('[data-testid="offset-panel"]');
    const radius = panel.locator('input[aria-label="Search radius in metres"]');
    const estimate = panel.locator('button', { hasText: /^Estimate for/ });
    await radius.fill('5000');
    await estimate.click();
    await expect.poll(() => panel.locator('.problem').innerText(), { timeout: 20_000 }).toMatch(/^Search radius 5000 m: it must be above 0 and under half the scene's side \(\d+\.\d m\)\.$/);
    expect(await page.locator('[data-testid="offset-result"]').count()).toBe(0);

    // A wide search takes a while; cancel it as soon as it shows progress.
    await radius.fill('8');
    await estimate.click();
    await panel.locator('button', { hasText: /^Cancel$/ }).click();
    await expect.poll(() => panel.locator('[role="status"].progress').count()).toBe(0);
    await page.waitForTimeout(1500);
    expect(await page.locator('[data-testid="offset-result"]').count()).toBe(0);
    expect(await panel.locator('.problem').allInnerTexts()).toEqual([]);
    expect(await estimate.isEnabled()).toBe(true);
  });
});
