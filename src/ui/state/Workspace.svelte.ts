import type { OpenSite } from '../../app/openDemoSite.ts';

export type Screen = 'start' | 'desk';

export interface Progress {
  label: string;
  /** 0..1, or null while the amount of work is not known yet. */
  fraction: number | null;
}

/** What the window shows and the site in hand. Components read it and call its methods. */
export class Workspace {
  screen = $state<Screen>('start');
  site = $state.raw<OpenSite | null>(null);
  progress = $state<Progress | null>(null);
  error = $state<string | null>(null);

  #opener: (onProgress: (p: Progress) => void, signal: AbortSignal) => Promise<OpenSite>;
  #abort: AbortController | null = null;

  constructor(opener: (onProgress: (p: Progress) => void, signal: AbortSignal) => Promise<OpenSite>) {
    this.#opener = opener;
  }

  async openDemo(): Promise<void> {
    this.cancel();
    const abort = new AbortController();
    this.#abort = abort;
    this.error = null;
    this.progress = { label: 'Opening the demo site', fraction: null };
    try {
      const site = await this.#opener((p) => (this.progress = p), abort.signal);
      if (abort.signal.aborted) {
        site.dispose();
        return;
      }
      this.site?.dispose();
      this.site = site;
      this.screen = 'desk';
    } catch (error) {
      if (!abort.signal.aborted) this.error = (error as Error).message;
    } finally {
      if (this.#abort === abort) {
        this.#abort = null;
        this.progress = null;
      }
    }
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
