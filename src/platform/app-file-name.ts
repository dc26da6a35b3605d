// The app's own files (the copies of its sites, its pyramid caches) are asked for by a
// plain name, never by a path: one segment of letters, digits and . _ -, starting with a
// letter or digit, with no '..' anywhere, at most MAX_APP_FILE_NAME characters, and none
// of the names Windows keeps for devices. Names starting with '.' are left free for the
// temporary files of an atomic write. The same rule runs in the renderer (to fail early)
// and in the Electron main process (to refuse).

import { PlatformError } from './errors.ts';

export const MAX_APP_FILE_NAME = 120;
const NAME = /^[A-Za-z0-9][A-Za-z0-9._-]*$/;
const WINDOWS_DEVICE = /^(con|prn|aux|nul|com[0-9]|lpt[0-9])(\.|$)/i;

/** The name itself when it is a valid app file name, else a 'bad-request' error saying why. */
export function checkAppFileName(name: unknown): string {
  if (typeof name !== 'string' || name.length === 0) {
    throw new PlatformError('bad-request', 'an app file name must be a non-empty string');
  }
  const shown = name.slice(0, 40);
  if (name.length > MAX_APP_FILE_NAME) {
    throw new PlatformError('bad-request', `an app file name is at most ${MAX_APP_FILE_NAME} characters`, shown);
  }
  if (!NAME.test(name) || name.includes('..') || name.endsWith('.')) {
    throw new PlatformError('bad-request', 'not an app file name (letters, digits and . _ - only, starting with a letter or digit; no "..", no folders)', shown);
  }
  if (WINDOWS_DEVICE.test(name)) {
    throw new PlatformError('bad-request', 'this name stands for a device on Windows', shown);
  }
  return name;
}

/** Whether `name` passes checkAppFileName (for listings, which skip anything else). */
export function isAppFileName(name: string): boolean {
  try {
    checkAppFileName(name);
    return true;
  } catch {
    return false;
  }
}
