import { WorkerPool } from './WorkerPool.ts';
import type { RenderRequest, RenderResult } from './render.worker.ts';

/** The app's one render pool: a worker per core but one, at least two, at most four. */
export function createRenderPool(size = Math.min(4, Math.max(2, (navigator.hardwareConcurrency || 2) - 1))) {
  return new WorkerPool<RenderRequest, RenderResult>(
    () => new Worker(new URL('./render.worker.ts', import.meta.url), { type: 'module', name: 'fellfield-render' }),
    size,
  );
}
