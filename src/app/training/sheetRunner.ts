import { JobWorker } from '../jobs/jobWorker.ts';
import type { SheetJob, SheetSummary } from './trainingSheet.ts';

// The training sheet's worker, made where the worker's own code never imports it.

export function sheetInWorker(): JobWorker<SheetJob, SheetSummary> {
  return new JobWorker(
    () => new Worker(new URL('./sheet.worker.ts', import.meta.url), { type: 'module', name: 'fellfield-training-sheet' }),
    'working out the training sheet',
  );
}
