// The browser bridge against the real local server (scripts/serve.mjs) on 127.0.0.1:
// demo files by HTTP ranges (RFC 9110, section 14), picked files by File.slice (W3C
// File API). Two small extra servers stand for servers that ignore Range or refuse
// HEAD, both of which RFC 9110 allows.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { mkdtemp, mkdir, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BrowserPlatform } from '../../src/platform/browser.ts';
import { PlatformError } from '../../src/platform/errors.ts';
import { readText } from '../../src/platform/read-whole.ts';
import { startServer } from '../../scripts/serve.mjs';

let tmp: string;
let server: { url: string; close(): Promise<void> };
const pan = new Uint8Array(70_000).map((_, i) => (i * 13 + 5) % 251);
const extras: http.Server[] = [];

async function extraServer(handler: http.RequestListener): Promise<string> {
  const s = http.createServer(handler);
  extras.push(s);
  await new Promise<void>((resolve) => s.listen(0, '127.0.0.1', resolve));
  return `http://127.0.0.1:${(s.address() as AddressInfo).port}/demo/`;
}

beforeAll(async () => {
  tmp = await mkdtemp(path.join(os.tmpdir(), 'fellfield-browser-'));
  const demo = path.join(tmp, 'demo');
  await mkdir(path.join(tmp, 'dist'), { recursive: true });
  await mkdir(path.join(demo, 'late'), { recursive: true });
  await writeFile(path.join(tmp, 'dist', 'index.html'), '<!doctype html>');
  await writeFile(path.join(demo, 'pan.tif'), pan);
  await writeFile(path.join(demo, 'manifest.json'), '{"name":"demo basin"}');
  await writeFile(path.join(demo, 'late', 'ms.tif'), new Uint8Array(10));
  await writeFile(path.join(demo, 'empty.bin'), new Uint8Array(0));
  server = await startServer({ port: 0, root: path.join(tmp, 'dist'), demoDir: demo });
});
afterAll(async () => {
  await server.close();
  for (const s of extras) s.close();
  await rm(tmp, { recursive: true, force: true });
});

const platform = () => new BrowserPlatform({ demoBaseUrl: `${server.url}demo/` });

async function rejection(promise: Promise<unknown>): Promise<PlatformError> {
  const error = await promise.then(() => undefined, (e: unknown) => e);
  expect(error).toBeInstanceOf(PlatformError);
  return error as PlatformError;
}

describe('demo files over HTTP ranges', () => {
  it('finds the size and reads exact ranges', async () => {
    const p = platform();
    const ref = await p.openDemoFile('pan.tif');
    expect(ref).toMatchObject({ name: 'pan.tif', size: 70_000 });
    expect(await p.readRange(ref, 0, 8)).toEqual(pan.slice(0, 8));
    expect(await p.readRange(ref, 65_536, 1000)).toEqual(pan.slice(65_536, 66_536));
    expect(await p.readRange(ref, 69_990, 500)).toEqual(pan.slice(69_990)); // cut at the end
    expect(await p.readRange(ref, 10, 0)).toEqual(new Uint8Array(0));
  });

  it('reads a small file whole, and files in subfolders', async () => {
    const p = platform();
    expect(await readText(p, await p.openDemoFile('manifest.json'))).toBe('{"name":"demo basin"}');
    expect(await p.openDemoFile('late/ms.tif')).toMatchObject({ name: 'ms.tif', size: 10 });
    expect(await p.openDemoFile('empty.bin')).toMatchObject({ size: 0 });
  });

  it('refuses a read that starts past the end, naming the file', async () => {
    const p = platform();
    const ref = await p.openDemoFile('pan.tif');
    const error = await rejection(p.readRange(ref, 70_000, 1));
    expect(error.code).toBe('out-of-range');
    expect(error.message).toMatch(/^pan\.tif: /);
  });

  it('says a missing demo file is missing, and refuses path-like names before asking', async () => {
    const p = platform();
    expect((await rejection(p.openDemoFile('nope.tif'))).code).toBe('not-found');
    for (const name of ['../dist/index.html', '/etc/passwd', 'late/../pan.tif', '%2e%2e/x']) {
      expect((await rejection(p.openDemoFile(name))).code, name).toBe('bad-request');
    }
  });

  it('stops a read whose signal has fired', async () => {
    const p = platform();
    const ref = await p.openDemoFile('pan.tif');
    const controller = new AbortController();
    controller.abort();
    expect((await rejection(p.readRange(ref, 0, 10, controller.signal))).code).toBe('aborted');
  });

  it('copes with a server that ignores Range and sends the whole file', async () => {
    const base = await extraServer((_req, res) => {
      res.writeHead(200, { 'Content-Length': String(pan.length) });
      res.end(_req.method === 'HEAD' ? undefined : Buffer.from(pan));
    });
    const p = new BrowserPlatform({ demoBaseUrl: base });
    const ref = await p.openDemoFile('pan.tif');
    expect(await p.readRange(ref, 100, 50)).toEqual(pan.slice(100, 150));
  });

  it('finds the size from Content-Range when HEAD is refused', async () => {
    const base = await extraServer((req, res) => {
      if (req.method === 'HEAD') return void res.writeHead(405).end();
      res.writeHead(206, { 'Content-Range': `bytes 0-0/${pan.length}`, 'Content-Length': '1' });
      res.end(Buffer.from(pan.slice(0, 1)));
    });
    expect(await new BrowserPlatform({ demoBaseUrl: base }).openDemoFile('pan.tif')).toMatchObject({ size: 70_000 });
  });

  it('reports an unreachable server as an io error naming the file', async () => {
    const p = new BrowserPlatform({ demoBaseUrl: 'http://127.0.0.1:9/demo/' });
    const error = await rejection(p.openDemoFile('pan.tif'));
    expect(error.code).toBe('io');
    expect(error.file).toBe('pan.tif');
  });
});

describe('picked files', () => {
  it('reads ranges of a File by slicing it', async () => {
    const p = platform();
    const ref = p.adoptFile(new File([pan], 'scene.tif'));
    expect(ref).toMatchObject({ name: 'scene.tif', size: 70_000 });
    expect(await p.readRange(ref, 300, 20)).toEqual(pan.slice(300, 320));
    expect(await p.readRange(ref, 69_999, 20)).toEqual(pan.slice(69_999));
  });

  it('refuses references it never handed out and malformed ranges', async () => {
    const p = platform();
    const other = new BrowserPlatform().adoptFile(new File(['x'], 'x.txt'));
    expect((await rejection(p.readRange(other, 0, 1))).code).toBe('unknown-file');
    const ref = p.adoptFile(new File([pan], 'scene.tif'));
    expect((await rejection(p.readRange(ref, -1, 1))).code).toBe('bad-request');
    expect((await rejection(p.readRange(ref, 0, 1.5))).code).toBe('bad-request');
    expect((await rejection(p.readRange(ref, 80_000, 1))).code).toBe('out-of-range');
  });

  it('says that picking needs a page when there is none', async () => {
    const error = await rejection(Promise.resolve().then(() => new BrowserPlatform().pickFiles({ title: 'Open', extensions: ['tif'] })));
    expect(error.code).toBe('bad-request');
  });
});
