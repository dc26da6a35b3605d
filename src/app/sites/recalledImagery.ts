import type { SceneRef } from '../../core/site/index.ts';
import type { FileRef, ImageryMemory, Platform, RecalledFile } from '../../platform/types.ts';
import { checkSiteImagery, type CheckedFile, type ImageryCheck } from './checkImagery.ts';
import type { FingerprintOptions } from './fingerprint.ts';

// A stored site's imagery found again where it was picked (the platform's ImageryMemory):
// the files handed back unchanged are checked like picked ones (and, unchanged since their
// last check, are not hashed again); the others are said to be gone, changed or not
// allowed, by name, so the user knows which to pick. Files picked then join those that
// proved the same already.

const SAID: Record<Exclude<RecalledFile['state'], 'ready'>, { status: CheckedFile['status']; says: string }> = {
  missing: { status: 'gone', says: 'not found where it was picked (moved, renamed or deleted); pick it again' },
  changed: { status: 'changed', says: 'changed since it was checked (its size or modification time differs); pick it to fingerprint it again' },
  'not-allowed': { status: 'not-allowed', says: 'the browser did not allow reading it again; allow it, or pick it again' },
};

/** Checks what the memory handed back; a file it kept that is not ready is named with why. */
export async function checkRecalled(
  platform: Pick<Platform, 'readRange'>, scenes: readonly SceneRef[], recalled: RecalledFile[], options: FingerprintOptions,
): Promise<ImageryCheck> {
  const ready = recalled.flatMap((r) => (r.state === 'ready' ? [r.file] : []));
  const check = await checkSiteImagery(platform, scenes, ready, options);
  return withRecalled(check, recalled);
}

/** The check with each file it missed marked by what became of it where it was kept. */
export function withRecalled(check: ImageryCheck, recalled: RecalledFile[]): ImageryCheck {
  const files = check.files.map((f): CheckedFile => {
    const kept = f.status === 'missing' ? recalled.find((r) => r.name === f.file.name && r.state !== 'ready') : undefined;
    if (!kept || kept.state === 'ready') return f;
    const { status, says } = SAID[kept.state];
    return { ...f, status, message: `${f.file.name}: ${says}` };
  });
  return { ...check, files };
}

/** The files to check after a pick: those picked now, and those that proved the same before under other names. */
export function joinPicked(before: ImageryCheck | null, picked: FileRef[]): FileRef[] {
  const names = new Set(picked.map((f) => f.name));
  const kept = (before?.files ?? []).flatMap((f) => (f.status === 'verified' && f.picked && !names.has(f.file.name) ? [f.picked] : []));
  return [...kept, ...picked];
}

/** Whether the user may be able to allow reading kept files again (a browser's prompt). */
export function needsLeave(check: ImageryCheck | null): boolean {
  return check?.files.some((f) => f.status === 'not-allowed') ?? false;
}

/**
 * Keeps the files as the site's imagery where the platform can. A failure is not raised:
 * it only means the user picks the files on the next open, as before.
 */
export async function rememberImagery(memory: ImageryMemory | null, siteId: string, files: FileRef[]): Promise<void> {
  if (!memory || !siteId || files.length === 0) return;
  try {
    await memory.remember(siteId, files);
  } catch (error) {
    console.warn(`The imagery of site ${siteId} is not remembered for next time: ${(error as Error).message}`);
  }
}
