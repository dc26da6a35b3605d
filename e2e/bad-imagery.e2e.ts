import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session } from './browser.ts';
import { bombTiff, hugeTiff, loopTiff, notTiff, truncatedTiff } from '../test/core/tiff/hostile.ts';

// Damaged and hostile files picked by the user: each gets one clear message naming the
// file, the page stays responsive, and nothing is allocated at the declared size. (A
// sound file without georeferencing is offered in pixel space: imagery-pixel-space.e2e.ts.)

const cases: { name: string; bytes: () => Uint8Array; says: RegExp }[] = [
  { name: 'loops.tif', bytes: loopTiff, says: /loop/i },
  { name: 'huge.tif', bytes: hugeTiff, says: /1000000|10\^6|large|limit/i },
  { name: 'photo.tif', bytes: notTiff, says: /not a TIFF/i },
  { name: 'bomb.tif', bytes: () => bombTiff(256), says: /declared|past|size/i },
  { name: 'cut.tif', bytes: truncatedTiff, says: /short|end of the file|truncat|past/i },
];

let session: Session;
let page: Page;

describe('bad imagery files picked in the app', () => {
  beforeAll(async () => {
    session = await openApp({ path: '?screen=start' });
    page = session.page;
  });
  afterAll(async () => {
    await session?.close();
  });

  for (const { name, bytes, says } of cases) {
    it(`${name}: one clear message`, async () => {
      const chooser = page.waitForEvent('filechooser');
      await page.click('button:has-text("Open GeoTIFF files")');
      await (await chooser).setFiles([{ name, mimeType: 'image/tiff', buffer: Buffer.from(bytes()) }]);
      const alert = page.locator('[role="alert"]');
      await expect.poll(async () => (await alert.count()) ? alert.innerText() : '', { timeout: 30_000 }).toContain(name);
      const text = (await alert.innerText()).trim();
      expect(text).toMatch(says);
      expect(text.split('\n')).toHaveLength(1);
      expect(text).not.toMatch(/\bat .*\.(js|ts):\d+/); // no stack trace
      // The page still answers at once.
      expect(await page.evaluate(() => 1 + 1)).toBe(2);
      await screenshot(page, `bad-imagery-${name.replace('.tif', '')}`);
    });
  }
});
