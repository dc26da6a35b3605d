import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { fromFile } from 'geotiff';
import { openApp, screenshot, type Session } from './browser.ts';
import { blur, mapReady, meanAbsDiff, percentileByRank } from './imageryChecks.ts';

// Two dates of the demo, each stretched by its own samples: the default limits of each
// date are the 2-98 % of its own overview, read here from the demo files with geotiff.js
// (an outside reader, npm geotiff 3.0.5) by nearest rank (Hyndman & Fan 1996, definition
// 1, worked from its definition); a user's stretch of one date leaves the other's alone;
// the late date swiped over the early one looks as it does on its own; and the swipe
// line is dragged on the map as well as moved by the slider and the W key.

const demo = join(import.meta.dirname, '..', 'demo');
let session: Session;
let page: Page;

/** The 2-98 % of one band of a file's smallest overview that still has 256 x 256 pixels, as the histogram caption prints it. */
async function overviewLimits(file: string, band: number): Promise<string> {
  const tiff = await fromFile(join(demo, file));
  let chosen = 0;
  for (let i = 0; i < (await tiff.getImageCount()); i++) {
    const image = await tiff.getImage(i);
    if (image.getWidth() * image.getHeight() >= 65_536) chosen = i;
  }
  const [values] = (await (await tiff.getImage(chosen)).readRasters({ samples: [band] })) as unknown as ArrayLike<number>[];
  const sorted = Float64Array.from(values).sort();
  // The caption's own number format: whole numbers from 100 up, else three figures.
  const fmt = (v: number) => (Math.abs(v) >= 100 ? v.toFixed(0) : v.toPrecision(3));
  return `${fmt(percentileByRank(sorted, 2))} – ${fmt(percentileByRank(sorted, 98))}`;
}

const caption = (band: string) => page.locator(`figure[data-band="${band}"] figcaption .mono`).innerText();
const dateButton = () => page.locator('[role="group"][aria-label="Date"] button[aria-pressed="true"]').innerText();

/** Mean RGB per cell of a 16 x 10 grid over the left `share` of a layer's canvas. */
function cells(selector: string, share: number): Promise<number[]> {
  return page.evaluate(([sel, share]) => {
    const canvas = [...document.querySelectorAll<HTMLCanvasElement>(sel)].find((c) => c.width > 0)!;
    const width = Math.floor(canvas.width * share), { height } = canvas;
    const data = canvas.getContext('2d')!.getImageData(0, 0, width, height).data;
    const sums = new Array(16 * 10 * 3).fill(0), counts = new Array(16 * 10).fill(0);
    for (let y = 0; y < height; y++) {
      for (let x = 0; x < width; x++) {
        const i = (y * width + x) * 4;
        if (data[i + 3] === 0) continue;
        const cell = Math.floor((y / height) * 10) * 16 + Math.floor((x / width) * 16);
        counts[cell]++;
        for (let c = 0; c < 3; c++) sums[cell * 3 + c] += data[i + c];
      }
    }
    return sums.map((v, i) => (counts[Math.floor(i / 3)] ? v / counts[Math.floor(i / 3)] : -1));
  }, [selector, share] as const);
}

/** The rightmost column of a layer's canvas with any opaque pixel on its middle row, as a share of its width. */
function opaqueEdge(selector: string): Promise<number> {
  return page.evaluate((sel) => {
    const canvas = [...document.querySelectorAll<HTMLCanvasElement>(sel)].find((c) => c.width > 0)!;
    const row = canvas.getContext('2d')!.getImageData(0, Math.floor(canvas.height / 2) + 30, canvas.width, 1).data;
    let last = -1;
    for (let x = 0; x < canvas.width; x++) if (row[x * 4 + 3] > 0) last = x;
    return (last + 1) / canvas.width;
  }, selector);
}

describe('two dates of the demo, each with its own stretch', () => {
  beforeAll(async () => {
    session = await openApp();
    page = session.page;
    await mapReady(page);
  });
  afterAll(async () => {
    await session?.close();
  });

  it('stretches each date by its own overview by default, and keeps a stretch the user sets on one date to that date', async () => {
    await page.keyboard.press('n');
    await mapReady(page);
    // Band 5 is red in the demo's band table (manifest.json); geotiff.js counts from 0.
    const early = await overviewLimits('ms.tif', 4), late = await overviewLimits('ms-late.tif', 4);
    expect(early).not.toBe(late);
    const firstDate = await dateButton();
    await expect.poll(() => caption('red')).toBe(early);

    await page.keyboard.press('d');
    await expect.poll(dateButton).not.toBe(firstDate);
    await expect.poll(() => caption('red')).toBe(late);
    await mapReady(page);

    // A manual stretch on the late date...
    await page.selectOption('select[aria-label="Stretch rule"]', 'manual');
    await page.fill('input[aria-label="Manual minimum"]', '100');
    await page.press('input[aria-label="Manual minimum"]', 'Enter');
    await page.fill('input[aria-label="Manual maximum"]', '300');
    await page.press('input[aria-label="Manual maximum"]', 'Enter');
    await expect.poll(() => caption('red')).toBe('100 – 300');
    await blur(page);
    await mapReady(page);
    await screenshot(page, 'dates-late-manual');

    // ...leaves the early date's default alone, and is there again on coming back.
    await page.keyboard.press('d');
    await expect.poll(dateButton).toBe(firstDate);
    await expect.poll(() => caption('red')).toBe(early);
    expect(await page.inputValue('select[aria-label="Stretch rule"]')).toBe('percentile');
    await page.keyboard.press('d');
    await expect.poll(() => caption('red')).toBe('100 – 300');
    // Back to the defaults for what follows.
    await page.selectOption('select[aria-label="Stretch rule"]', 'percentile');
    await blur(page);
    await page.keyboard.press('d');
    await expect.poll(dateButton).toBe(firstDate);
    await mapReady(page);
  });

  it('shows the late date under the swipe as it looks on its own, in colour infrared where the dates differ most', async () => {
    await page.keyboard.press('c');
    await mapReady(page);
    await page.keyboard.press('w');
    await expect.poll(() => page.getAttribute('button:has-text("Swipe")', 'aria-pressed')).toBe('true');
    await mapReady(page);
    await screenshot(page, 'dates-swipe-infrared');
    const swiped = await cells('.imagery-compare canvas', 0.45);
    const earlyUnder = await cells('.imagery-layer canvas', 0.45);

    await page.keyboard.press('w');
    await page.keyboard.press('d');
    await mapReady(page);
    const lateAlone = await cells('.imagery-layer canvas', 0.45);
    expect(meanAbsDiff(swiped, lateAlone)).toBeLessThan(1.5);
    // The two dates do differ there, so the match above says something.
    expect(meanAbsDiff(earlyUnder, lateAlone)).toBeGreaterThan(4);
    await page.keyboard.press('d');
    await page.keyboard.press('n');
    await mapReady(page);
  });

  it('moves the swipe line by dragging it on the map, by the slider, and turns it off and on with W', async () => {
    await page.keyboard.press('w');
    await mapReady(page);
    const slider = page.locator('input[aria-label="Swipe position"]');
    expect(Number(await slider.inputValue())).toBe(0.5);
    const box = (await page.locator('[data-testid="map"]').boundingBox())!;
    const y = box.y + box.height / 2 + 30;
    // Grab the line a few pixels off, drag it to 30 % of the width.
    await page.mouse.move(box.x + box.width * 0.5 + 3, y);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.4, y, { steps: 4 });
    await page.mouse.move(box.x + box.width * 0.3, y, { steps: 4 });
    await page.mouse.up();
    await expect.poll(async () => Number(await slider.inputValue())).toBeCloseTo(0.3, 1);
    await mapReady(page);
    expect(await opaqueEdge('.imagery-compare canvas')).toBeCloseTo(0.3, 1);
    await screenshot(page, 'dates-swipe-dragged');

    // A press away from the line pans the map as before, and leaves the line where it is.
    await page.mouse.move(box.x + box.width * 0.7, y);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.75, y, { steps: 3 });
    await page.mouse.up();
    await mapReady(page);
    expect(Number(await slider.inputValue())).toBeCloseTo(0.3, 1);

    // The slider still moves it.
    await slider.fill('0.8');
    await mapReady(page);
    expect(await opaqueEdge('.imagery-compare canvas')).toBeCloseTo(0.8, 1);
    await blur(page);
    await page.keyboard.press('w');
    await expect.poll(() => page.getAttribute('button:has-text("Swipe")', 'aria-pressed')).toBe('false');
  });
});
