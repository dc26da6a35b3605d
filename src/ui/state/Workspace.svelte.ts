import type { OpenSite } from '../../app/site.ts';
import { PixelSpaceOffer } from '../../app/openImageryFiles.ts';
import type { Surface } from '../surfaces.ts';

export type Screen = 'start' | 'desk';

/** Opens a site, or resolves to null when the user backs out. */
export type Opener = (onProgress: (p: Progress) => void, signal: AbortSignal) => Promise<OpenSite | null>;

export interface SiteOpeners {
  demo: Opener;
  files: Opener;
}

export interface Progress {
  label: string;
  /** 0..1, or null while the amount of work is not known yet. */
  fraction: number | null;
}

/** A patch sent from another page to the desk (to split or reshape it), and the page to go back to. */
export interface DeskErrand {
  patchId: string;
  from: Surface;
}

/** What the window shows and the site in hand. Components read it and call its methods. */
export class Workspace {
  screen = $state<Screen>('start');
  /** Which page of the open site is shown. */
  surface = $state<Surface>('desk');
  /** The patch another page sent to the desk, while the desk works on it. */
  errand = $state.raw<DeskErrand | null>(null);
  site = $state.raw<OpenSite | null>(null);
  progress = $state<Progress | null>(null);
  error = $state<string | null>(null);
  /** Picked files whose CRS cannot be placed on a map: why, and how to open them in pixel space instead. */
  offer = $state.raw<{ message: string; open: Opener } | null>(null);

  #openers: SiteOpeners;
  #adopt: (site: OpenSite) => Promise<OpenSite>;
  #abort: AbortController | null = null;

  /** `adopt` takes every site once opened, e.g. to keep its copy on disk (default: as it is). */
  constructor(openers: SiteOpeners, options: { adopt?: (site: OpenSite) => Promise<OpenSite> } = {}) {
    this.#openers = openers;
    this.#adopt = options.adopt ?? (async (site) => site);
  }

  openDemo(): Promise<void> {
    return this.openWith('Opening the demo site', (onProgress, signal) => this.#openers.demo(onProgress, signal));
  }

  /** Asks for one or two GeoTIFFs and opens them as a scene. */
  openFiles(): Promise<void> {
    return this.openWith('Opening the picked files', (onProgress, signal) => this.#openers.files(onProgress, signal));
  }

  /** Opens the offered files in pixel space (view-only). */
  acceptOffer(): Promise<void> {
    const offer = this.offer;
    this.offer = null;
    return offer ? this.openWith('Opening the files in pixel space', offer.open) : Promise.resolve();
  }

  declineOffer(): void {
    this.offer = null;
  }

  /** Opens a site by any opener (a new site, a stored one, a blind package), with progress and cancel. */
  async openWith(label: string, opener: Opener): Promise<void> {
    const opened = await this.run(label, opener);
    if (opened === null) return; // cancelled, refused (see error) or backed out of
    performance.mark('fellfield:site-open');
    const site = await this.#adopt(opened);
    performance.mark('fellfield:site-adopted');
    this.site?.dispose();
    this.site = site;
    this.screen = 'desk';
    this.surface = 'desk';
    this.errand = null;
  }

  /**
   * Runs long work with the progress bar and its Cancel. Resolves to null when cancelled
   * or refused (the refusal is in `error`); a result that comes after a cancel is let go.
   */
  async run<T extends object>(label: string, work: (onProgress: (p: Progress) => void, signal: AbortSignal) => Promise<T | null>): Promise<T | null> {
    this.cancel();
    const abort = new AbortController();
    this.#abort = abort;
    this.error = null;
    this.offer = null;
    this.progress = { label, fraction: null };
    try {
      const result = await work((p) => (this.progress = p), abort.signal);
      if (result !== null && abort.signal.aborted) {
        (result as { dispose?(): void }).dispose?.();
        return null;
      }
      return result;
    } catch (error) {
      if (abort.signal.aborted) return null;
      if (error instanceof PixelSpaceOffer) this.offer = { message: error.message, open: (onProgress, signal) => error.open({ onProgress, signal }) };
      else this.error = (error as Error).message;
      return null;
    } finally {
      if (this.#abort === abort) {
        this.#abort = null;
        this.progress = null;
      }
    }
  }

  /** Shows a page of the open site; leaving the desk ends an errand there. */
  show(surface: Surface): void {
    this.surface = surface;
    if (surface !== 'desk') this.errand = null;
  }

  /** Opens the desk with a patch in hand, to come back to `from` afterwards. */
  sendToDesk(patchId: string, from: Surface): void {
    this.errand = { patchId, from };
    this.surface = 'desk';
  }

  /** Back to the page that sent the errand. */
  endErrand(): void {
    const errand = this.errand;
    if (errand) this.show(errand.from);
  }

  cancel(): void {
    this.#abort?.abort();
    this.#abort = null;
    this.progress = null;
  }

  goStart(): void {
    this.screen = 'start';
  }

  dispose(): void {
    this.cancel();
    this.site?.dispose();
    this.site = null;
  }
}
