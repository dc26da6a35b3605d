import type { FingerprintTools } from '../../app/sites/fingerprint.ts';
import { createNewSite } from '../../app/sites/newSite.ts';
import { rememberImagery } from '../../app/sites/recalledImagery.ts';
import { demoRoster, rosterFromFile } from '../../app/sites/startingRoster.ts';
import { InterpreterProfiles } from '../../app/blind/interpreterProfiles.ts';
import type { RosterEntry } from '../../core/site/index.ts';
import type { FileRef, Platform } from '../../platform/types.ts';
import type { Workspace } from '../state/Workspace.svelte.ts';
import { nowIso } from '../state/listeners.ts';

export type RosterStart = 'empty' | 'file' | 'demo';

export interface DateChoice {
  /** YYYY-MM-DD, or '' to take the date the files record */
  date: string;
  files: FileRef[];
}

/** The new-site form: name, one or two dates of imagery, the starting roster, who creates it. */
export class NewSiteForm {
  name = $state('');
  dates = $state.raw<DateChoice[]>([{ date: '', files: [] }]);
  rosterStart = $state<RosterStart>('empty');
  roster = $state.raw<RosterEntry[]>([]);
  rosterNote = $state<string | null>(null);
  problem = $state<string | null>(null);
  interpreter = $state('');
  profileNames = $state.raw<string[]>([]);
  newName = $state('');
  newInitials = $state('');
  #profiles: InterpreterProfiles;

  constructor(private readonly workspace: Workspace, private readonly platform: Platform, private readonly tools: FingerprintTools, storage: Storage) {
    this.#profiles = new InterpreterProfiles(storage, nowIso);
    this.profileNames = this.#profiles.profiles.map((p) => p.name);
    this.interpreter = this.#profiles.current?.name ?? '';
  }

  get ready(): boolean {
    return this.name.trim() !== '' && this.interpreter !== '' && this.dates.every((d) => d.files.length > 0);
  }

  async pickImagery(index: number): Promise<void> {
    const files = await this.platform.pickFiles({ title: 'The imagery of one date: a panchromatic and a multiband GeoTIFF', extensions: ['tif', 'tiff'], multiple: true, remember: true });
    if (files.length === 0) return;
    this.problem = files.length > 2 ? `Pick one or two files for one date (a panchromatic and a multiband GeoTIFF); got ${files.length}.` : null;
    if (this.problem) return;
    this.dates = this.dates.map((d, i) => (i === index ? { ...d, files } : d));
    if (!this.name.trim()) this.name = files[0].name.replace(/\.(tiff?)$/i, '').replace(/[-_](pan|ms|p|mul)$/i, '');
  }

  setDate(index: number, date: string): void {
    this.dates = this.dates.map((d, i) => (i === index ? { ...d, date } : d));
  }

  addDate(): void {
    if (this.dates.length < 2) this.dates = [...this.dates, { date: '', files: [] }];
  }

  removeDate(index: number): void {
    this.dates = this.dates.filter((_, i) => i !== index);
  }

  async chooseRoster(start: RosterStart): Promise<void> {
    this.problem = null;
    try {
      if (start === 'empty') {
        this.roster = [];
        this.rosterNote = null;
      } else if (start === 'demo') {
        this.roster = await demoRoster(this.platform);
        this.rosterNote = `A copy of the demo's ${this.roster.length} species, to edit on the desk.`;
      } else {
        const [file] = await this.platform.pickFiles({ title: 'A roster file (CSV or JSON)', extensions: ['csv', 'json'] });
        if (!file) {
          this.rosterStart = this.roster.length ? this.rosterStart : 'empty';
          return;
        }
        this.roster = await rosterFromFile(this.platform, file);
        this.rosterNote = `${file.name}: ${this.roster.length} species.`;
      }
      this.rosterStart = start;
    } catch (error) {
      this.problem = (error as Error).message;
      this.rosterStart = 'empty';
      this.roster = [];
      this.rosterNote = null;
    }
  }

  addProfile(): void {
    try {
      const p = this.#profiles.add(this.newName, this.newInitials);
      this.profileNames = this.#profiles.profiles.map((x) => x.name);
      this.interpreter = p.name;
      this.newName = this.newInitials = '';
      this.problem = null;
    } catch (error) {
      this.problem = (error as Error).message;
    }
  }

  async create(): Promise<void> {
    this.problem = null;
    // The creator takes the desk: the switch is recorded in the profile book.
    if (this.#profiles.current?.name !== this.interpreter) this.#profiles.switchTo(this.interpreter);
    const input = {
      name: this.name,
      interpreter: this.interpreter,
      roster: this.roster,
      scenes: this.dates.map((d) => ({ date: d.date || null, files: d.files })),
      now: nowIso,
    };
    await this.workspace.openWith('Creating the site', async (onProgress, signal) => {
      const site = await createNewSite(this.platform, input, { ...this.tools, onProgress, signal });
      // Found again where they are on the next open, with the fingerprints just taken.
      await rememberImagery(this.platform.imageryMemory, site.store?.state.site?.id ?? '', input.scenes.flatMap((s) => s.files));
      return site;
    });
  }
}
