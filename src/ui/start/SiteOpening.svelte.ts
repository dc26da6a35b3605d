import { allVerified, checkSiteImagery, verifiedFiles, wantedFiles, type ImageryCheck } from '../../app/sites/checkImagery.ts';
import type { FingerprintTools } from '../../app/sites/fingerprint.ts';
import { openStoredSite } from '../../app/sites/openStoredSite.ts';
import { checkRecalled, joinPicked, rememberImagery, withRecalled } from '../../app/sites/recalledImagery.ts';
import type { SceneRef } from '../../core/site/index.ts';
import type { Platform, RecalledFile } from '../../platform/types.ts';
import type { SiteStore } from '../../store/SiteStore.ts';
import type { Workspace } from '../state/Workspace.svelte.ts';

/**
 * Opening a stored site with its imagery. Where the platform keeps a site's imagery
 * (ImageryMemory), the files given last time are looked for first: all there, unchanged
 * and proving the same, the site opens at once. Otherwise the user is asked for the files
 * that are missing or changed; each given file is checked (name, size, SHA-256, unless
 * unchanged since an earlier check) and the site opens with what proved the same, or
 * without imagery when the user chooses. The store is held until the site is on the desk
 * (it then belongs to the site) or this is let go.
 */
export class SiteOpening {
  readonly name: string;
  readonly scenes: SceneRef[];
  /** what the user is told first, e.g. what a package asks */
  readonly intro: string | null;
  /** whether files given here are found again next time */
  readonly remembers: boolean;
  check = $state.raw<ImageryCheck | null>(null);
  /** why the kept files could not be looked for, when they could not */
  memoryProblem = $state<string | null>(null);
  /** whether files given before were looked for where they were picked */
  lookedAgain = $state(false);
  #recalled: RecalledFile[] = [];
  #store: SiteStore | null;

  constructor(
    private readonly workspace: Workspace, private readonly platform: Platform, private readonly tools: FingerprintTools,
    store: SiteStore, intro: string | null = null,
  ) {
    this.#store = store;
    this.name = store.name;
    this.scenes = [...store.state.scenes.values()].sort((a, b) => a.date.localeCompare(b.date));
    this.intro = intro;
    this.remembers = platform.imageryMemory !== null;
  }

  get siteId(): string {
    return this.#store?.state.site?.id ?? '';
  }

  get patchCount(): number {
    return this.#store?.state.patches.size ?? 0;
  }

  /** Whether the site is on the desk (the store then belongs to it). */
  get opened(): boolean {
    return this.#store === null;
  }

  /**
   * Looks for the files kept for this site (`recalling`, asked for by the caller while its
   * click still counted) and checks them; opens the site when every file is there and its
   * own. Resolves to whether the site is open.
   */
  async fromMemory(recalling: Promise<RecalledFile[]>): Promise<boolean> {
    const check = await this.workspace.run('Looking for the imagery where it was picked', async (onProgress, signal) => {
      let recalled: RecalledFile[];
      try {
        recalled = await recalling;
      } catch (error) {
        this.memoryProblem = `The files given for this site before could not be looked for (${(error as Error).message}); pick them.`;
        return null;
      }
      this.#recalled = recalled;
      if (recalled.length === 0) return null;
      this.lookedAgain = true;
      return checkRecalled(this.platform, this.scenes, recalled, { ...this.tools, onProgress, signal });
    });
    if (!check) return false;
    this.check = check;
    if (allVerified(check)) await this.open(check);
    return this.opened;
  }

  /** Asks the browser's leave to read the kept files again (from a click), and looks again. */
  allowAgain(): Promise<boolean> {
    const recalling = this.platform.imageryMemory?.recall(this.siteId, { ask: true }) ?? Promise.resolve([]);
    return this.fromMemory(recalling);
  }

  /** Asks for the imagery files still wanted, checks them with those that proved the same, and opens the site when every file is its own. */
  async pick(): Promise<void> {
    const store = this.#store;
    if (!store) return;
    const wanted = this.wanted;
    const files = await this.platform.pickFiles({
      title: wanted.length === 1 ? `${wanted[0]} of ${this.name}` : `The imagery of ${this.name}`, extensions: ['tif', 'tiff'], multiple: true, remember: true,
    });
    if (files.length === 0) return;
    const given = joinPicked(this.check, files);
    const check = await this.workspace.run('Checking the imagery', (onProgress, signal) => checkSiteImagery(this.platform, this.scenes, given, { ...this.tools, onProgress, signal }));
    if (!check) return;
    this.check = withRecalled(check, this.#recalled);
    if (allVerified(check)) await this.open(check);
  }

  /** The names of the site's files that have not proved to be its own yet. */
  get wanted(): string[] {
    return wantedFiles(this.scenes, this.check);
  }

  /** Opens with the files that proved the same (or none, for check null); those are remembered for next time. */
  async open(check: ImageryCheck | null): Promise<void> {
    const store = this.#store;
    if (!store) return;
    const siteId = this.siteId;
    await this.workspace.openWith(check ? 'Opening the site with its imagery' : 'Opening the site without imagery', async (onProgress, signal) => {
      const site = await openStoredSite(this.platform, store, check, { onProgress, signal });
      this.#store = null; // the site owns it now
      if (check) await rememberImagery(this.platform.imageryMemory, siteId, verifiedFiles(check));
      return site;
    });
  }

  dispose(): void {
    this.#store?.close();
    this.#store = null;
  }
}
