// The local server, started for real on 127.0.0.1 and asked with raw HTTP requests (so
// paths reach it exactly as written). Status codes and headers are those of RFC 9110:
// 206 with "Content-Range: bytes first-last/complete" (14.4, 15.3.7), 416 with
// "Content-Range: bytes */complete" (15.5.17), "Accept-Ranges: bytes" (14.3).
import http from 'node:http';
import net from 'node:net';
import { mkdtemp, mkdir, rm, symlink, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CONTENT_SECURITY_POLICY } from '../../electron/policy/csp.ts';
import { startServer, type RunningServer } from '../../scripts/serve.mjs';

let tmp: string;
let server: RunningServer;
const pan = Buffer.from(new Uint8Array(10_000).map((_, i) => (i * 17 + 3) % 256));

interface Answer { status: number; headers: http.IncomingHttpHeaders; body: Buffer }

function ask(rawPath: string, options: { method?: string; headers?: Record<string, string> } = {}): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const request = http.request({ host: '127.0.0.1', port: server.port, path: rawPath, method: options.method ?? 'GET', headers: options.headers }, (response) => {
      const chunks: Buffer[] = [];
      response.on('data', (c: Buffer) => chunks.push(c));
      response.on('end', () => resolve({ status: response.statusCode ?? 0, headers: response.headers, body: Buffer.concat(chunks) }));
    });
    request.on('error', reject);
    request.end();
  });
}

beforeAll(async () => {
  tmp = await mkdtemp(path.join(os.tmpdir(), 'fellfield-serve-'));
  await mkdir(path.join(tmp, 'dist', 'assets'), { recursive: true });
  await mkdir(path.join(tmp, 'demo', 'late'), { recursive: true });
  await writeFile(path.join(tmp, 'dist', 'index.html'), '<!doctype html><title>Fellfield</title>');
  await writeFile(path.join(tmp, 'dist', 'assets', 'app.js'), 'export {};');
  await writeFile(path.join(tmp, 'demo', 'pan.tif'), pan);
  await writeFile(path.join(tmp, 'demo', 'late', 'ms.tif'), 'late');
  await writeFile(path.join(tmp, 'secret.txt'), 'do not serve');
  await symlink(path.join(tmp, 'secret.txt'), path.join(tmp, 'demo', 'link.txt'));
  server = await startServer({ port: 0, root: path.join(tmp, 'dist'), demoDir: path.join(tmp, 'demo') });
});
afterAll(async () => {
  await server.close();
  await rm(tmp, { recursive: true, force: true });
});

describe('the local server', () => {
  it('listens on 127.0.0.1 and prints that address', () => {
    expect(server.url).toBe(`http://127.0.0.1:${server.port}/`);
  });

  it('serves the app with the CSP header', async () => {
    const answer = await ask('/');
    expect(answer.status).toBe(200);
    expect(answer.headers['content-security-policy']).toBe(CONTENT_SECURITY_POLICY);
    expect(answer.headers['content-type']).toBe('text/html; charset=utf-8');
    expect(answer.body.toString()).toContain('<title>Fellfield</title>');
    expect((await ask('/assets/app.js')).headers['content-type']).toBe('text/javascript; charset=utf-8');
  });

  it('serves demo files whole with Accept-Ranges', async () => {
    const answer = await ask('/demo/pan.tif');
    expect(answer.status).toBe(200);
    expect(answer.headers['accept-ranges']).toBe('bytes');
    expect(answer.headers['content-length']).toBe('10000');
    expect(answer.body.equals(pan)).toBe(true);
    expect((await ask('/demo/late/ms.tif')).body.toString()).toBe('late');
  });

  it('answers a range with 206 and Content-Range', async () => {
    const answer = await ask('/demo/pan.tif', { headers: { Range: 'bytes=500-999' } });
    expect(answer.status).toBe(206);
    expect(answer.headers['content-range']).toBe('bytes 500-999/10000');
    expect(answer.headers['content-length']).toBe('500');
    expect(answer.body.equals(pan.subarray(500, 1000))).toBe(true);
    const suffix = await ask('/demo/pan.tif', { headers: { Range: 'bytes=-500' } });
    expect(suffix.headers['content-range']).toBe('bytes 9500-9999/10000');
    expect(suffix.body.equals(pan.subarray(9500))).toBe(true);
  });

  it('answers an unsatisfiable range with 416 and the complete length', async () => {
    const answer = await ask('/demo/pan.tif', { headers: { Range: 'bytes=10000-' } });
    expect(answer.status).toBe(416);
    expect(answer.headers['content-range']).toBe('bytes */10000');
    expect(answer.headers['content-security-policy']).toBe(CONTENT_SECURITY_POLICY);
  });

  it('sends the whole file when If-Range is present (no validators to compare)', async () => {
    const answer = await ask('/demo/pan.tif', { headers: { Range: 'bytes=0-9', 'If-Range': '"x"' } });
    expect(answer.status).toBe(200);
    expect(answer.body.length).toBe(10_000);
  });

  it('answers HEAD with the size and no body', async () => {
    const answer = await ask('/demo/pan.tif', { method: 'HEAD' });
    expect(answer.status).toBe(200);
    expect(answer.headers['content-length']).toBe('10000');
    expect(answer.body.length).toBe(0);
  });

  it('refuses paths that climb out, plainly or percent-encoded', async () => {
    for (const raw of ['/../secret.txt', '/demo/../../secret.txt', '/demo/%2e%2e/secret.txt', '/demo/%2E%2E/%2e%2e/secret.txt',
      '/demo/..%2fsecret.txt', '/demo/..%5csecret.txt', '/demo/.%2e/secret.txt', '//secret.txt', '/demo/pan.tif%00.js']) {
      const answer = await ask(raw);
      expect(answer.status, raw).toBe(400);
      expect(answer.body.toString()).not.toContain('do not serve');
    }
  });

  it('does not follow a link out of its folders, and lists no directory', async () => {
    expect((await ask('/demo/link.txt')).status).toBe(404);
    for (const raw of ['/demo/', '/demo', '/assets/', '/assets', '/demo/late/']) {
      const answer = await ask(raw);
      expect(answer.status, raw).toBe(404);
      expect(answer.body.toString()).not.toContain('ms.tif');
    }
  });

  it('refuses other methods and other Host names', async () => {
    const post = await ask('/index.html', { method: 'POST' });
    expect(post.status).toBe(405);
    expect(post.headers.allow).toBe('GET, HEAD');
    expect((await ask('/', { headers: { Host: 'evil.example' } })).status).toBe(403);
    expect((await ask('/', { headers: { Host: `localhost:${server.port}` } })).status).toBe(200);
  });

  it('takes the next port when the asked one is busy', async () => {
    const blocker = net.createServer();
    await new Promise<void>((resolve) => blocker.listen(0, '127.0.0.1', resolve));
    const busy = (blocker.address() as net.AddressInfo).port;
    const second = await startServer({ port: busy, root: path.join(tmp, 'dist'), demoDir: path.join(tmp, 'demo') });
    try {
      expect(second.port).not.toBe(busy);
      expect(second.port).toBeGreaterThan(busy);
    } finally {
      await second.close();
      blocker.close();
    }
  });
});
