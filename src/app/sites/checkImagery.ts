import { matchSceneFiles } from '../../core/site/sceneFiles.ts';
import type { SceneFile, SceneRef } from '../../core/site/index.ts';
import type { FileRef, Platform } from '../../platform/types.ts';
import type { Hasher } from './fileHash.ts';
import { fingerprint } from './newSite.ts';
import type { ProgressOptions, SceneFiles } from './sceneImagery.ts';

// Checking the files a user picked for a stored site: each is matched to its scene file
// by name and size, then its SHA-256 is compared with the one the site recorded when the
// file was added. Only a file that proves to be the same is used.

export type FileStatus = 'verified' | 'missing' | 'differs';

export interface CheckedFile {
  sceneId: string;
  date: string;
  file: SceneFile;
  picked: FileRef | null;
  status: FileStatus;
  /** one line for the user, naming the file */
  message: string;
}

export interface ImageryCheck {
  files: CheckedFile[];
  /** picked files that are none of the site's */
  unused: FileRef[];
}

export async function checkSiteImagery(
  platform: Pick<Platform, 'readRange'>, scenes: readonly SceneRef[], picked: FileRef[], options: ProgressOptions & { hasher: Hasher },
): Promise<ImageryCheck> {
  const { matches, unused } = matchSceneFiles(scenes, picked);
  const found = matches.filter((m) => m.picked);
  const digests = await fingerprint(platform, found.map((m) => m.picked!), options);
  const dateOf = new Map(scenes.map((s) => [s.id, s.date]));
  const files = matches.map((m): CheckedFile => {
    const date = dateOf.get(m.sceneId) ?? '';
    if (!m.picked) return { sceneId: m.sceneId, date, file: m.file, picked: null, status: 'missing', message: m.problem ?? `${m.file.name}: not picked` };
    const digest = digests[found.indexOf(m)];
    return digest === m.file.sha256
      ? { sceneId: m.sceneId, date, file: m.file, picked: m.picked, status: 'verified', message: `${m.file.name}: the same file (SHA-256 ${digest.slice(0, 12)}…)` }
      : {
          sceneId: m.sceneId, date, file: m.file, picked: m.picked, status: 'differs',
          message: `${m.file.name}: refused, its content differs from the file the site was made with (SHA-256 ${digest.slice(0, 12)}…, the site recorded ${m.file.sha256.slice(0, 12)}…)`,
        };
  });
  return { files, unused };
}

/** Whether every file of every scene proved to be the same. */
export function allVerified(check: ImageryCheck): boolean {
  return check.files.every((f) => f.status === 'verified');
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
