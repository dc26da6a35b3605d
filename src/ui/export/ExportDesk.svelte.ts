import type { SqlJsStatic } from 'sql.js';
import { EXPORT_CAUTIONS } from '../../core/export/cautions.ts';
import { ExportError } from '../../core/export/ExportError.ts';
import { exportSite, type ExportFormat } from '../../core/export/exportSite.ts';
import { namedSchemes, type NamedScheme } from '../../core/export/namedSchemes.ts';
import type { ExportOptions, ExportSelection } from '../../core/export/options.ts';
import { patchRecords, type ExportedPatch } from '../../core/export/patchRecords.ts';
import type { LedgerEvent, SiteState } from '../../core/site/index.ts';

// The Export page's state: what goes out, in which format, the provenance preview, and
// the run that builds the three files and saves each through the platform bridge.

/** What the page needs of the stored site. */
export interface ExportSource {
  readonly state: SiteState;
  ledger(): Promise<LedgerEvent[]>;
}

export interface ExportDeskDeps {
  source: ExportSource;
  /** Saves one file; false when the user cancelled. */
  save(name: string, bytes: Uint8Array): Promise<boolean>;
  loadSql(): Promise<SqlJsStatic>;
  now(): string;
  appVersion: string;
}

export interface ExportPreview {
  patches: number;
  leftOut: { reason: string; count: number }[];
  ledgerHead: { seq: number; hash: string };
  scenes: { id: string; date: string; files: { name: string; sha256: string }[] }[];
  /** The first patch's properties as they will be written, geometry left out. */
  sample: Omit<ExportedPatch, 'geometry'> | null;
  messages: string[];
}

export type ExportWhat = 'consensus' | 'all-passes' | 'pass';

export class ExportDesk {
  what = $state<ExportWhat>('consensus');
  passId = $state('');
  open = $state<'refuse' | 'leave-out' | 'include'>('refuse');
  schemeName = $state('species');
  foldsOn = $state(false);
  foldK = $state(5);
  foldBlock = $state(50);
  foldSeed = $state(1);
  format = $state<ExportFormat>('geojson');

  preview = $state.raw<ExportPreview | null>(null);
  /** Why the chosen export cannot be made (e.g. open disagreements), or null. */
  problem = $state<string | null>(null);
  running = $state(false);
  progress = $state<{ stage: string; done: number; total: number } | null>(null);
  saved = $state.raw<string[]>([]);
  outcome = $state<string | null>(null);

  readonly cautions = EXPORT_CAUTIONS;
  private token = 0;
  private abort: AbortController | null = null;

  constructor(private readonly deps: ExportDeskDeps) {
    const first = [...deps.source.state.passes.keys()][0];
    if (first) this.passId = first;
  }

  get passes(): { id: string; interpreter: string; blind: boolean }[] {
    return [...this.deps.source.state.passes.values()].map((p) => ({ id: p.id, interpreter: p.interpreter, blind: p.blind }));
  }

  get schemes(): NamedScheme[] {
    return namedSchemes(this.deps.source.state.roster, this.deps.source.state.schemes);
  }

  /** The options as chosen; reading it reads every choice (the page's preview follows it). */
  get options(): ExportOptions {
    const selection: ExportSelection = this.what === 'pass' ? { kind: 'pass', passId: this.passId } : { kind: this.what };
    return {
      selection,
      scheme: this.schemes.find((s) => s.name === this.schemeName)?.scheme ?? null,
      folds: this.foldsOn ? { k: this.foldK, blockSize: this.foldBlock, seed: this.foldSeed } : null,
      open: this.open,
    };
  }

  /** Rebuilds the preview for the current choices; a newer call wins over an older one. */
  async refresh(): Promise<void> {
    const token = ++this.token;
    const options = this.options;
    try {
      const events = await this.deps.source.ledger();
      const state = this.deps.source.state;
      const set = patchRecords(state, events, options);
      if (token !== this.token) return;
      const first = set.patches[0];
      const sample = first ? (({ geometry: _g, ...rest }) => rest)(first) : null;
      this.preview = {
        patches: set.patches.length,
        leftOut: set.leftOut.map((l) => ({ reason: l.reason, count: l.ids.length })),
        ledgerHead: { ...state.head },
        scenes: [...state.scenes.values()].map((s) => ({ id: s.id, date: s.date, files: s.files.map((f) => ({ name: f.name, sha256: f.sha256 })) })),
        sample,
        messages: set.messages,
      };
      this.problem = null;
    } catch (error) {
      if (token !== this.token) return;
      this.preview = null;
      this.problem = error instanceof ExportError || error instanceof RangeError ? error.message : `the preview failed: ${(error as Error).message}`;
    }
  }

  /** Builds the export and saves its files one by one; the outcome says what was saved. */
  async run(): Promise<void> {
    if (this.running) return;
    this.running = true;
    this.outcome = null;
    this.saved = [];
    this.abort = new AbortController();
    try {
      const events = await this.deps.source.ledger();
      const sql = this.format === 'gpkg' ? await this.deps.loadSql() : undefined;
      const { files, summary } = await exportSite({ state: this.deps.source.state, events }, this.options, {
        format: this.format, appVersion: this.deps.appVersion, time: this.deps.now(), sql, signal: this.abort.signal,
        onProgress: (stage, done, total) => { this.progress = { stage, done, total }; },
      });
      const saved: string[] = [];
      for (const file of files) {
        this.progress = { stage: `saving ${file.name}`, done: saved.length, total: files.length };
        if (!(await this.deps.save(file.name, file.bytes))) {
          this.outcome = saved.length
            ? `Saving stopped after ${saved.join(', ')}: keep the three files together, or export again.`
            : 'Nothing was saved.';
          this.saved = saved;
          return;
        }
        saved.push(file.name);
      }
      this.saved = saved;
      this.outcome = `Saved ${summary.patches} patch(es) as ${saved.join(', ')}.`;
    } catch (error) {
      this.outcome = error instanceof ExportError ? error.message : `The export failed: ${(error as Error).message}`;
    } finally {
      this.running = false;
      this.progress = null;
      this.abort = null;
    }
  }

  cancel(): void {
    this.abort?.abort();
  }
}
