// The app:// handler over a real bundle folder, driven with the Fetch API's Request and
// Response (WHATWG Fetch Standard), which is what Electron's protocol.handle passes in.
import { mkdtemp, mkdir, rm, symlink, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createAppProtocolHandler } from '../../electron/app-protocol.ts';
import { CONTENT_SECURITY_POLICY } from '../../electron/policy/csp.ts';

let tmp: string;
let serve: (request: Request) => Promise<Response>;
const refused: string[] = [];

beforeAll(async () => {
  tmp = await mkdtemp(path.join(os.tmpdir(), 'fellfield-scheme-'));
  const dist = path.join(tmp, 'dist');
  await mkdir(path.join(dist, 'assets'), { recursive: true });
  await writeFile(path.join(dist, 'index.html'), '<!doctype html><title>Fellfield</title>');
  await writeFile(path.join(dist, 'assets', 'index.js'), 'export {};');
  await writeFile(path.join(tmp, 'package.json'), '{"secret":true}');
  await symlink(path.join(tmp, 'package.json'), path.join(dist, 'assets', 'escape.json'));
  serve = createAppProtocolHandler({ root: dist, log: (line) => refused.push(line) });
});
afterAll(() => rm(tmp, { recursive: true, force: true }));

const get = (url: string, init?: RequestInit) => serve(new Request(url, init));

describe('the app:// scheme handler', () => {
  it('serves the entry page for the bare origin and for index.html', async () => {
    for (const url of ['app://fellfield/', 'app://fellfield/index.html']) {
      const response = await get(url);
      expect(response.status, url).toBe(200);
      expect(response.headers.get('content-type')).toBe('text/html; charset=utf-8');
      expect(await response.text()).toContain('<title>Fellfield</title>');
    }
  });

  it('serves assets with their type and the CSP header', async () => {
    const response = await get('app://fellfield/assets/index.js?v=1');
    expect(response.status).toBe(200);
    expect(response.headers.get('content-type')).toBe('text/javascript; charset=utf-8');
    expect(response.headers.get('content-security-policy')).toBe(CONTENT_SECURITY_POLICY);
    expect(await response.text()).toBe('export {};');
  });

  it('refuses paths with .. and with encoded %2e%2e or %2f, and sends the CSP on refusals too', async () => {
    // new Request() keeps the URL as the URL parser leaves it, so the raw forms are
    // checked through the handler's own parsing of request.url.
    for (const url of ['app://fellfield/..%2fpackage.json', 'app://fellfield/assets/..%2F..%2Fpackage.json', 'app://fellfield/%2e%2e%5cpackage.json']) {
      const response = await get(url);
      expect(response.status, url).toBe(400);
      expect(response.headers.get('content-security-policy')).toBe(CONTENT_SECURITY_POLICY);
      expect(await response.text()).not.toContain('secret');
    }
    // Plain and %2e%2e dot segments are folded by the URL parser before they arrive;
    // whatever remains must still be inside the bundle.
    for (const url of ['app://fellfield/../package.json', 'app://fellfield/assets/%2e%2e/%2e%2e/package.json']) {
      const response = await get(url);
      expect(response.status, url).toBe(404);
      expect(await response.text()).not.toContain('secret');
    }
    expect(refused.length).toBeGreaterThanOrEqual(3);
  });

  it('does not follow a link that leads out of the bundle', async () => {
    const response = await get('app://fellfield/assets/escape.json');
    expect(response.status).toBe(404);
  });

  it('refuses other hosts of the scheme, directories, missing files and other methods', async () => {
    expect((await get('app://fellfield.evil/index.html')).status).toBe(403);
    expect((await get('app://fellfield/assets/')).status).toBe(404);
    expect((await get('app://fellfield/assets')).status).toBe(404);
    expect((await get('app://fellfield/missing.js')).status).toBe(404);
    expect((await get('app://fellfield/index.html', { method: 'POST', body: 'x' })).status).toBe(405);
  });

  it('answers HEAD with the headers and no body', async () => {
    const response = await get('app://fellfield/index.html', { method: 'HEAD' });
    expect(response.status).toBe(200);
    expect(response.headers.get('content-length')).toBe('39');
    expect(await response.text()).toBe('');
  });
});
