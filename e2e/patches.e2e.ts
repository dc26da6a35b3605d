import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot, type Session, patchCount } from './browser.ts';
import { layerCanvasStats } from './canvasStats.ts';

// Drawing and tagging on the desk, by keys, in real IndexedDB: draw a patch by clicks,
// tag it with a roster key and a confidence key, undo and redo, then close the browser
// and reopen the same profile: the patch, its tag and the undo history are all there.

const profile = mkdtempSync(join(tmpdir(), 'fellfield-patches-'));
let session: Session | null = null;

afterAll(async () => {
  await session?.close();
  rmSync(profile, { recursive: true, force: true });
});

async function mapReady(page: Page) {
  await page.waitForTimeout(150);
  await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 90_000 });
}

async function zoomIn(page: Page, times: number) {
  for (let i = 0; i < times; i++) {
    await page.click('.ol-zoom-in');
    await page.waitForTimeout(350);
  }
  await mapReady(page);
}

const ownTag = (page: Page) => page.locator('[data-testid="own-tag"]').textContent();
const saved = (page: Page) => page.locator('[data-testid="save-status"]').textContent();

describe('drawing and tagging a patch by keys', () => {
  let area = '';

  it('opens the demo as a stored site with its field polygons as patches', async () => {
    session = await openApp({ profile });
    const { page } = session;
    await mapReady(page);
    await expect.poll(() => patchCount(page), { timeout: 30_000 }).toBe(225);
    expect(await saved(page)).toContain('All saved');
    // The field polygons are drawn from the store in the roster's colours.
    const stats = await layerCanvasStats(page, '.stored-patches-layer canvas');
    expect(stats.opaqueShare).toBeGreaterThan(0.001);
    expect(stats.distinctHues).toBeGreaterThanOrEqual(3);
  });

  it('draws a patch by clicks, with its area and pixels shown', async () => {
    const { page } = session!;
    await zoomIn(page, 3);
    await page.keyboard.press('a');
    await expect.poll(() => page.getAttribute('button:has-text("Draw")', 'aria-pressed')).toBe('true');
    const corners: [number, number][] = [[300, 300], [372, 296], [380, 352], [306, 366]];
    for (const [x, y] of corners) {
      await page.mouse.click(x, y);
      await page.waitForTimeout(120);
    }
    // While drawing, the sketch is measured live.
    await expect.poll(() => page.locator('[data-testid="patch-measure"]').count()).toBe(1);
    await page.mouse.click(corners[0][0], corners[0][1]);
    await expect.poll(() => page.locator('[data-testid="patch-in-hand"] .id b').textContent()).toBe('P0001');
    await expect.poll(() => saved(page)).toContain('All saved');
    expect(await patchCount(page)).toBe(226);
    area = (await page.locator('[data-testid="patch-measure"] dd').first().textContent()) ?? '';
    const m2 = Number(area.replace(/[^\d.]/g, ''));
    expect(m2).toBeGreaterThan(1);
    const pixels = await page.locator('[data-testid="patch-measure"] dd').nth(1).textContent();
    expect(pixels).toMatch(/^\d+ wholly, \d+ touched$/);
    await page.keyboard.press('Escape'); // leave the drawing tool, keep the patch in hand
  });

  it('tags it by roster key and confidence key, undoes and redoes', async () => {
    const { page } = session!;
    await page.keyboard.press('2'); // PIEX in the demo roster
    await expect.poll(() => ownTag(page)).toContain('PIEX, likely');
    await page.keyboard.press('k'); // unsure
    await expect.poll(() => ownTag(page)).toContain('PIEX, unsure');
    await page.locator('input[aria-label="Note"]').fill('crown half in shadow');
    await page.keyboard.press('Enter');
    await expect.poll(() => page.locator('input[aria-label="Note"]').inputValue()).toBe('crown half in shadow');
    await expect.poll(() => saved(page)).toContain('All saved');

    await page.keyboard.press('Control+z'); // the note
    await expect.poll(() => page.locator('input[aria-label="Note"]').inputValue()).toBe('');
    await page.keyboard.press('Control+z'); // unsure
    await expect.poll(() => ownTag(page)).toContain('PIEX, likely');
    await page.keyboard.press('Control+z'); // the species
    await expect.poll(() => ownTag(page)).toContain('No call of yours');
    await page.keyboard.press('Control+Shift+z');
    await expect.poll(() => ownTag(page)).toContain('PIEX, likely');
    await page.keyboard.press('Control+y');
    await expect.poll(() => ownTag(page)).toContain('PIEX, unsure');
    await expect.poll(() => saved(page)).toContain('All saved');
    await screenshot(page, 'patches-tagged');
    // The patch in hand is outlined in white over the imagery.
    const stats = await layerCanvasStats(page, '.stored-patches-layer canvas');
    expect(stats.opaqueShare).toBeGreaterThan(0.001);
  });

  it('finds the same state after the browser is closed and reopened', async () => {
    await session!.close();
    session = await openApp({ profile });
    const { page } = session;
    await mapReady(page);
    await expect.poll(() => patchCount(page), { timeout: 30_000 }).toBe(226);
    await page.keyboard.press('g');
    await page.keyboard.type('p0001');
    await page.keyboard.press('Enter');
    await expect.poll(() => page.locator('[data-testid="patch-in-hand"] .id b').textContent()).toBe('P0001');
    expect(await ownTag(page)).toContain('PIEX, unsure');
    expect(await page.locator('[data-testid="patch-measure"] dd').first().textContent()).toBe(area);
    await mapReady(page);
    await screenshot(page, 'patches-reopened');
    // The undo history survived too: one step back is the confidence.
    await page.keyboard.press('Control+z');
    await expect.poll(() => ownTag(page)).toContain('PIEX, likely');
    await expect.poll(() => saved(page)).toContain('All saved');
  });

  it('cuts the patch in hand with a line, joins the pieces again, and undoes each in one step', async () => {
    const { page } = session!;
    // A click is a single click only after the double-click wait, then the edit is
    // committed durably: on a busy machine that takes more than the default second.
    const EDIT_SETTLES = { timeout: 10_000 };
    // The jump centred P0001 in the map; a line straight across it cuts it in two.
    const box = (await page.locator('[data-testid="map"]').boundingBox())!;
    const cx = box.x + box.width / 2, cy = box.y + box.height / 2;
    await page.keyboard.press('l');
    await page.mouse.click(cx - 200, cy);
    await page.waitForTimeout(150);
    await page.mouse.dblclick(cx + 200, cy + 4);
    await expect.poll(() => patchCount(page), EDIT_SETTLES).toBe(227);
    await expect.poll(() => saved(page)).toContain('All saved');
    const kept = Number((await page.locator('[data-testid="patch-measure"] dd').first().textContent())!.replace(/[^\d.]/g, ''));
    expect(kept).toBeLessThan(Number(area.replace(/[^\d.]/g, '')));
    // Join the other piece (below the line) back into P0001.
    await page.keyboard.press('Escape');
    await page.keyboard.press('y');
    await page.mouse.click(cx, cy + 40);
    await expect.poll(() => patchCount(page), EDIT_SETTLES).toBe(226);
    await expect.poll(() => page.locator('[data-testid="patch-measure"] dd').first().textContent()).toBe(area);
    // A join is one step, and so is a cut.
    await page.keyboard.press('Control+z');
    await expect.poll(() => patchCount(page), EDIT_SETTLES).toBe(227); // the join undone: two pieces again
    await expect.poll(() => saved(page)).toContain('All saved');
    await expect.poll(() => page.locator('[data-testid="patch-measure"] dd').first().textContent()).not.toBe(area);
    await page.keyboard.press('Control+z');
    await expect.poll(() => patchCount(page), EDIT_SETTLES).toBe(226); // the cut undone
    await expect.poll(() => page.locator('[data-testid="patch-measure"] dd').first().textContent()).toBe(area);
    await expect.poll(() => saved(page)).toContain('All saved');
  });

  it('walks to the next untagged patch and tags it', async () => {
    const { page } = session!;
    await page.keyboard.press('u');
    const id = await page.locator('[data-testid="patch-in-hand"] .id b').textContent();
    expect(id).toMatch(/^F\d+$/); // a field polygon: the crew tagged it, this interpreter has not
    await page.keyboard.press('1');
    await page.keyboard.press('h');
    await expect.poll(() => ownTag(page)).toContain('ABFI, sure');
    await page.keyboard.press('u');
    await expect.poll(() => page.locator('[data-testid="patch-in-hand"] .id b').textContent()).not.toBe(id);
  });
});

describe('picking a patch from far away', () => {
  it('takes a patch in hand by a click at a zoom where the patches are one painted image', async () => {
    const { page } = session!;
    await page.keyboard.press('g');
    await page.keyboard.type('F012');
    await page.keyboard.press('Enter');
    await expect.poll(() => page.locator('[data-testid="patch-in-hand"] .id b').textContent()).toBe('F012');
    // The jump centred F012; zoom out (about the centre) until the outlines give way to the painted view.
    for (let i = 0; i < 5; i++) {
      await page.click('.ol-zoom-out');
      await page.waitForTimeout(300);
    }
    await mapReady(page);
    const box = (await page.locator('[data-testid="map"]').boundingBox())!;
    // A click on bare ground clears the hand; a click on the centre picks F012 again.
    await page.mouse.click(box.x + 12, box.y + box.height - 12);
    await expect.poll(() => page.locator('[data-testid="patch-in-hand"] .id b').count()).toBe(0);
    await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    await expect.poll(() => page.locator('[data-testid="patch-in-hand"] .id b').textContent()).toBe('F012');
    await screenshot(page, 'patches-far-pick');
  });
});

describe('the start screen after the demo was stored', () => {
  it('lists the demo among the sites on this machine', async () => {
    const { page } = session!;
    await page.goto(new URL('?screen=start', page.url()).href);
    const list = page.locator('[data-testid="stored-sites"] li');
    await expect.poll(() => list.count(), { timeout: 30_000 }).toBe(1);
    expect(await list.first().textContent()).toContain('Quarrow Basin (fictional)');
    await page.locator('[data-testid="stored-sites"] button:has-text("Open")').click();
    await mapReady(page);
    await expect.poll(() => patchCount(page), { timeout: 30_000 }).toBe(226);
  });
});
