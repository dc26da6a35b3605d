import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session } from './browser.ts';
import { layerCanvasStats } from './canvasStats.ts';
import { writeGeoTiff } from '../src/core/tiff/writeGeoTiff.ts';
import { plainTiff } from '../test/core/tiff/hostile.ts';

// Files whose CRS cannot be placed on a map (user-defined, an EPSG code Fellfield cannot
// project, none at all) are offered in pixel space; accepted, they open view-only, say so
// on screen, and the inspector reads the pixels the geotransforms put under the cursor.

let session: Session;
let page: Page;

// A pan raster and a 4-band raster on a user-defined local grid (GeoTIFF's code 32767):
// pan pixels of 0.5 m from (1000, 2000); multispectral pixels of 2 m from (1004, 1996).
const PAN = { size: 512, pixel: 0.5, origin: [1000, 2000] as [number, number] };
const MS = { size: 128, pixel: 2, origin: [1004, 1996] as [number, number] };
const panValue = (col: number, row: number) => 200 + ((col * 3 + row * 5) % 600);
const msValue = (band: number, col: number, row: number) => 100 + band * 150 + ((col * 7 + row * 11) % 120);

function userDefinedPair(): { pan: Buffer; ms: Buffer } {
  const pan = Uint16Array.from({ length: PAN.size ** 2 }, (_, i) => panValue(i % PAN.size, Math.floor(i / PAN.size)));
  const bands = [0, 1, 2, 3].map((b) => Uint16Array.from({ length: MS.size ** 2 }, (_, i) => msValue(b, i % MS.size, Math.floor(i / MS.size))));
  const common = { sampleType: 'uint16' as const, epsg: null, crsCitation: 'Local mine grid', tileSize: 256 };
  return {
    pan: Buffer.from(writeGeoTiff({ ...common, width: PAN.size, height: PAN.size, bands: [pan], origin: PAN.origin, pixelSize: [PAN.pixel, PAN.pixel] })),
    ms: Buffer.from(writeGeoTiff({
      ...common, width: MS.size, height: MS.size, bands, origin: MS.origin, pixelSize: [MS.pixel, MS.pixel],
      bandNames: ['blue', 'green', 'red', 'NIR'], bandWavelengthsNm: [480, 545, 660, 830],
    })),
  };
}

async function pick(files: { name: string; buffer: Buffer }[]) {
  const chooser = page.waitForEvent('filechooser');
  await page.click('button:has-text("Open GeoTIFF files")');
  await (await chooser).setFiles(files.map((f) => ({ ...f, mimeType: 'image/tiff' })));
}

const offer = () => page.locator('[data-testid="pixel-space-offer"]');

describe('imagery that cannot be placed on a map', () => {
  beforeAll(async () => {
    session = await openApp({ path: '?screen=start' });
    page = session.page;
  });
  afterAll(async () => {
    await session?.close();
  });

  it('an EPSG code Fellfield cannot project: the offer names the file and the code, and Cancel leaves the start page as it was', async () => {
    const band = Uint16Array.from({ length: 64 * 64 }, (_, i) => i % 700);
    // EPSG:2056 (CH1903+ / LV95) is real, but Fellfield has no definition of it.
    const swiss = Buffer.from(writeGeoTiff({ width: 64, height: 64, sampleType: 'uint16', bands: [band], epsg: 2056, origin: [2600000, 1200000], pixelSize: [1, 1], tileSize: 64 }));
    await pick([{ name: 'grid2056.tif', buffer: swiss }]);
    await offer().waitFor({ timeout: 30_000 });
    const text = await offer().innerText();
    expect(text).toContain('grid2056.tif: its CRS EPSG:2056 is not one Fellfield can project yet');
    expect(text).toMatch(/pixel space/);
    await screenshot(page, 'pixel-space-offer');
    await page.click('[data-testid="pixel-space-offer"] button:has-text("Cancel")');
    expect(await offer().count()).toBe(0);
    expect(await page.locator('[data-testid="map"]').count()).toBe(0);
  });

  it('a pair on a user-defined grid opens in pixel space, view-only, and the inspector reads the pixels the geotransforms place under the cursor', async () => {
    const { pan, ms } = userDefinedPair();
    await pick([{ name: 'local-pan.tif', buffer: pan }, { name: 'local-ms.tif', buffer: ms }]);
    await offer().waitFor({ timeout: 30_000 });
    const text = await offer().innerText();
    expect(text).toContain('local-pan.tif: its CRS has no EPSG code (user-defined: "Local mine grid")');
    expect(text).toContain('local-ms.tif: its CRS has no EPSG code');
    await page.click('button:has-text("View in pixel space")');
    await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 120_000 });

    // Said plainly: in the bar, and in the imagery panel's note; no patch tools.
    expect(await page.locator('[data-testid="pixel-space"]').innerText()).toBe('Pixel space, view-only · pixels of local-pan.tif');
    await expect.poll(() => page.locator('.note').allInnerTexts()).toEqual(expect.arrayContaining([expect.stringMatching(/^Shown in pixel space, view-only: .*patches cannot be drawn or stored here\.$/)]));
    expect(await page.locator('button:has-text("Draw")').count()).toBe(0);
    const stats = await layerCanvasStats(page, '.imagery-layer canvas');
    expect(stats.opaqueShare).toBeGreaterThan(0.3);
    expect(stats.lumaStdDev).toBeGreaterThan(5);
    await screenshot(page, 'pixel-space-desk');

    // The inspector near the map's centre: the coordinates are pan pixels (y up from the
    // bottom edge); the test finds both rasters' pixels from the geotransforms itself, at
    // a spot away from pixel edges, so the one-decimal coordinates cannot tip a pixel over.
    const box = (await page.locator('[data-testid="map"]').boundingBox())!;
    const coords = page.locator('[data-testid="pixel-coords"]');
    const clear = (v: number) => Math.abs(v - Math.round(v)) > 0.08;
    let spot: { panCol: number; panRow: number; msCol: number; msRow: number } | null = null;
    for (let step = 0; step < 12 && !spot; step++) {
      await page.mouse.move(box.x + box.width / 2 + step * 3, box.y + box.height / 2 + step * 2);
      await coords.waitFor();
      const [, xs, ys] = /^x ([\d.,-]+) · y ([\d.,-]+) \(pixel space\)$/.exec(await coords.innerText())!;
      const x = Number(xs.replace(/,/g, '')), y = Number(ys.replace(/,/g, ''));
      // Ground under the cursor by the pan geotransform (GDAL's affine GeoTransform), then each raster's pixel.
      const groundX = PAN.origin[0] + x * PAN.pixel, groundY = PAN.origin[1] - (PAN.size - y) * PAN.pixel;
      const msX = (groundX - MS.origin[0]) / MS.pixel, msY = (MS.origin[1] - groundY) / MS.pixel;
      if ([x, y, msX, msY].every(clear)) spot = { panCol: Math.floor(x), panRow: Math.floor(PAN.size - y), msCol: Math.floor(msX), msRow: Math.floor(msY) };
    }
    expect(spot).not.toBeNull();
    const { panCol, panRow, msCol, msRow } = spot!;
    await expect.poll(() => page.locator('[data-testid="pixel-pan-position"]').innerText()).toBe(`local-pan.tif: row ${panRow}, column ${panCol}`);
    await expect.poll(() => page.locator('[data-testid="pixel-ms-position"]').innerText()).toBe(`local-ms.tif: row ${msRow}, column ${msCol}`);
    await expect.poll(() => page.locator('[data-testid="pixel-pan"] .raw').allInnerTexts()).toEqual([String(panValue(panCol, panRow))]);
    await expect.poll(() => page.locator('[data-testid="pixel-ms"] .raw').allInnerTexts()).toEqual([0, 1, 2, 3].map((b) => String(msValue(b, msCol, msRow))));
    await screenshot(page, 'pixel-space-inspector');
  });

  it('a file with no georeferencing at all opens in pixel space too', async () => {
    await page.click('button:has-text("Sites")');
    await pick([{ name: 'plain.tif', buffer: Buffer.from(plainTiff()) }]);
    await offer().waitFor({ timeout: 30_000 });
    expect(await offer().innerText()).toContain('plain.tif: has no georeferencing');
    await page.click('button:has-text("View in pixel space")');
    await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 60_000 });
    expect(await page.locator('[data-testid="pixel-space"]').innerText()).toBe('Pixel space, view-only · pixels of plain.tif');
  });
});
