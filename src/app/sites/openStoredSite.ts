import { SiteStore, type StoreOptions } from '../../store/SiteStore.ts';
import type { Platform } from '../../platform/types.ts';
import type { OpenSite } from '../site.ts';
import { checkedNote, missingNotes, verifiedScenes, type ImageryCheck } from './checkImagery.ts';
import { openSceneImagery, type ProgressOptions } from './sceneImagery.ts';
import { siteOnDesk } from './siteOnDesk.ts';

// Opening a stored site on the desk, with the imagery files that proved to be its own
// (checkSiteImagery), or with none. Scenes whose files were not given are left out and
// the desk says so; with no imagery at all the patches still open on a blank map.

/** Opens a stored site's store, to read its scenes before asking for the imagery. */
export function openSiteStore(siteId: string, options: StoreOptions = {}): Promise<SiteStore> {
  return SiteStore.open(siteId, options);
}

export async function openStoredSite(platform: Pick<Platform, 'readRange'>, store: SiteStore, check: ImageryCheck | null, options: ProgressOptions = {}): Promise<OpenSite> {
  const refs = [...store.state.scenes.values()];
  const scenes = check ? verifiedScenes(check) : [];
  const imagery = scenes.length ? await openSceneImagery(platform, scenes, options) : null;
  const notes = [...(imagery ? [] : missingNotes(null, refs)), ...(check ? missingNotes(check, refs) : [])];
  try {
    const checked = checkedNote(check);
    return { ...siteOnDesk(store, imagery, notes), ...(checked ? { facts: [checked] } : {}) };
  } catch (error) {
    imagery?.dispose();
    throw error;
  }
}
