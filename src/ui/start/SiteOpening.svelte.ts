import { allVerified, checkSiteImagery, type ImageryCheck } from '../../app/sites/checkImagery.ts';
import type { Hasher } from '../../app/sites/fileHash.ts';
import { openStoredSite } from '../../app/sites/openStoredSite.ts';
import type { SceneRef } from '../../core/site/index.ts';
import type { Platform } from '../../platform/types.ts';
import type { SiteStore } from '../../store/SiteStore.ts';
import type { Workspace } from '../state/Workspace.svelte.ts';

/**
 * Opening a stored site: the app cannot keep file paths across runs, so it asks for the
 * site's imagery, checks each picked file (name, size, SHA-256) and opens the site with
 * what proved the same, or without imagery when the user chooses. The store is held
 * until the site is on the desk (it then belongs to the site) or this is let go.
 */
export class SiteOpening {
  readonly name: string;
  readonly scenes: SceneRef[];
  /** what the user is told first, e.g. what a package asks */
  readonly intro: string | null;
  check = $state.raw<ImageryCheck | null>(null);
  #store: SiteStore | null;

  constructor(private readonly workspace: Workspace, private readonly platform: Platform, private readonly hasher: Hasher, store: SiteStore, intro: string | null = null) {
    this.#store = store;
    this.name = store.name;
    this.scenes = [...store.state.scenes.values()].sort((a, b) => a.date.localeCompare(b.date));
    this.intro = intro;
  }

  get siteId(): string {
    return this.#store?.state.site?.id ?? '';
  }

  get patchCount(): number {
    return this.#store?.state.patches.size ?? 0;
  }

  /** Asks for the imagery files, checks them, and opens the site when every file is its own. */
  async pick(): Promise<void> {
    const store = this.#store;
    if (!store) return;
    const files = await this.platform.pickFiles({ title: `The imagery of ${this.name}`, extensions: ['tif', 'tiff'], multiple: true });
    if (files.length === 0) return;
    const check = await this.workspace.run('Checking the imagery', (onProgress, signal) => checkSiteImagery(this.platform, this.scenes, files, { hasher: this.hasher, onProgress, signal }));
    if (!check) return;
    this.check = check;
    if (allVerified(check)) await this.open(check);
  }

  /** Opens with the files that proved the same (or none, for check null). */
  async open(check: ImageryCheck | null): Promise<void> {
    const store = this.#store;
    if (!store) return;
    await this.workspace.openWith(check ? 'Opening the site with its imagery' : 'Opening the site without imagery', async (onProgress, signal) => {
      const site = await openStoredSite(this.platform, store, check, { onProgress, signal });
      this.#store = null; // the site owns it now
      return site;
    });
  }

  dispose(): void {
    this.#store?.close();
    this.#store = null;
  }
}
