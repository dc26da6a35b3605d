import { composeTile, cutTiles, decodeBlocks, readWindow, reduceTile, sampleWindow } from './composeTile.ts';
import type { JobRunner, RenderRequest, RenderResult } from './renderJobs.ts';

/**
 * Runs render jobs in the calling thread, with the worker's own code: for tests,
 * benchmarks and the command line, where no UI thread needs keeping free.
 */
export class InlinePool implements JobRunner {
  async run(request: { payload: RenderRequest; signal?: AbortSignal }): Promise<RenderResult> {
    if (request.signal?.aborted) throw new DOMException('the work was cancelled', 'AbortError');
    const job = request.payload;
    await decodeBlocks(job);
    if (job.kind === 'sample') return sampleWindow(job);
    if (job.kind === 'window') return readWindow(job);
    if (job.kind === 'cut') return cutTiles(job);
    if (job.kind === 'reduce') return reduceTile(job);
    return composeTile(job);
  }
}
