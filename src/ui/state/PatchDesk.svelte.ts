import type { SiteStore } from '../../store/SiteStore.ts';
import { emptySiteState, isPaused, type Confidence, type DisplaySettings, type RosterEntry, type SiteState, type Tag } from '../../core/site/index.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import type { RasterGrid } from '../../core/geometry/rasterGrid.ts';
import { findPatchId, hiddenPasses, nextMatching, patchOrder, shownTag, tagsByPatch } from '../../app/patches/patchIndex.ts';
import { Listeners, nowIso } from './listeners.ts';
import { addPatch, deletePatch, editPatchGeometry, mergePatches, splitPatch, type Actor } from '../../app/patches/patchEdits.ts';
import { tagPatch, type TagChange } from '../../app/patches/tagPatch.ts';
import { openPassOf } from '../../app/patches/passes.ts';
import { measureOutline, type OutlineMeasure } from '../../app/patches/liveMeasure.ts';
import { ACTION_KEYS, CONFIDENCE_KEYS, DESK_KEYS, TOOL_KEYS, type Tool } from './patchKeys.ts';
import { setRoster } from '../../app/patches/rosterEdits.ts';
import { blindView, openBlindPassOf } from '../../core/blind/index.ts';
import { tagInBlindPass } from '../../app/blind/blindPasses.ts';
import { commitFieldImport, type ImportChoices, type ReadFieldFile } from '../../app/patches/importFieldFile.ts';

export type SaveStatus = 'saved' | 'saving' | 'failed';

export interface PatchDeskOptions {
  store: SiteStore;
  /** what the imagery shows now, recorded with every tag */
  display: () => DisplaySettings;
  /** the multispectral grid pixels are counted on, or null */
  grid: () => RasterGrid | null;
  interpreter?: string;
  now?: () => string;
}

/**
 * The patches on the desk: the stored site's state, the patch in hand, the tool, the
 * save status and every edit the keyboard or the map asks for. Each edit goes through
 * the store, and the status says "saved" only once every edit so far is durable.
 */
export class PatchDesk {
  state = $state.raw<SiteState>(null as unknown as SiteState);
  selectedId = $state<string | null>(null);
  tool = $state<Tool>('select');
  snap = $state(true);
  interpreter = $state('Interpreter A');
  status = $state<SaveStatus>('saved');
  /** the last failure, told so a user can act on it */
  error = $state<string | null>(null);
  /** a plain remark on the last key (e.g. nothing left untagged) */
  notice = $state<string | null>(null);
  /** the outline being drawn or edited, measured live */
  sketch = $state<OutlineMeasure | null>(null);
  /** an area drawn for a delineation not yet started, shown on the map */
  pendingArea = $state.raw<MultiPolygonRings | null>(null);
  /** bumped to ask the panel to focus its note or jump field */
  noteRequests = $state(0);
  jumpRequests = $state(0);

  #tags: Map<string, Tag[]> = tagsByPatch(emptySiteState());
  /** The walking order of "next", sorted when first walked after a change (sorting every id costs tens of ms). */
  #order: string[] | null = null;
  #pending = 0;
  #capture: ((geometry: MultiPolygonRings) => void) | null = null;
  #store: SiteStore;
  #options: PatchDeskOptions;
  #unsubscribe: () => void;
  #focusListeners = new Listeners<[string]>();
  #changeListeners = new Listeners<[]>();

  constructor(options: PatchDeskOptions) {
    this.#options = options;
    this.#store = options.store;
    if (options.interpreter) this.interpreter = options.interpreter;
    this.#take(this.#store.state);
    this.#unsubscribe = this.#store.subscribe((state) => this.#take(state));
  }

  // --- what the screens read ---

  get passId(): string | null {
    return this.blindPass?.id ?? openPassOf(this.state, this.interpreter)?.id ?? null;
  }

  /** The interpreter's open blind pass: while it runs the desk shows the blind view only. */
  get blindPass() {
    return openBlindPassOf(this.state, this.interpreter);
  }

  /** Puts another interpreter at the desk: what they may see is filtered anew (src/core/blind). */
  setInterpreter(name: string): void {
    this.interpreter = name;
    this.#take(this.#store.state);
  }

  get roster() {
    return this.state.roster;
  }

  get blindPasses(): Set<string> {
    return hiddenPasses(this.state, this.interpreter);
  }

  tagsOf(id: string): readonly Tag[] {
    return this.#tags.get(id) ?? [];
  }

  /** The tag the patch shows: yours in this pass, else the newest visible one. */
  shownTagOf(id: string): Tag | null {
    return shownTag(this.#tags.get(id), this.passId, this.blindPasses);
  }

  /** Your tag of the patch in your open pass. */
  ownTagOf(id: string): Tag | null {
    const passId = this.passId;
    return passId ? (this.tagsOf(id).find((t) => t.passId === passId) ?? null) : null;
  }

  measureOf(geometry: MultiPolygonRings): OutlineMeasure {
    return measureOutline(geometry, this.#options.grid());
  }

  measureSketch(geometry: MultiPolygonRings | null): void {
    this.sketch = geometry ? this.measureOf(geometry) : null;
  }

  get untaggedCount(): number {
    let n = 0;
    for (const id of this.#walked()) if (!this.ownTagOf(id)) n++;
    return n;
  }

  // --- listeners for the map adapter (plain callbacks: the map is not a component) ---

  onFocus(listener: (id: string) => void): () => void {
    return this.#focusListeners.add(listener);
  }

  onChange(listener: () => void): () => void {
    return this.#changeListeners.add(listener);
  }

  // --- user intent ---

  select(id: string | null, focus = false): void {
    this.selectedId = id && this.state.patches.has(id) ? id : null;
    this.#changed();
    if (focus && this.selectedId) this.#focusListeners.emit(this.selectedId);
  }

  useTool(tool: Tool): void {
    // A second look keeps the outlines it was sent; only a delineation draws its own.
    const blind = this.blindPass;
    if (blind && blind.patchIds?.length && tool !== 'select') {
      this.notice = 'Outlines stay as they were sent in a blind pass: call the species only.';
      return;
    }
    this.tool = this.tool === tool ? 'select' : tool;
    this.#capture = null; // a tool chosen by hand ends any request for an outline
    this.sketch = null;
    this.notice = null;
    this.#changed();
  }

  setSnap(on: boolean): void {
    this.snap = on;
    this.#changed();
  }

  /**
   * Takes the next outline drawn on the map for something other than a patch (the area of
   * a delineation): the draw tool is switched on, and the outline goes to `take`.
   */
  captureOutline(take: (geometry: MultiPolygonRings) => void, notice: string): void {
    this.#capture = take;
    this.tool = 'draw';
    this.notice = notice;
    this.#changed();
  }

  add(geometry: MultiPolygonRings): Promise<void> {
    const take = this.#capture;
    if (take) {
      this.#capture = null;
      this.tool = 'select';
      this.notice = null;
      this.#changed();
      take(geometry);
      return Promise.resolve();
    }
    return this.#save(async () => {
      const id = await addPatch(this.#store, geometry, this.#actor());
      this.select(id);
    });
  }

  editGeometry(id: string, geometry: MultiPolygonRings): Promise<void> {
    return this.#save(() => editPatchGeometry(this.#store, id, geometry, this.#actor()));
  }

  deleteSelected(): Promise<void> {
    const id = this.selectedId;
    if (!id) return Promise.resolve();
    if (this.blindPass?.patchIds?.length) return this.#say('Outlines stay as they were sent in a blind pass: call the species only.');
    this.selectedId = null;
    return this.#save(() => deletePatch(this.#store, id, this.#actor()));
  }

  split(line: [number, number][]): Promise<void> {
    const id = this.selectedId;
    if (!id) return this.#say('Select the patch to split first, then draw the line across it.');
    return this.#save(() => splitPatch(this.#store, id, line, this.#actor()));
  }

  mergeWith(otherId: string): Promise<void> {
    const id = this.selectedId;
    if (!id) return this.#say('Select the patch to keep first, then click the one to merge into it.');
    this.tool = 'select';
    return this.#save(() => mergePatches(this.#store, id, otherId, this.#actor()));
  }

  tag(change: TagChange): Promise<void> {
    const id = this.selectedId;
    if (!id) return this.#say('Select a patch first (click it, or U for the next untagged).');
    const context = { interpreter: this.interpreter, time: this.#now(), display: this.#options.display() };
    const blind = this.blindPass;
    if (blind && isPaused(blind)) return this.#say('The blind pass is paused: resume it to go on tagging.');
    if (blind) return this.#save(() => tagInBlindPass(this.#store, blind.id, id, change, context));
    return this.#save(() => tagPatch(this.#store, id, change, context));
  }

  setConfidence(confidence: Confidence): Promise<void> {
    return this.tag({ confidence });
  }

  setNote(note: string): Promise<void> {
    const id = this.selectedId;
    if (!id || (this.ownTagOf(id)?.note ?? '') === note) return Promise.resolve();
    return this.tag({ note });
  }

  /** Replaces the roster; refused whole with every problem listed (see rosterEdits.ts). */
  saveRoster(entries: RosterEntry[]): Promise<void> {
    return this.#save(() => setRoster(this.#store, entries, DESK_KEYS, this.#actor()));
  }

  /** Imports a read field file with the user's mapping; true once it is stored. */
  async importField(read: ReadFieldFile, choices: Omit<ImportChoices, 'interpreter' | 'time'>): Promise<boolean> {
    let done = false;
    await this.#save(async () => {
      const added = await commitFieldImport(this.#store, read, { ...choices, interpreter: this.interpreter, time: this.#now() });
      this.notice = `${read.picked.name}: ${added.patches} patches (${added.tags} tagged) and ${added.references} reference features imported.`;
      done = true;
    });
    return done;
  }

  undo(): Promise<void> {
    if (this.blindPass) return this.#say('Undo is off in a blind pass (it would reach changes you cannot see): press another key to change your call.');
    return this.#save(async () => {
      if (!(await this.#store.undo(this.interpreter, this.#now()))) this.notice = 'Nothing left to undo.';
    });
  }

  redo(): Promise<void> {
    if (this.blindPass) return this.#say('Redo is off in a blind pass: press another key to change your call.');
    return this.#save(async () => {
      if (!(await this.#store.redo(this.interpreter, this.#now()))) this.notice = 'Nothing to redo.';
    });
  }

  nextUntagged(): void {
    this.#goNext((id) => !this.ownTagOf(id), 'Every patch has a tag of yours in this pass.');
  }

  nextUnsure(): void {
    this.#goNext((id) => this.shownTagOf(id)?.confidence === 'unsure', 'No patch is tagged unsure.');
  }

  /** Selects the patch a typed id names; false when there is none. */
  jumpTo(typed: string): boolean {
    const id = findPatchId(this.state, typed);
    if (!id) {
      this.notice = `No patch has the id '${typed.trim()}'.`;
      return false;
    }
    this.notice = null;
    this.select(id, true);
    return true;
  }

  /**
   * The desk's patch keys (see patchKeys.ts and src/ui/shortcuts.ts). Ctrl/Cmd+Z and
   * Ctrl+Shift+Z / Ctrl+Y undo and redo; single keys only while not typing.
   */
  handleKey(event: KeyboardEvent, typing: boolean): boolean {
    const key = event.key.toLowerCase();
    if ((event.ctrlKey || event.metaKey) && !event.altKey) {
      // Inside a text field the field's own undo applies.
      if ((event.target as HTMLElement | null)?.closest?.('input, textarea, select, [contenteditable]')) return false;
      if (key === 'z' && !event.shiftKey) void this.undo();
      else if ((key === 'z' && event.shiftKey) || key === 'y') void this.redo();
      else return false;
      return true;
    }
    if (typing) return false;
    if (key === 'escape') {
      if (this.tool !== 'select') this.useTool('select');
      else this.select(null);
      return true;
    }
    if (key === 'delete' || key === 'backspace') {
      void this.deleteSelected();
      return true;
    }
    const entry = this.state.roster.find((e) => e.key && e.key.toLowerCase() === key);
    if (entry) {
      void this.tag({ species: entry.code });
      return true;
    }
    if (key in CONFIDENCE_KEYS) void this.setConfidence(CONFIDENCE_KEYS[key as keyof typeof CONFIDENCE_KEYS]);
    else if (key in TOOL_KEYS) this.useTool(TOOL_KEYS[key as keyof typeof TOOL_KEYS]);
    else if (key in ACTION_KEYS) {
      const action = ACTION_KEYS[key as keyof typeof ACTION_KEYS];
      if (action === 'next untagged') this.nextUntagged();
      else if (action === 'next unsure') this.nextUnsure();
      else if (action === 'note') {
        if (this.selectedId) this.noteRequests++;
      } else this.jumpRequests++;
    } else return false;
    return true;
  }

  dismissError(): void {
    this.error = null;
    if (this.#pending === 0) this.status = 'saved';
  }

  /** Every patch with the look the map gives it, for the map's layer. */
  features(): { id: string; geometry: MultiPolygonRings; species: string; unsure: boolean; selected: boolean; imported: boolean }[] {
    const passId = this.passId;
    const blind = hiddenPasses(this.state, this.interpreter);
    const out = [];
    for (const patch of this.state.patches.values()) {
      const tag = shownTag(this.#tags.get(patch.id), passId, blind);
      out.push({
        id: patch.id,
        geometry: patch.geometry,
        species: tag?.species ?? '',
        unsure: tag?.confidence === 'unsure',
        selected: patch.id === this.selectedId,
        imported: patch.source.kind === 'import',
      });
    }
    return out;
  }

  dispose(): void {
    this.#unsubscribe();
    this.#focusListeners.clear();
    this.#changeListeners.clear();
  }

  // --- inside ---

  #take(state: SiteState): void {
    // Every screen of the desk reads this filtered state: a blind pass hides everyone else's calls.
    this.state = blindView(state, this.interpreter);
    this.#tags = tagsByPatch(this.state);
    this.#order = null;
    if (this.selectedId && !this.state.patches.has(this.selectedId)) this.selectedId = null;
    this.#changed();
  }

  /** The patches "next" walks through, in any order. */
  #walked(): Iterable<string> {
    return this.blindPass?.patchIds?.length ? this.blindPass.patchIds : this.state.patches.keys();
  }

  #changed(): void {
    this.#changeListeners.emit();
  }

  #goNext(wanted: (id: string) => boolean, none: string): void {
    this.#order ??= this.blindPass?.patchIds?.length ? [...this.blindPass.patchIds] : patchOrder(this.state.patches.values());
    const id = nextMatching(this.#order, this.selectedId, wanted);
    if (id === null) {
      this.notice = none;
      return;
    }
    this.notice = null;
    this.select(id, true);
  }

  #say(text: string): Promise<void> {
    this.notice = text;
    return Promise.resolve();
  }

  #actor(): Actor {
    return { interpreter: this.interpreter, time: this.#now() };
  }

  #now(): string {
    return this.#options.now?.() ?? nowIso();
  }

  /** Runs one edit; "saving" until every edit in flight is durable, the error at once. */
  async #save(work: () => Promise<unknown>): Promise<void> {
    this.#pending++;
    this.status = 'saving';
    this.notice = null;
    try {
      await work();
    } catch (error) {
      this.error = (error as Error).message;
      this.status = 'failed';
      // Outlines the map moved ahead of the store go back to what is stored.
      this.#changed();
    } finally {
      this.#pending--;
      if (this.#pending === 0) this.status = this.error === null ? 'saved' : 'failed';
    }
  }
}
