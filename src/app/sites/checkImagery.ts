import { matchSceneFiles } from '../../core/site/sceneFiles.ts';
import type { SceneFile, SceneRef } from '../../core/site/index.ts';
import type { FileRef, Platform } from '../../platform/types.ts';
import { fingerprint, type FingerprintOptions } from './fingerprint.ts';
import type { SceneFiles } from './sceneImagery.ts';

// Checking the files given for a stored site (picked by the user, or found again where
// they were picked): each is matched to its scene file by name and size, then its SHA-256
// is compared with the one the site recorded when the file was added. A file unchanged
// since it was fingerprinted before is not hashed again (see fingerprintCache.ts). Only a
// file that proves to be the same is used.

export type FileStatus =
  | 'verified'
  | 'differs'
  | 'missing' // not given
  | 'gone' // kept from an earlier pick, but no longer where it was
  | 'changed' // kept from an earlier pick, but its size or modification time moved since
  | 'not-allowed'; // kept from an earlier pick, but the browser did not allow reading it again

export interface CheckedFile {
  sceneId: string;
  date: string;
  file: SceneFile;
  picked: FileRef | null;
  status: FileStatus;
  /** how a given file's fingerprint was had: unchanged since an earlier check, or hashed now */
  how: 'earlier' | 'now' | null;
  /** one line for the user, naming the file */
  message: string;
}

export interface ImageryCheck {
  files: CheckedFile[];
  /** given files that are none of the site's */
  unused: FileRef[];
}

export async function checkSiteImagery(
  platform: Pick<Platform, 'readRange'>, scenes: readonly SceneRef[], picked: FileRef[], options: FingerprintOptions,
): Promise<ImageryCheck> {
  const { matches, unused } = matchSceneFiles(scenes, picked);
  const found = matches.filter((m) => m.picked);
  const prints = await fingerprint(platform, found.map((m) => m.picked!), options);
  const dateOf = new Map(scenes.map((s) => [s.id, s.date]));
  const files = matches.map((m): CheckedFile => {
    const date = dateOf.get(m.sceneId) ?? '';
    if (!m.picked) return { sceneId: m.sceneId, date, file: m.file, picked: null, status: 'missing', how: null, message: m.problem ?? `${m.file.name}: not picked` };
    const { sha256, how } = prints[found.indexOf(m)];
    const checked = { sceneId: m.sceneId, date, file: m.file, picked: m.picked, how };
    return sha256 === m.file.sha256
      ? { ...checked, status: 'verified', message: `${m.file.name}: the same file, ${how === 'earlier' ? 'checked earlier and unchanged since' : 'fingerprinted now'} (SHA-256 ${sha256.slice(0, 12)}…)` }
      : {
          ...checked, status: 'differs',
          message: `${m.file.name}: refused, its content differs from the file the site was made with (SHA-256 ${sha256.slice(0, 12)}…, the site recorded ${m.file.sha256.slice(0, 12)}…)`,
        };
  });
  return { files, unused };
}

/** Whether every file of every scene proved to be the same. */
export function allVerified(check: ImageryCheck): boolean {
  return check.files.every((f) => f.status === 'verified');
}

/** The given files that proved to be the site's own. */
export function verifiedFiles(check: ImageryCheck): FileRef[] {
  return check.files.flatMap((f) => (f.status === 'verified' && f.picked ? [f.picked] : []));
}

/** The names of the site's files that have not proved to be its own yet (all of them before any check). */
export function wantedFiles(scenes: readonly SceneRef[], check: ImageryCheck | null): string[] {
  const verified = new Set(check?.files.filter((f) => f.status === 'verified').map((f) => `${f.sceneId}/${f.file.name}`) ?? []);
  return scenes.flatMap((s) => s.files.filter((f) => !verified.has(`${s.id}/${f.name}`)).map((f) => f.name));
}

/** The scenes that can be shown: each with the files of it that proved the same, in date order. */
export function verifiedScenes(check: ImageryCheck): SceneFiles[] {
  const byScene = new Map<string, SceneFiles>();
  for (const f of check.files) {
    if (f.status !== 'verified') continue;
    const scene = byScene.get(f.sceneId) ?? { date: f.date, files: [] };
    scene.files.push(f.picked!);
    byScene.set(f.sceneId, scene);
  }
  return [...byScene.values()].sort((a, b) => (a.date ?? '').localeCompare(b.date ?? ''));
}

/** What the desk says is missing when a site opens with part of its imagery or none. */
export function missingNotes(check: ImageryCheck | null, scenes: readonly SceneRef[]): string[] {
  if (!check) return [`Opened without imagery: the patches, tags and checks that need no pixels work; pick the imagery (${scenes.flatMap((s) => s.files.map((f) => f.name)).join(', ')}) to see it.`];
  return check.files.filter((f) => f.status !== 'verified').map((f) => `Not shown: ${f.message}`);
}

/** How the imagery shown was checked, in one line for the desk; null when none is shown. */
export function checkedNote(check: ImageryCheck | null): string | null {
  const shown = check?.files.filter((f) => f.status === 'verified') ?? [];
  if (!shown.length) return null;
  const said = (['earlier', 'now'] as const).flatMap((how) => {
    const names = shown.filter((f) => f.how === how).map((f) => f.file.name);
    return names.length ? [`${names.join(' and ')} ${how === 'earlier' ? 'checked earlier and unchanged since' : 'fingerprinted now'}`] : [];
  });
  return `The imagery is the site's own (SHA-256): ${said.join('; ')}.`;
}
