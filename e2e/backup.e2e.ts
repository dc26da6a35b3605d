import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openApp, screenshot } from './browser.ts';
import { deskReady, tagNextPatch } from './deskSteps.ts';

// Backup and restore as a user does it: tag a patch, save the site as one file (Ctrl+S),
// restore the file in another browser profile (another machine), open it and find the
// call; a changed file is refused with a message naming it.

const dir = mkdtempSync(join(tmpdir(), 'fellfield-backup-'));

async function restore(page: Page, path: string) {
  const chooser = page.waitForEvent('filechooser');
  await page.click('button:has-text("Restore from a backup file")');
  await (await chooser).setFiles(path);
}

describe('backup and restore of a site', () => {
  it('saves the site as one file and restores it elsewhere with its history', async () => {
    const first = await openApp();
    let backupPath: string;
    let id: string;
    try {
      await deskReady(first.page);
      await first.page.evaluate(() => { Object.defineProperty(window, 'showSaveFilePicker', { value: undefined, configurable: true }); });
      id = await tagNextPatch(first.page);
      const download = first.page.waitForEvent('download');
      await first.page.keyboard.press('Control+s');
      const file = await download;
      expect(file.suggestedFilename()).toMatch(/site-\d+\.json$/);
      backupPath = join(dir, file.suggestedFilename());
      await file.saveAs(backupPath);
      await expect.poll(() => first.page.locator('[role="status"]', { hasText: 'Backup saved' }).count()).toBe(1);
    } finally {
      await first.close();
    }
    const backup = JSON.parse(readFileSync(backupPath, 'utf8'));
    expect(backup.tags.some((t: { patchId: string; species: string; confidence: string }) => t.patchId === id && t.species === 'PIEX' && t.confidence === 'unsure')).toBe(true);

    // A changed copy is refused, naming the file; the good one restores.
    const tampered = join(dir, 'changed-site.json');
    writeFileSync(tampered, readFileSync(backupPath, 'utf8').replace('"confidence":"unsure"', '"confidence":"sure"'));
    const second = await openApp({ path: '?screen=start' });
    try {
      await restore(second.page, tampered);
      await expect.poll(() => second.page.locator('[role="alert"]').innerText(), { timeout: 30_000 }).toMatch(/changed-site\.json: /);
      await restore(second.page, backupPath);
      await expect.poll(() => second.page.locator('[role="status"]', { hasText: 'Restored' }).innerText(), { timeout: 60_000 }).toContain(`${backup.head.seq} recorded changes`);
      await screenshot(second.page, 'backup-restored');
      await second.page.locator('[data-testid="stored-sites"] button:has-text("Open")').first().click();
      await deskReady(second.page);
      await second.page.keyboard.press('g');
      await second.page.keyboard.type(id);
      await second.page.keyboard.press('Enter');
      await expect.poll(() => second.page.locator('[data-testid="patch-in-hand"] .id b').textContent()).toBe(id);
      await expect.poll(() => second.page.locator('.side').innerText(), { timeout: 20_000 }).toMatch(/PIEX, unsure/);
      await screenshot(second.page, 'backup-reopened');
    } finally {
      await second.close();
    }
  });
});
