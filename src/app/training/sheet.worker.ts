// The training sheet's figures away from the UI thread (see trainingSheet.ts).
import { serveJobs } from '../jobs/jobWorker.ts';
import { sheetSummary } from './trainingSheet.ts';

serveJobs(sheetSummary);
