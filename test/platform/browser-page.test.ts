// The browser bridge in a real page: Chromium (Debian's /usr/bin/chromium, driven by
// playwright-core) loads a small page that imports the built src/platform/browser.ts
// from the real local server. The file input, the picker's accept/multiple
// attributes, the download and the default ./demo/ location are the browser's own
// behaviour (HTML Standard: input type=file, a[download]), not stand-ins.
import { existsSync } from 'node:fs';
import { mkdtemp, mkdir, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { build } from 'vite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type RunningServer } from '../../scripts/serve.mjs';

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const repo = path.resolve(import.meta.dirname, '../..');

let tmp: string;
let server: RunningServer;
let browser: Browser;
let page: Page;

declare global {
  interface Window {
    platform: import('../../src/platform/browser.ts').BrowserPlatform;
  }
}

describe.skipIf(!existsSync(CHROMIUM))(`the browser bridge in Chromium (${CHROMIUM})`, () => {
  beforeAll(async () => {
    tmp = await mkdtemp(path.join(os.tmpdir(), 'fellfield-page-'));
    const dist = path.join(tmp, 'dist');
    await build({
      configFile: false,
      root: repo,
      logLevel: 'warn',
      build: {
        outDir: dist,
        emptyOutDir: true,
        lib: { entry: path.join(repo, 'src/platform/browser.ts'), formats: ['es'], fileName: () => 'platform.js' },
      },
    });
    await writeFile(path.join(dist, 'boot.js'), "import { BrowserPlatform } from './platform.js';\nwindow.platform = new BrowserPlatform();\n");
    await writeFile(path.join(dist, 'index.html'), '<!doctype html><meta charset="utf-8"><title>bridge</title><script type="module" src="./boot.js"></script>');
    await mkdir(path.join(tmp, 'demo'));
    await writeFile(path.join(tmp, 'demo', 'manifest.json'), '{"kind":"demo"}');
    server = await startServer({ port: 0, root: dist, demoDir: path.join(tmp, 'demo') });
    browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--no-first-run'] });
    page = await (await browser.newContext({ acceptDownloads: true })).newPage();
    await page.goto(server.url);
    await page.waitForFunction(() => window.platform !== undefined);
  });

  afterAll(async () => {
    await browser?.close();
    await server?.close();
    await rm(tmp, { recursive: true, force: true });
  });

  it('picks files through a file input with the asked extensions, and reads them by range', async () => {
    // The user's part: answer the file chooser the page opens.
    const chooserAnswered = page.waitForEvent('filechooser').then(async (chooser) => {
      expect(chooser.isMultiple()).toBe(true);
      expect(await chooser.element().getAttribute('accept')).toBe('.tif,.tiff');
      await chooser.setFiles([
        { name: 'pan.tif', mimeType: 'image/tiff', buffer: Buffer.from([10, 11, 12, 13, 14]) },
        { name: 'ms.tif', mimeType: 'image/tiff', buffer: Buffer.from([20, 21]) },
      ]);
    });
    const result = await page.evaluate(async () => {
      const refs = await window.platform.pickFiles({ title: 'Open a scene', extensions: ['tif', '.tiff'], multiple: true });
      const bytes = await Promise.all(refs.map((ref) => window.platform.readRange(ref, 1, 3)));
      return { refs, bytes: bytes.map((b) => Array.from(b)) };
    });
    await chooserAnswered;
    expect(result.refs.map((r) => [r.name, r.size])).toEqual([['pan.tif', 5], ['ms.tif', 2]]);
    expect(result.bytes).toEqual([[11, 12, 13], [21]]);
  });

  it('resolves to no files when the user picks none', async () => {
    const chooserAnswered = page.waitForEvent('filechooser').then((chooser) => chooser.setFiles([]));
    const refs = await page.evaluate(() => window.platform.pickFiles({ title: 'Open', extensions: [] }));
    await chooserAnswered;
    expect(refs).toEqual([]);
  }, 20_000);

  it('opens demo files from ./demo/ beside the page', async () => {
    const text = await page.evaluate(async () => {
      const ref = await window.platform.openDemoFile('manifest.json');
      return new TextDecoder().decode(await window.platform.readRange(ref, 0, ref.size));
    });
    expect(text).toBe('{"kind":"demo"}');
  });

  it('saves by a download with the suggested name when there is no save picker', async () => {
    const [download, saved] = await Promise.all([
      page.waitForEvent('download'),
      page.evaluate(async () => {
        delete (window as { showSaveFilePicker?: unknown }).showSaveFilePicker;
        return window.platform.saveFile('labels.geojson', '{"type":"FeatureCollection","features":[]}');
      }),
    ]);
    expect(saved).toBe(true);
    expect(download.suggestedFilename()).toBe('labels.geojson');
    expect(await readFile(await download.path(), 'utf8')).toBe('{"type":"FeatureCollection","features":[]}');
  });
});
