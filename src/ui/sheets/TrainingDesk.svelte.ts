import { blindView } from '../../core/blind/index.ts';
import type { RasterGrid } from '../../core/geometry/rasterGrid.ts';
import type { LedgerEvent, SiteState } from '../../core/site/index.ts';
import type { GapAction } from '../../core/training/foldGap.ts';
import { gapProblem } from '../../core/training/foldGap.ts';
import { foldOptionsProblem } from '../../core/training/folds.ts';
import { groupScheme, oneAgainstRestScheme, speciesScheme, type Scheme } from '../../core/training/scheme.ts';
import type { JobRunner } from '../../app/jobs/jobWorker.ts';
import { deleteScheme, saveScheme } from '../../app/training/schemeEdits.ts';
import { trainingSet, type SheetJob, type SheetSummary, type TrainingSet } from '../../app/training/trainingSheet.ts';
import type { SiteStore } from '../../store/SiteStore.ts';
import { systemClock } from '../../app/site/context.ts';
import { tellFailure } from '../state/tellFailure.ts';
import type { PixelRuleChoice } from '../state/PixelRuleChoice.svelte.ts';

// The Training sheet's state: the choices (scheme, rare thresholds, folds and their gap),
// the site's stored schemes and their edits, and the figures, which follow the site: a
// change on any page, or a new choice here, works them out again a moment later (debounced),
// in a worker, the older run dropped.

export type Preset = 'species' | 'conifers' | 'target';
export const PRESETS: { id: Preset; label: string }[] = [
  { id: 'species', label: 'all species, each its own class' },
  { id: 'conifers', label: 'conifers by species, the rest as other' },
  { id: 'target', label: 'one species against the rest' },
];

/** The scheme in use: a stored one by name ('stored:NAME') or a preset ('preset:ID'). */
export type SchemeKey = `stored:${string}` | `preset:${Preset}`;

export interface TrainingDeskDeps {
  store: SiteStore;
  grid: RasterGrid | null;
  rule: PixelRuleChoice;
  /** who is at the desk (their open blind pass keeps other calls off the sheet) */
  interpreter: () => string;
  runner: JobRunner<SheetJob, SheetSummary>;
  now?: () => string;
  /** wait this long after the last change before working the figures out (ms) */
  debounce?: number;
}

/** What the person chose on the sheet, kept for the open site while the page is closed. */
export class TrainingChoices {
  /** null until the sheet first opens: then the first stored scheme, or every species */
  schemeKey = $state<SchemeKey | null>(null);
  target = $state('');
  rareShare = $state(5);
  rareCount = $state(50);
  k = $state(5);
  block = $state(50);
  seed = $state(1);
  gap = $state(0);
  gapAction = $state<GapAction>('leave-out');
}

const kept = new WeakMap<object, TrainingChoices>();

/** The choices kept for a site (by its store). */
export function trainingChoicesOf(site: object): TrainingChoices {
  let choices = kept.get(site);
  if (!choices) kept.set(site, (choices = new TrainingChoices()));
  return choices;
}

export class TrainingDesk {
  #raw = $state.raw<SiteState>(null as unknown as SiteState);
  /** Settled patches as the person at the desk may see them (an open blind pass hides the rest). */
  #trainable = $derived.by<TrainingSet>(() => trainingSet(blindView(this.#raw, this.#deps.interpreter())));
  #species = $derived.by<string[]>(() => {
    const codes = this.#raw.roster.map((e) => e.code);
    const strays = this.#trainable.patches.map((p) => p.species).filter((s) => !codes.includes(s));
    return [...codes, ...strays.filter((s, i) => strays.indexOf(s) === i).sort()];
  });
  readonly choices: TrainingChoices;

  summary = $state.raw<SheetSummary | null>(null);
  leftOut = $state.raw<Record<string, string[]>>({});
  /** the ledger head the figures were worked out from */
  asOf = $state(0);
  working = $state(false);
  problem = $state<string | null>(null);
  /** what the last scheme edit or undo did */
  message = $state<{ text: string; problem: boolean } | null>(null);

  readonly #deps: TrainingDeskDeps;
  readonly #unsubscribe: () => void;
  #timer: ReturnType<typeof setTimeout> | null = null;
  #running: AbortController | null = null;

  constructor(deps: TrainingDeskDeps, choices: TrainingChoices = trainingChoicesOf(deps.store)) {
    this.#deps = deps;
    this.#raw = deps.store.state;
    this.choices = choices;
    if (!choices.target) choices.target = deps.store.state.roster[0]?.code ?? '';
    choices.schemeKey ??= deps.store.state.schemes[0] ? `stored:${deps.store.state.schemes[0].name}` : 'preset:species';
    this.#unsubscribe = deps.store.subscribe((state) => {
      this.#raw = state;
      // A stored scheme in use that is gone (deleted, or its storing undone): the first left, or every species.
      if (this.schemeKey.startsWith('stored:') && !state.schemes.some((s) => `stored:${s.name}` === this.schemeKey)) {
        this.choices.schemeKey = state.schemes[0] ? `stored:${state.schemes[0].name}` : 'preset:species';
      }
      this.schedule();
    });
  }

  get schemeKey(): SchemeKey {
    return this.choices.schemeKey ?? 'preset:species';
  }

  get state(): SiteState {
    return this.#raw;
  }

  get schemes(): readonly Scheme[] {
    return this.#raw.schemes;
  }

  /** The species a scheme should place: the roster's, then any other a settled patch carries. */
  get species(): string[] {
    return this.#species;
  }

  /** The scheme a preset gives for this roster. */
  preset(id: Preset, target = this.choices.target): Scheme {
    if (id === 'conifers') return groupScheme(this.#raw.roster, 'conifer');
    if (id === 'target') return oneAgainstRestScheme(this.species, target);
    return speciesScheme(this.species);
  }

  /** The scheme in use. */
  get scheme(): Scheme {
    const key = this.schemeKey;
    if (key.startsWith('stored:')) return this.#raw.schemes.find((s) => `stored:${s.name}` === key) ?? this.preset('species');
    return this.preset(key.slice('preset:'.length) as Preset);
  }

  /** Why the choices cannot be worked out, or null. */
  get choiceProblem(): string | null {
    const c = this.choices;
    if (!this.#deps.grid) return 'The scene has no multispectral raster, so there are no pixels to count.';
    if (this.#deps.rule.problem) return `Pure pixels: ${this.#deps.rule.problem}.`;
    const folds = foldOptionsProblem({ k: Number(c.k), blockSize: Number(c.block), seed: Number(c.seed) });
    if (folds) return `Folds: ${folds}.`;
    const gap = gapProblem(Number(c.gap));
    if (gap) return `Folds: ${gap}.`;
    if (!(Number(c.rareShare) >= 0 && Number(c.rareShare) <= 100)) return `Rare classes: the share must be a percentage from 0 to 100, got ${c.rareShare}.`;
    if (!(Number(c.rareCount) >= 0)) return `Rare classes: the pixel count must be 0 or more, got ${c.rareCount}.`;
    return null;
  }

  /** Every choice in one string: the page reads it so that any change schedules a new run. */
  get choiceKey(): string {
    const c = this.choices;
    return JSON.stringify([c.schemeKey, c.target, c.rareShare, c.rareCount, c.k, c.block, c.seed, c.gap, c.gapAction, this.#deps.rule.rule]);
  }

  /** Works the figures out a moment after the last call (changes come in bursts). */
  schedule(): void {
    if (this.#timer) clearTimeout(this.#timer);
    this.#timer = setTimeout(() => {
      this.#timer = null;
      void this.#run();
    }, this.#deps.debounce ?? 250);
  }

  async #run(): Promise<void> {
    this.#running?.abort();
    const problem = this.choiceProblem;
    if (problem) {
      this.problem = problem;
      this.working = false;
      return;
    }
    const running = (this.#running = new AbortController());
    const state = this.#raw;
    const set = this.#trainable;
    const job: SheetJob = {
      set,
      grid: this.#deps.grid!,
      options: {
        rule: this.#deps.rule.rule,
        scheme: $state.snapshot(this.scheme) as Scheme,
        balance: { rareShare: Number(this.choices.rareShare) / 100, rareCount: Number(this.choices.rareCount) },
        folds: { k: Number(this.choices.k), blockSize: Number(this.choices.block), seed: Number(this.choices.seed) },
        gap: { distance: Number(this.choices.gap), action: this.choices.gapAction },
      },
    };
    this.working = true;
    try {
      const summary = await this.#deps.runner.run(job, running.signal);
      if (running.signal.aborted) return;
      this.summary = summary;
      this.leftOut = set.leftOut;
      this.asOf = state.head.seq;
      this.problem = null;
    } catch (error) {
      if (running.signal.aborted || (error as Error).name === 'AbortError') return;
      this.problem = (error as Error).message;
    } finally {
      if (this.#running === running) {
        this.working = false;
        this.#running = null;
      }
    }
  }

  // --- scheme edits and undo ---

  async saveScheme(scheme: Scheme, replacing: string | null): Promise<boolean> {
    return this.#edit(async () => {
      const event = await saveScheme(this.#deps.store, scheme, replacing, this.#who());
      const name = scheme.name.trim();
      this.choices.schemeKey = `stored:${name}`;
      this.message = { text: event ? `Scheme "${name}" stored with the site (Ctrl+Z undoes it).` : `Scheme "${name}" is unchanged.`, problem: false };
    });
  }

  async deleteScheme(name: string): Promise<boolean> {
    return this.#edit(async () => {
      await deleteScheme(this.#deps.store, name, this.#who());
      this.message = { text: `Scheme "${name}" deleted (Ctrl+Z brings it back).`, problem: false };
    });
  }

  /** The site's undo (the same stack as the desk's), saying what it reversed. */
  undo(): Promise<boolean> {
    return this.#edit(async () => {
      const event = await this.#deps.store.undo(this.#deps.interpreter(), this.#now());
      this.message = event ? { text: `Undone: ${whatChanged(event)}.`, problem: false } : { text: 'Nothing left to undo.', problem: false };
    });
  }

  redo(): Promise<boolean> {
    return this.#edit(async () => {
      const event = await this.#deps.store.redo(this.#deps.interpreter(), this.#now());
      this.message = event ? { text: `Redone: ${whatChanged(event)}.`, problem: false } : { text: 'Nothing to redo.', problem: false };
    });
  }

  #edit(work: () => Promise<void>): Promise<boolean> {
    return tellFailure(work, (text) => (this.message = { text, problem: true }));
  }

  #who() {
    return { interpreter: this.#deps.interpreter(), time: this.#now() };
  }

  #now(): string {
    return (this.#deps.now ?? systemClock)();
  }

  dispose(): void {
    this.#unsubscribe();
    if (this.#timer) clearTimeout(this.#timer);
    this.#running?.abort();
  }
}

/** A change in a few words, for the undo message. */
function whatChanged(event: LedgerEvent): string {
  return event.kind === 'schemes.set' ? 'the change to the schemes' : 'the last change of the site, made on another page';
}
