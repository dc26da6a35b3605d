import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session } from './browser.ts';
import { layerCanvasStats } from './canvasStats.ts';

// The first screen of the demo site: imagery drawn on the map, field polygons over it.

let session: Session;
let page: Page;

async function mapReady() {
  await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 60_000 });
}

describe('the demo site on first start', () => {
  beforeAll(async () => {
    session = await openApp();
    page = session.page;
    await mapReady();
  });
  afterAll(async () => {
    await session?.close();
  });

  it('draws the natural-colour composite, not a blank map', async () => {
    await screenshot(page, 'first-screen-natural');
    const imagery = await layerCanvasStats(page, '.ol-layer canvas');
    // A blank, black or single-colour canvas has next to no variance.
    expect(imagery.opaqueShare).toBeGreaterThan(0.3);
    expect(imagery.lumaStdDev).toBeGreaterThan(10);
  });

  it('draws the field polygons over the imagery', async () => {
    const patches = await layerCanvasStats(page, '.patches-layer canvas');
    const count = await page.locator('.roster .count').allTextContents();
    const listed = count.reduce((sum, n) => sum + Number(n), 0);
    expect(listed).toBeGreaterThan(50);
    // Outlines cover a small but clear share of the map, in the roster's colours.
    expect(patches.opaqueShare).toBeGreaterThan(0.001);
    expect(patches.opaqueShare).toBeLessThan(0.5);
    expect(patches.distinctHues).toBeGreaterThanOrEqual(3);
  });

  it('switches to the panchromatic view by key, and it looks different', async () => {
    const natural = await layerCanvasStats(page, '.ol-layer canvas');
    await page.keyboard.press('p');
    await expect.poll(() => page.getAttribute('button:has-text("Panchromatic")', 'aria-pressed')).toBe('true');
    await mapReady();
    await screenshot(page, 'first-screen-pan');
    const pan = await layerCanvasStats(page, '.ol-layer canvas');
    expect(pan.lumaStdDev).toBeGreaterThan(10);
    expect(pan.meanSaturation).toBeLessThan(2); // grey
    expect(natural.meanSaturation).toBeGreaterThan(pan.meanSaturation + 5);
  });

  it('shows the late-season date with D', async () => {
    await page.keyboard.press('n');
    await mapReady();
    const early = await layerCanvasStats(page, '.ol-layer canvas');
    await page.keyboard.press('d');
    await expect.poll(() => page.getAttribute('button:has-text("2025-09")', 'aria-pressed')).toBe('true');
    await mapReady();
    await screenshot(page, 'first-screen-late');
    const late = await layerCanvasStats(page, '.ol-layer canvas');
    expect(late.lumaStdDev).toBeGreaterThan(10);
    expect(Math.abs(late.meanRed - early.meanRed) + Math.abs(late.meanGreen - early.meanGreen)).toBeGreaterThan(0.5);
  });

  it('zooms to full resolution with =, and goes over the scene a screen at a time with Shift+arrows', async () => {
    await page.keyboard.press('=');
    await mapReady();
    // The scale line's length on screen and the distance it names give metres per screen
    // pixel: the demo's panchromatic pixel is 0.3 m (demo manifest).
    const scale = await page.locator('.ol-scale-line-inner').evaluate((el) => ({ text: el.textContent ?? '', width: parseFloat((el as HTMLElement).style.width) }));
    const metres = Number(/([\d.]+)\s*m$/.exec(scale.text)?.[1]);
    expect(metres / scale.width).toBeCloseTo(0.3, 2);
    const here = await layerCanvasStats(page, '.ol-layer canvas');
    await page.keyboard.press('Shift+ArrowRight');
    await mapReady();
    await screenshot(page, 'first-screen-step');
    const next = await layerCanvasStats(page, '.ol-layer canvas');
    expect(next.lumaStdDev).toBeGreaterThan(10);
    expect(Math.abs(next.meanRed - here.meanRed) + Math.abs(next.meanGreen - here.meanGreen) + Math.abs(next.lumaStdDev - here.lumaStdDev)).toBeGreaterThan(0.5);
    await page.keyboard.press('Shift+ArrowLeft');
    await mapReady();
    const back = await layerCanvasStats(page, '.ol-layer canvas');
    expect(Math.abs(back.meanRed - here.meanRed) + Math.abs(back.meanGreen - here.meanGreen) + Math.abs(back.lumaStdDev - here.lumaStdDev)).toBeLessThan(0.05);
  });
});
