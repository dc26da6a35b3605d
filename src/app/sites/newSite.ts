import { rosterProblems, type RosterEntry, type SceneFile, type SceneRef } from '../../core/site/index.ts';
import type { FileRef, Platform } from '../../platform/types.ts';
import type { SiteStore, StoreOptions } from '../../store/SiteStore.ts';
import type { OpenSite, SceneView } from '../site.ts';
import { createSite } from '../site/createSite.ts';
import { fingerprint, type FingerprintOptions } from './fingerprint.ts';
import { openSceneImagery, type SceneFiles } from './sceneImagery.ts';
import { siteOnDesk } from './siteOnDesk.ts';

// A new site of the user's own imagery: the scenes are opened first (a file that cannot
// be placed on the map, or a geographic CRS, is refused before anything is stored), then
// every file is fingerprinted (SHA-256, read piece by piece), and only then is the site
// created: its first event, one `scene.added` per date with each file's name, size and
// hash, the roster, and an open pass for its creator. Cancelling before that stores
// nothing.

export interface NewSiteInput {
  name: string;
  interpreter: string;
  roster: RosterEntry[];
  scenes: SceneFiles[];
  now(): string;
}

export interface NewSiteOptions extends FingerprintOptions, StoreOptions {}

function sceneFilesOf(view: SceneView): { role: 'pan' | 'ms'; file: FileRef }[] {
  return [
    ...(view.pan ? [{ role: 'pan' as const, file: view.pan.raster.file }] : []),
    ...(view.ms ? [{ role: 'ms' as const, file: view.ms.raster.file }] : []),
  ];
}

export async function createNewSite(platform: Pick<Platform, 'readRange'>, input: NewSiteInput, options: NewSiteOptions): Promise<OpenSite> {
  const { onProgress = () => {}, signal, hasher, cache, ...store } = options;
  const name = input.name.trim();
  if (!name) throw new Error('Give the site a name.');
  if (!input.interpreter.trim()) throw new Error('Choose who is creating the site (the interpreter profile).');
  const problems = rosterProblems(input.roster);
  if (problems.length) throw new Error(`The roster has problems: ${problems.map((p) => `row ${p.row}: ${p.problem}`).join('; ')}`);
  const dates = input.scenes.map((s) => s.date).filter((d): d is string => d !== null);
  if (new Set(dates).size !== dates.length) throw new Error('Two scenes have the same date; a site holds one scene per date.');

  const imagery = await openSceneImagery(platform, input.scenes, { onProgress: (p) => onProgress({ ...p, fraction: p.fraction === null ? null : p.fraction * 0.3 }), signal });
  let made: SiteStore | null = null;
  try {
    const perScene = imagery.scenes.map(sceneFilesOf);
    const digests = await fingerprint(platform, perScene.flat().map((f) => f.file), {
      hasher, cache, signal, onProgress: (p) => onProgress({ ...p, fraction: p.fraction === null ? null : 0.3 + p.fraction * 0.65 }),
    });
    if (new Set(imagery.scenes.map((s) => s.date)).size !== imagery.scenes.length) throw new Error('Two scenes have the same date; a site holds one scene per date.');
    signal?.throwIfAborted();
    onProgress({ label: 'Storing the site', fraction: 0.97 });
    const context = await createSite({ name, epsg: imagery.epsg, interpreter: input.interpreter.trim(), now: input.now }, store);
    made = context.store;
    const at = () => ({ actor: context.interpreter, time: input.now() });
    let n = 0;
    for (const [i, view] of imagery.scenes.entries()) {
      const files: SceneFile[] = perScene[i].map(({ role, file }) => ({ role, name: file.name, size: file.size, sha256: digests[n++].sha256 }));
      const scene: SceneRef = { id: `scene-${i + 1}`, date: view.date, epsg: imagery.epsg, files };
      await context.store.commit({ kind: 'scene.added', payload: { scene }, ...at() });
    }
    if (input.roster.length) await context.store.commit({ kind: 'roster.set', payload: { entries: input.roster, previous: [] }, ...at() });
    return siteOnDesk(context.store, imagery);
  } catch (error) {
    // A site cut short stays listed with what it got; its store is let go here.
    made?.close();
    imagery.dispose();
    throw error;
  }
}
