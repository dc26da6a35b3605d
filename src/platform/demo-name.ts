// Demo files are asked for by name, never by path: a name is one or more segments of
// plain characters joined by '/', with no empty, '.' or '..' segment. The same rule is
// applied in the renderer (to fail early) and in the Electron main process (to refuse).

import { PlatformError } from './errors.ts';

const SEGMENT = /^[A-Za-z0-9_][A-Za-z0-9._-]*$/;
const MAX_NAME_LENGTH = 200;

/** The name's segments, or a 'bad-request' error naming what is wrong with it. */
export function demoNameSegments(name: unknown): string[] {
  if (typeof name !== 'string' || name.length === 0) {
    throw new PlatformError('bad-request', 'a demo file name must be a non-empty string');
  }
  if (name.length > MAX_NAME_LENGTH) {
    throw new PlatformError('bad-request', `a demo file name is at most ${MAX_NAME_LENGTH} characters`, name.slice(0, 40));
  }
  const segments = name.split('/');
  for (const segment of segments) {
    if (!SEGMENT.test(segment) || segment === '.' || segment === '..') {
      throw new PlatformError('bad-request', 'not a demo file name (letters, digits, . _ - and / only; no empty, "." or ".." parts)', name);
    }
  }
  return segments;
}
