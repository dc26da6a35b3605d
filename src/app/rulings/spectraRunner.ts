import type { PooledSpectrum } from '../../core/rulings/speciesSpectrum.ts';
import { JobWorker } from '../jobs/jobWorker.ts';
import type { SpectrumJob } from './speciesSpectra.ts';

// The species spectra's worker, made where the worker's own code never imports it; the
// pooled pixels are handed over, not copied.

export function spectraInWorker(): JobWorker<SpectrumJob, PooledSpectrum> {
  return new JobWorker(
    () => new Worker(new URL('./spectrum.worker.ts', import.meta.url), { type: 'module', name: 'fellfield-spectra' }),
    'working out the species spectra',
    (job) => [job.pooled.values.buffer, job.pooled.starts.buffer],
  );
}
