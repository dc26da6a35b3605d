// Path containment for everything the app serves: the Electron scheme handler (the
// bundle in dist/) and the local web server (dist/ and the demo folder). A request path
// is split and percent-decoded one segment at a time; dot segments, encoded separators
// and NUL are refused outright (not normalised away), the joined path must stay under
// its root, and after symlinks are resolved it must still be under the real root.

import { realpath } from 'node:fs/promises';
import path from 'node:path';
import { isAppUrl } from './app-origin.ts';

export type PathVerdict =
  | { ok: true; segments: string[]; directory: boolean }
  | { ok: false; reason: string };

const FORBIDDEN_IN_SEGMENT = /[/\\\0:]/;

/** The decoded segments of a raw request path such as `/assets/a%20b.js?v=1`. */
export function requestPathSegments(rawPath: string): PathVerdict {
  const pathOnly = rawPath.replace(/[?#].*$/s, '');
  if (!pathOnly.startsWith('/')) return { ok: false, reason: 'the path does not start with /' };
  const parts = pathOnly.slice(1).split('/');
  const directory = parts[parts.length - 1] === '';
  if (directory) parts.pop();
  const segments: string[] = [];
  for (const part of parts) {
    let decoded: string;
    try {
      decoded = decodeURIComponent(part);
    } catch {
      return { ok: false, reason: 'the path has malformed percent-encoding' };
    }
    if (decoded === '') return { ok: false, reason: 'the path has an empty segment' };
    if (decoded === '.' || decoded === '..') return { ok: false, reason: 'the path has a dot segment' };
    if (FORBIDDEN_IN_SEGMENT.test(decoded)) return { ok: false, reason: 'the path has an encoded separator or control character' };
    segments.push(decoded);
  }
  return { ok: true, segments, directory };
}

/** The segments of an app:// URL; refused for any other origin. */
export function appUrlSegments(rawUrl: string): PathVerdict {
  if (!isAppUrl(rawUrl)) return { ok: false, reason: 'not the app origin' };
  // Judge the path as it was written, before the URL parser folds away any "..".
  const rawPath = rawUrl.replace(/^[^:]+:\/\/[^/?#]*/, '') || '/';
  const raw = requestPathSegments(rawPath);
  if (!raw.ok) return raw;
  return requestPathSegments(new URL(rawUrl).pathname || '/');
}

/** The absolute path of the segments under root; throws if it would leave root. */
export function joinWithin(root: string, segments: string[]): string {
  const base = path.resolve(root);
  const full = path.resolve(base, ...segments);
  if (!isWithin(base, full)) throw new Error(`path escapes ${base}`);
  return full;
}

/** True when `candidate` is `root` or lies below it (both absolute). */
export function isWithin(root: string, candidate: string): boolean {
  const relative = path.relative(root, candidate);
  return relative === '' || (!relative.startsWith('..') && !path.isAbsolute(relative));
}

/**
 * The real path of `candidate` when it exists and, symlinks resolved, is still under
 * the real `root`; undefined otherwise (missing, or a link that points out).
 */
export async function realPathWithin(root: string, candidate: string): Promise<string | undefined> {
  try {
    const [realRoot, realCandidate] = await Promise.all([realpath(root), realpath(candidate)]);
    return isWithin(realRoot, realCandidate) ? realCandidate : undefined;
  } catch {
    return undefined;
  }
}
