import type { CheckDelta } from '../../core/checks/CheckSession.ts';
import type { Finding } from '../../core/checks/findings.ts';
import { CheckHost, type CheckProgress, type CheckScene, type TrackedPatch } from './checkHost.ts';
import type { CheckRunner, PageBytes } from './checkRunner.ts';

/** Runs in the calling thread (tests, scripts). */
export class InlineCheckRunner implements CheckRunner {
  readonly #host: CheckHost;

  constructor(bytes: PageBytes) {
    this.#host = new CheckHost(bytes);
  }

  load(patches: TrackedPatch[], scene: CheckScene, onProgress: (p: CheckProgress) => void, signal?: AbortSignal): Promise<Finding[]> {
    return this.#host.load(patches, scene, onProgress, signal);
  }

  apply(upserts: TrackedPatch[], removals: string[]): Promise<CheckDelta> {
    return this.#host.apply(upserts, removals);
  }

  dispose(): void {}
}
