// The species spectra's bootstrap, away from the UI thread (see speciesSpectra.ts).
import { serveJobs } from '../jobs/jobWorker.ts';
import { spectrumOfJob } from './speciesSpectra.ts';

serveJobs(spectrumOfJob);
