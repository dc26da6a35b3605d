// Starts a TypeScript worker thread: registers tsx's loader, then imports the module
// named in workerData.
import { workerData } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
await import(workerData.module);
