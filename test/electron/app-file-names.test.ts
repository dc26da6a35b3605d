// The names of the app's own files and the payloads that carry them, as the main process
// checks them. The reserved device names are those of Microsoft's "Naming Files, Paths,
// and Namespaces" (Win32 documentation): CON, PRN, AUX, NUL, COM0-9, LPT0-9, also with an
// extension; a trailing dot is dropped by Windows (same page), so it is refused.
import { describe, expect, it } from 'vitest';
import { parseAppFileName, parseAppFileRead, parseAppFileWrite, parseNothing } from '../../electron/policy/payloads.ts';
import { checkAppFileName, isAppFileName, MAX_APP_FILE_NAME } from '../../src/platform/app-file-name.ts';
import { MAX_RANGE_BYTES } from '../../src/platform/channels.ts';

describe('app file names', () => {
  it('accepts plain names of letters, digits and . _ -', () => {
    for (const name of ['demo.site.json', 'site-4f0c_a.site.aside-20260701T120000Z.json', 'pyr-0123abcd-17.tiles', 'a', '9', 'x'.repeat(MAX_APP_FILE_NAME)]) {
      expect(checkAppFileName(name), name).toBe(name);
    }
  });

  it.each([
    ['a path', 'copies/demo.site.json'],
    ['a Windows path', 'copies\\demo.site.json'],
    ['an absolute path', '/etc/passwd'],
    ['the parent folder', '..'],
    ['a climb inside a name', 'a..b'],
    ['the folder itself', '.'],
    ['a hidden or temporary name', '.demo.site.json.1a2b.partial'],
    ['a name with a space', 'my site.json'],
    ['a colon (a drive or stream on Windows)', 'c:x'],
    ['a NUL byte', 'a\0b'],
    ['a non-ASCII letter', 'fjäll.json'],
    ['a trailing dot', 'demo.'],
    ['a device name', 'CON'],
    ['a device name with an extension', 'nul.txt'],
    ['a numbered device', 'com1.json'],
    ['an empty name', ''],
    ['a name over the cap', 'x'.repeat(MAX_APP_FILE_NAME + 1)],
  ])('refuses %s', (_label, name) => {
    expect(() => checkAppFileName(name)).toThrow(expect.objectContaining({ code: 'bad-request' }));
    expect(isAppFileName(name)).toBe(false);
  });

  it('refuses what is not a string, naming the rule', () => {
    for (const name of [undefined, null, 5, ['a'], { name: 'a' }]) {
      expect(() => checkAppFileName(name)).toThrow(/must be a non-empty string/);
    }
  });
});

describe('app file payloads', () => {
  it('takes a name with text or bytes to write, and nothing else', () => {
    expect(parseAppFileWrite({ name: 'a.json', data: '{}' })).toEqual({ name: 'a.json', data: '{}' });
    const bytes = new Uint8Array([1, 2]);
    expect(parseAppFileWrite({ name: 'a.tiles', data: bytes }).data).toBe(bytes);
    for (const bad of [{ name: 'a', data: 5 }, { name: 'a', data: [1, 2] }, { name: '../a', data: 'x' }, null, 'a', []]) {
      expect(() => parseAppFileWrite(bad), JSON.stringify(bad)).toThrow(expect.objectContaining({ code: 'bad-request' }));
    }
  });

  it('reads whole or by a checked range', () => {
    expect(parseAppFileRead({ name: 'a' })).toEqual({ name: 'a' });
    expect(parseAppFileRead({ name: 'a', offset: 3, length: 4 })).toEqual({ name: 'a', offset: 3, length: 4 });
    for (const bad of [{ name: 'a', offset: 3 }, { name: 'a', offset: -1, length: 1 }, { name: 'a', offset: 0, length: MAX_RANGE_BYTES + 1 }, { name: 'a', offset: '0', length: 1 }, { name: 'a/b' }]) {
      expect(() => parseAppFileRead(bad), JSON.stringify(bad)).toThrow(expect.objectContaining({ code: 'bad-request' }));
    }
  });

  it('takes a bare name to remove, and an empty request to list', () => {
    expect(parseAppFileName({ name: 'a.json' })).toEqual({ name: 'a.json' });
    expect(() => parseAppFileName({ name: '..' })).toThrow(expect.objectContaining({ code: 'bad-request' }));
    expect(parseNothing({})).toEqual({});
    expect(parseNothing(undefined)).toEqual({});
    expect(() => parseNothing({ dir: '/' })).toThrow(expect.objectContaining({ code: 'bad-request' }));
  });
});
