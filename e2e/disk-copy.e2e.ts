import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, describe, expect, it } from 'vitest';
import { verifyChain } from '../src/core/ledger/chain.ts';
import type { LedgerEvent } from '../src/core/site/index.ts';
import { openApp, screenshot } from './browser.ts';
import { deskReady, tagNextPatch } from './deskSteps.ts';

// The copy of a site outside the browser's storage, as a user meets it: on the demo the
// user keeps a copy in a folder, tags patches, and the desk says the copy is up to date.
// Then the browser's storage is wiped (every IndexedDB database of the profile deleted
// between two launches, as an engine reset does). The app, opened again, makes the demo
// anew; on Start the user chooses the same folder, is offered the copy with its time and
// contents, restores it, and finds every saved call back with a ledger that verifies.
//
// The folder: Chromium's folder picker is a native dialog that a test cannot answer, so
// an init script makes showDirectoryPicker hand out a folder of the origin-private file
// system (navigator.storage.getDirectory(), WHATWG File System Standard), which is the
// same FileSystemDirectoryHandle the picker returns. Everything from the handle on (its
// keeping in IndexedDB, the permission query, the atomic writes, the listing) is the
// app's real path; the picker dialog itself is not exercised. The origin-private file
// system outlives deleting the IndexedDB databases, as a folder on disk outlives them.

const profile = mkdtempSync(join(tmpdir(), 'fellfield-copy-'));
afterAll(() => rmSync(profile, { recursive: true, force: true }));

function copyFolderPicker() {
  (window as unknown as { showDirectoryPicker: () => Promise<FileSystemDirectoryHandle> }).showDirectoryPicker = async () =>
    (await navigator.storage.getDirectory()).getDirectoryHandle('site-copies', { create: true });
}

/** The demo's ledger as IndexedDB holds it, read with the browser's own API. */
function storedLedger(page: Page): Promise<LedgerEvent[]> {
  return page.evaluate(() => new Promise<LedgerEvent[]>((resolve, reject) => {
    const open = indexedDB.open('fellfield-site-demo');
    open.onsuccess = () => {
      const all = open.result.transaction('ledger').objectStore('ledger').getAll();
      all.onsuccess = () => (open.result.close(), resolve(all.result as LedgerEvent[]));
      all.onerror = () => reject(all.error);
    };
    open.onerror = () => reject(open.error);
  }));
}

describe('the copy of a site on disk', () => {
  it('is kept while tagging, and brings the site back after the browser storage is wiped', async () => {
    const ids: string[] = [];
    let saved: LedgerEvent[];
    const first = await openApp({ profile, initScript: copyFolderPicker });
    try {
      const page = first.page;
      await deskReady(page);
      const line = page.locator('[data-testid="disk-copy"]');
      await expect.poll(() => line.innerText()).toMatch(/^No copy outside the browser's storage yet; save a backup \(Ctrl\+S\), or keep a copy in a folder…$/);
      await screenshot(page, 'disk-copy-none');
      await line.locator('button').click();
      await expect.poll(() => line.innerText(), { timeout: 30_000 }).toMatch(/^Copy on disk up to date: written [\d:]+(\s?[AP]M)? in the folder "site-copies"\.$/);
      for (let i = 0; i < 3; i++) ids.push(await tagNextPatch(page));
      // each change is in the copy within the quiet interval (10 s), never more than 2 min behind
      await expect.poll(() => line.innerText(), { timeout: 60_000 }).toMatch(/^Copy on disk written .*changes? follows? within two minutes\.$|^Copy on disk up to date/);
      await expect.poll(() => line.innerText(), { timeout: 60_000 }).toMatch(/^Copy on disk up to date/);
      await screenshot(page, 'disk-copy-kept');
      saved = await storedLedger(page);
      expect(saved.filter((e) => e.kind === 'tag.set')).toHaveLength(6); // a species and a confidence for each patch
    } finally {
      await first.close();
    }

    // The engine resets the storage: every IndexedDB database of the profile is deleted.
    const wipe = await openApp({ profile, path: 'demo/manifest.json' });
    try {
      const left = await wipe.page.evaluate(async () => {
        for (const db of await indexedDB.databases()) {
          await new Promise((resolve, reject) => {
            const request = indexedDB.deleteDatabase(db.name!);
            request.onsuccess = resolve;
            request.onerror = () => reject(request.error);
          });
        }
        return (await indexedDB.databases()).length;
      });
      expect(left).toBe(0);
    } finally {
      await wipe.close();
    }

    const again = await openApp({ profile, initScript: copyFolderPicker });
    try {
      const page = again.page;
      // The demo is made anew (this browser no longer knows the folder), and writes no copy over the good one.
      await deskReady(page);
      await expect.poll(() => page.locator('[data-testid="disk-copy"]').innerText()).toMatch(/^No copy outside the browser's storage yet/);
      await page.click('header.bar button:has-text("Sites")');
      const copies = page.locator('[data-testid="disk-copies"]');
      await copies.locator('button:has-text("Choose a folder for copies")').click();
      const offer = copies.locator('.copy', { hasText: 'Quarrow Basin (fictional)' });
      await expect.poll(async () => (await offer.innerText()).replace(/\s+/g, ' '), { timeout: 30_000 }).toMatch(
        new RegExp(`the site stored here has another history; .*The copy was written .* and holds 225 patches, \\d+ tags, 2 passes, 0 rulings and ${saved!.length} recorded changes, the last made `),
      );
      await screenshot(page, 'disk-copy-offered');
      await offer.locator('button:has-text("Restore from the copy on disk")').click();
      await expect.poll(() => copies.locator('[role="status"]').innerText(), { timeout: 60_000 }).toMatch(
        new RegExp(`^Restored "Quarrow Basin \\(fictional\\)" from the copy on disk: 225 patches, ${saved!.length} recorded changes, ledger verified\\. The site stored here before is kept as demo\\.site\\.aside-\\d{8}T\\d{6}Z\\.json\\.$`),
      );
      await screenshot(page, 'disk-copy-restored');
      // The demo made anew was kept as a copy set aside; the user removes it.
      const aside = copies.locator('.copy', { hasText: 'a copy set aside' });
      await expect.poll(() => aside.count()).toBe(1);
      page.once('dialog', (dialog) => void dialog.accept());
      await aside.locator('button:has-text("Remove")').click();
      await expect.poll(() => copies.innerText()).toBe('The copy of your site in the folder "site-copies" is up to date.');

      // Every saved change is back, in order, with its hash; the chain verifies.
      const restored = await storedLedger(page);
      expect(restored.map((e) => [e.seq, e.hash])).toEqual(saved!.map((e) => [e.seq, e.hash]));
      const chain = await verifyChain(restored);
      expect(chain.ok).toBe(true);

      // And the calls are on the desk.
      await page.locator('[data-testid="stored-sites"] li', { hasText: 'Quarrow Basin' }).locator('button:has-text("Open")').click();
      await deskReady(page);
      await expect.poll(() => page.locator('[data-testid="disk-copy"]').innerText()).toBe('Copy on disk up to date in the folder "site-copies".');
      for (const id of ids) {
        await page.keyboard.press('g');
        await page.keyboard.type(id);
        await page.keyboard.press('Enter');
        await expect.poll(() => page.locator('[data-testid="patch-in-hand"] .id b').textContent()).toBe(id);
        await expect.poll(() => page.locator('[data-testid="own-tag"]').innerText(), { timeout: 20_000 }).toMatch(/PIEX, unsure/);
      }
      await screenshot(page, 'disk-copy-reopened');
    } finally {
      await again.close();
    }
  }, 600_000);
});
