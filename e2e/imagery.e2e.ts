import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { fromFile } from 'geotiff';
import { openApp, screenshot, type Session } from './browser.ts';
import { blur, mapReady, meanAbsDiff, percentileByRank } from './imageryChecks.ts';
import { layerCanvasStats } from './canvasStats.ts';

// The imagery views of the demo site: composites, stretch, pan-sharpening, an index and
// two dates; each screenshot differs from the others and none is blank. The pixel
// inspector's numbers are checked against the demo files read here with geotiff.js
// (an outside reader, npm geotiff 3.0.5) and the stretch and NDVI formulas worked by hand.

const demo = join(import.meta.dirname, '..', 'demo');
let session: Session;
let page: Page;

/** A coarse colour signature of the imagery canvas: mean RGB of 32 x 20 cells. */
function signature(): Promise<number[]> {
  return page.evaluate(() => {
    const canvas = [...document.querySelectorAll<HTMLCanvasElement>('.imagery-layer canvas')].find((c) => c.width > 0)!;
    const { width, height } = canvas;
    const data = canvas.getContext('2d')!.getImageData(0, 0, width, height).data;
    const cells = new Array(32 * 20 * 3).fill(0);
    const counts = new Array(32 * 20).fill(0);
    for (let y = 0; y < height; y += 2) {
      for (let x = 0; x < width; x += 2) {
        const i = (y * width + x) * 4;
        if (data[i + 3] === 0) continue;
        const cell = Math.floor((y / height) * 20) * 32 + Math.floor((x / width) * 32);
        counts[cell]++;
        for (let c = 0; c < 3; c++) cells[cell * 3 + c] += data[i + c];
      }
    }
    return cells.map((v, i) => (counts[Math.floor(i / 3)] ? v / counts[Math.floor(i / 3)] : 0));
  });
}

describe('imagery views of the demo site', () => {
  const views: Record<string, number[]> = {};

  beforeAll(async () => {
    session = await openApp();
    page = session.page;
    await mapReady(page);
  });
  afterAll(async () => {
    await session?.close();
  });

  async function capture(name: string) {
    await mapReady(page);
    await screenshot(page, `imagery-${name}`);
    const stats = await layerCanvasStats(page, '.imagery-layer canvas');
    expect(stats.opaqueShare, `${name} is blank`).toBeGreaterThan(0.3);
    expect(stats.lumaStdDev, `${name} is flat`).toBeGreaterThan(8);
    views[name] = await signature();
  }

  it('shows natural colour, colour infrared, a changed stretch, the pan-sharpened composite and NDVI, each its own', async () => {
    await page.keyboard.press('n');
    await capture('natural');
    await page.keyboard.press('c');
    await expect.poll(() => page.getAttribute('button:has-text("Colour infrared")', 'aria-pressed')).toBe('true');
    await capture('infrared');
    await page.keyboard.press('n');
    await page.selectOption('select[aria-label="Stretch rule"]', 'stddev');
    await page.fill('input[aria-label="Gamma"]', '1.8');
    await page.dispatchEvent('input[aria-label="Gamma"]', 'input');
    await blur(page);
    await capture('stretch-sd-gamma');
    await page.selectOption('select[aria-label="Stretch rule"]', 'percentile');
    await page.fill('input[aria-label="Gamma"]', '1');
    await page.dispatchEvent('input[aria-label="Gamma"]', 'input');
    await blur(page);
    await page.keyboard.press('s');
    await expect.poll(() => page.getAttribute('button:has-text("Sharpened")', 'aria-pressed')).toBe('true');
    await capture('sharpened');
    await page.keyboard.press('v');
    await capture('ndvi');
    await page.keyboard.press('m');
    await capture('ndvi-vegetation-only');
    const names = Object.keys(views);
    for (let i = 0; i < names.length; i++) {
      for (let j = i + 1; j < names.length; j++) {
        expect(meanAbsDiff(views[names[i]], views[names[j]]), `${names[i]} against ${names[j]}`).toBeGreaterThan(2);
      }
    }
    const masked = await layerCanvasStats(page, '.imagery-layer canvas');
    const full = await (async () => {
      await page.keyboard.press('m');
      await mapReady(page);
      return layerCanvasStats(page, '.imagery-layer canvas');
    })();
    expect(masked.opaqueShare).toBeLessThan(full.opaqueShare - 0.05); // bare ground and snow left out
  });

  it('swipes the late date across the early one', async () => {
    await page.keyboard.press('n');
    await mapReady(page);
    await page.keyboard.press('w');
    await expect.poll(() => page.getAttribute('button:has-text("Swipe")', 'aria-pressed')).toBe('true');
    await mapReady(page);
    // The late date fills the left part of the map only (its layer may draw a frame after
    // the main one is complete).
    await expect.poll(async () => (await layerCanvasStats(page, '.imagery-compare canvas')).opaqueShare, { timeout: 10_000 }).toBeGreaterThan(0.1);
    await screenshot(page, 'imagery-swipe');
    const compare = await layerCanvasStats(page, '.imagery-compare canvas');
    expect(compare.opaqueShare).toBeLessThan(0.6);
    await page.keyboard.press('w');
    await mapReady(page);
  });

  it('flickers between the dates: the late date comes and goes', async () => {
    await page.keyboard.press('b');
    await expect.poll(() => page.getAttribute('button:has-text("Flicker")', 'aria-pressed')).toBe('true');
    await mapReady(page);
    const seen = new Set<boolean>();
    for (let i = 0; i < 16; i++) {
      seen.add(await page.evaluate(() => {
        const layer = document.querySelector<HTMLElement>('.imagery-compare');
        return Boolean(layer && layer.isConnected && getComputedStyle(layer).display !== 'none' && layer.querySelector('canvas'));
      }));
      await page.waitForTimeout(200);
    }
    expect([...seen].sort()).toEqual([false, true]);
    await page.keyboard.press('b');
    await expect.poll(() => page.getAttribute('button:has-text("Flicker")', 'aria-pressed')).toBe('false');
  });

  it('inspects a pixel: the values geotiff.js reads there, stretched by the 2-98 % of the overview, and its NDVI', async () => {
    await page.keyboard.press('n');
    const box = (await page.locator('[data-testid="map"]').boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.4, box.y + box.height * 0.55);
    const inspector = page.locator('[data-testid="pixel-inspector"]');
    await expect.poll(() => inspector.locator('[data-testid="pixel-ms"] tr[data-band="8"] td.shown').textContent(), { timeout: 30_000 }).toMatch(/^\d+$/);
    await screenshot(page, 'imagery-inspector');

    const coords = (await inspector.locator('[data-testid="pixel-coords"]').textContent())!;
    const [east, north] = [...coords.matchAll(/([\d,]+\.\d)/g)].map((m) => Number(m[1].replace(/,/g, '')));
    const position = (await inspector.locator('[data-testid="pixel-ms-position"]').textContent())!;
    const [, row, col] = /row (\d+), column (\d+)/.exec(position)!.map(Number);

    const tiff = await fromFile(join(demo, 'ms.tif'));
    const image = await tiff.getImage(0);
    const [ox, oy] = image.getOrigin();
    const [rx, ry] = image.getResolution();
    // The shown coordinates (to 0.1 m) lie in the pixel the inspector names.
    expect(east).toBeGreaterThanOrEqual(ox + col * rx - 0.05);
    expect(east).toBeLessThanOrEqual(ox + (col + 1) * rx + 0.05);
    expect(north).toBeLessThanOrEqual(oy + row * ry + 0.05);
    expect(north).toBeGreaterThanOrEqual(oy + (row + 1) * ry - 0.05);

    const raster = (await image.readRasters({ window: [col, row, col + 1, row + 1] })) as unknown as ArrayLike<number>[];
    const expectedRaw = Array.from({ length: 8 }, (_, b) => raster[b][0]);
    const rows = inspector.locator('[data-testid="pixel-ms"] tbody tr');
    const shownRaw = (await rows.locator('td.raw').allTextContents()).map(Number);
    const shownStretched = (await rows.locator('td.shown').allTextContents()).map(Number);
    expect(shownRaw).toEqual(expectedRaw);

    // The default stretch: 2-98 % of the 256 x 256 overview, then round(255 t).
    const overview = await tiff.getImage(2);
    expect(overview.getWidth()).toBe(256);
    const bands = (await overview.readRasters()) as unknown as ArrayLike<number>[];
    for (let b = 0; b < 8; b++) {
      const sorted = Float64Array.from(bands[b]).sort();
      const min = percentileByRank(sorted, 2), max = percentileByRank(sorted, 98);
      const t = (expectedRaw[b] - min) / (max - min);
      expect(shownStretched[b], `band ${b + 1}`).toBe(t <= 0 ? 0 : t >= 1 ? 255 : Math.round(255 * t));
    }

    // NDVI (Rouse et al. 1974) from NIR1 (band 7) and red (band 5).
    const ndvi = (expectedRaw[6] - expectedRaw[4]) / (expectedRaw[6] + expectedRaw[4]);
    expect(await inspector.locator('[data-testid="pixel-index"]').textContent()).toBe(`NDVI ${ndvi.toFixed(4)}`);

    // The pan pixel under the same point, read the same way.
    const panPosition = (await inspector.locator('[data-testid="pixel-pan-position"]').textContent())!;
    const [, prow, pcol] = /row (\d+), column (\d+)/.exec(panPosition)!.map(Number);
    const pan = await (await fromFile(join(demo, 'pan.tif'))).getImage(0);
    const panValue = ((await pan.readRasters({ window: [pcol, prow, pcol + 1, prow + 1] })) as unknown as ArrayLike<number>[])[0][0];
    expect(Number(await inspector.locator('[data-testid="pixel-pan"] td.raw').textContent())).toBe(panValue);
    expect(Math.floor(pcol / 4)).toBe(col); // pan pixels are a quarter of the multispectral ones
    expect(Math.floor(prow / 4)).toBe(row);
  });
});
