// Path containment for app:// and the local server. Dot segments and their
// percent-encoded forms are those of RFC 3986 (section 3.3 defines "." and ".." path
// segments, section 2.1 percent-encoding: %2E is "."); the WHATWG URL Standard also
// treats "%2e" and "%2e%2e" as dot segments, which is why they are judged before parsing.
import { mkdtemp, mkdir, rm, symlink, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrlSegments, isWithin, joinWithin, realPathWithin, requestPathSegments } from '../../electron/policy/bundle-path.ts';

describe('request path segments', () => {
  it('decodes plain paths one segment at a time', () => {
    expect(requestPathSegments('/assets/index.js')).toEqual({ ok: true, segments: ['assets', 'index.js'], directory: false });
    expect(requestPathSegments('/a%20b.js?v=2#x')).toEqual({ ok: true, segments: ['a b.js'], directory: false });
    expect(requestPathSegments('/')).toEqual({ ok: true, segments: [], directory: true });
    expect(requestPathSegments('/assets/')).toEqual({ ok: true, segments: ['assets'], directory: true });
  });

  it('refuses dot segments written plainly or percent-encoded', () => {
    for (const raw of ['/../package.json', '/assets/../../x', '/./index.html', '/%2e%2e/package.json', '/%2E%2E/x',
      '/.%2e/x', '/%2e./x', '/%2e/x', '/demo/%2e%2e/%2e%2e/etc/passwd']) {
      const verdict = requestPathSegments(raw);
      expect(verdict.ok, raw).toBe(false);
    }
  });

  it('refuses encoded separators, NUL, drive colons, empty segments and bad encoding', () => {
    for (const raw of ['/..%2fpackage.json', '/..%2F..%2Fetc', '/..%5cwin.ini', '/a%00.js', '/C:%5cx', '//etc/passwd',
      '/a//b', '/%zz', '/%', 'index.html']) {
      expect(requestPathSegments(raw).ok, raw).toBe(false);
    }
  });

  it('keeps a double-encoded dot as a literal, harmless name', () => {
    expect(requestPathSegments('/%252e%252e/x')).toEqual({ ok: true, segments: ['%2e%2e', 'x'], directory: false });
  });
});

describe('app:// URLs', () => {
  it('maps app://fellfield paths to segments', () => {
    expect(appUrlSegments('app://fellfield/index.html')).toEqual({ ok: true, segments: ['index.html'], directory: false });
    expect(appUrlSegments('app://fellfield')).toEqual({ ok: true, segments: [], directory: true });
  });

  it('refuses paths with .. or %2e%2e even though the URL parser would fold them', () => {
    expect(new URL('app://fellfield/a/%2e%2e/%2e%2e/x').pathname).toBe('/x'); // what the parser does
    for (const url of ['app://fellfield/../package.json', 'app://fellfield/a/%2e%2e/%2e%2e/x', 'app://fellfield/%2E%2E/x',
      'app://fellfield/..%2f..%2fpackage.json']) {
      expect(appUrlSegments(url).ok, url).toBe(false);
    }
  });

  it('refuses other origins', () => {
    expect(appUrlSegments('app://fellfield.evil/index.html')).toEqual({ ok: false, reason: 'not the app origin' });
    expect(appUrlSegments('file:///etc/passwd')).toEqual({ ok: false, reason: 'not the app origin' });
  });
});

describe('containment on disk', () => {
  let tmp: string;
  let root: string;
  beforeAll(async () => {
    tmp = await mkdtemp(path.join(os.tmpdir(), 'fellfield-bundle-'));
    root = path.join(tmp, 'dist');
    await mkdir(path.join(root, 'assets'), { recursive: true });
    await writeFile(path.join(root, 'index.html'), '<!doctype html>');
    await writeFile(path.join(tmp, 'secret.txt'), 'outside');
    await mkdir(path.join(tmp, 'dist-evil'));
    await symlink(path.join(tmp, 'secret.txt'), path.join(root, 'assets', 'link.txt'));
  });
  afterAll(() => rm(tmp, { recursive: true, force: true }));

  it('compares paths, not prefixes: dist-evil is not inside dist', () => {
    expect(isWithin(root, path.join(root, 'assets', 'a.js'))).toBe(true);
    expect(isWithin(root, root)).toBe(true);
    expect(path.join(tmp, 'dist-evil').startsWith(root)).toBe(true);
    expect(isWithin(root, path.join(tmp, 'dist-evil'))).toBe(false);
    expect(isWithin(root, tmp)).toBe(false);
  });

  it('joinWithin throws rather than leave the root', () => {
    expect(joinWithin(root, ['assets', 'a.js'])).toBe(path.join(root, 'assets', 'a.js'));
    expect(() => joinWithin(root, ['..', 'secret.txt'])).toThrow(/escapes/);
    expect(() => joinWithin(root, ['/etc/passwd'])).toThrow(/escapes/);
  });

  it('follows a symlink only if it stays inside the real root', async () => {
    expect(await realPathWithin(root, path.join(root, 'index.html'))).toBe(path.join(root, 'index.html'));
    expect(await realPathWithin(root, path.join(root, 'assets', 'link.txt'))).toBeUndefined();
    expect(await realPathWithin(root, path.join(root, 'missing.js'))).toBeUndefined();
  });
});
