import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session } from './browser.ts';
import { layerCanvasStats } from './canvasStats.ts';
import { stripedPan } from './stripedPan.ts';

// A user's own striped GeoTIFF without overviews: read once into the pyramid cache (in
// the page's IndexedDB, by the render workers) and shown on the map.

let session: Session;
let page: Page;

describe('a striped file of the user', () => {
  beforeAll(async () => {
    session = await openApp({ path: '?screen=start' });
    page = session.page;
  });
  afterAll(async () => {
    await session?.close();
  });

  it('is shown from its pyramid cache', async () => {
    const chooser = page.waitForEvent('filechooser');
    await page.click('button:has-text("Open GeoTIFF files")');
    await (await chooser).setFiles([{ name: 'striped-pan.tif', mimeType: 'image/tiff', buffer: stripedPan(1200) }]);
    await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 120_000 });
    await screenshot(page, 'imagery-striped');
    const stats = await layerCanvasStats(page, '.imagery-layer canvas');
    expect(stats.opaqueShare).toBeGreaterThan(0.3);
    expect(stats.lumaStdDev).toBeGreaterThan(10);
    // The cache holds the file's tiles: 5 x 5 at full resolution, then 3 x 3, 2 x 2, 1.
    const stored = await page.evaluate(() => new Promise<number>((resolve, reject) => {
      const open = indexedDB.open('fellfield-pyramids');
      open.onsuccess = () => {
        const count = open.result.transaction('tiles').objectStore('tiles').count();
        count.onsuccess = () => resolve(count.result);
        count.onerror = () => reject(count.error);
      };
      open.onerror = () => reject(open.error);
    }));
    expect(stored).toBe(25 + 9 + 4 + 1 + 1); // and the completion mark
  });
});
