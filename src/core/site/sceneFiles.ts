import type { SceneFile, SceneRef } from './types.ts';

// Finding a site's imagery again. A site keeps each scene file's name, size and SHA-256,
// never its path (a browser cannot keep one across runs), so the user picks the files
// and each is matched to its scene by name and size here; the hash is checked after.

export interface PickedFile {
  name: string;
  size: number;
}

export interface SceneFileMatch<F extends PickedFile> {
  sceneId: string;
  file: SceneFile;
  /** the picked file of that name and size; null when none was picked */
  picked: F | null;
  /** why a picked file of the same name was not taken (another size), else null */
  problem: string | null;
}

export interface SceneFileMatching<F extends PickedFile> {
  matches: SceneFileMatch<F>[];
  /** picked files that are none of the site's */
  unused: F[];
}

/** Pairs every file of every scene with a picked file of the same name and size. */
export function matchSceneFiles<F extends PickedFile>(scenes: readonly SceneRef[], picked: readonly F[]): SceneFileMatching<F> {
  const free = new Set(picked);
  const matches: SceneFileMatch<F>[] = [];
  for (const scene of scenes) {
    for (const file of scene.files) {
      const found = [...free].find((p) => p.name === file.name && p.size === file.size) ?? null;
      if (found) free.delete(found);
      const namesake = found ? null : picked.find((p) => p.name === file.name);
      matches.push({
        sceneId: scene.id,
        file,
        picked: found,
        problem: namesake ? `${file.name}: is ${namesake.size} bytes, but the site's ${file.name} was ${file.size} bytes; it is another file` : null,
      });
    }
  }
  return { matches, unused: [...free] };
}

/** The file names a site's imagery has, for the picker and the message asking for them. */
export function sceneFileList(scenes: readonly SceneRef[]): string {
  return scenes.flatMap((s) => s.files.map((f) => `${f.name} (${s.date}, ${f.role === 'pan' ? 'panchromatic' : f.role === 'ms' ? 'multiband' : f.role})`)).join(', ');
}
