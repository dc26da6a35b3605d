import type { OpenSite } from '../../app/site.ts';
import type { ImageryMode } from '../map/imageryMode.ts';

/** How the imagery is shown on the desk: which date, which view. Shared by the map and the panels. */
export class ImageryView {
  sceneIndex = $state(0);
  chosenMode = $state<ImageryMode>('natural');
  readonly #site: OpenSite;

  constructor(site: OpenSite) {
    this.#site = site;
  }

  get scene() {
    return this.#site.scenes[this.sceneIndex];
  }

  /** The chosen view where the scene has it, else the one it does have. */
  get mode(): ImageryMode {
    if (this.chosenMode === 'natural') return this.scene.ms ? 'natural' : 'pan';
    return this.scene.pan ? 'pan' : 'natural';
  }

  choose(mode: ImageryMode): void {
    if (mode === 'pan' ? this.scene.pan : this.scene.ms) this.chosenMode = mode;
  }

  nextDate(): void {
    this.sceneIndex = (this.sceneIndex + 1) % this.#site.scenes.length;
  }

  /** Single-key shortcuts of the imagery; true when the key was one of them. */
  handleKey(key: string): boolean {
    if (key === 'p') this.choose('pan');
    else if (key === 'n') this.choose('natural');
    else if (key === 'd') this.nextDate();
    else return false;
    return true;
  }
}
