// The page of the checks.ui benchmark: a whole-site check of a seeded site, run in the
// checks worker (as the desk runs it) or in this page's thread (the chunked check the
// desk ran before), while the UI thread's long tasks are recorded and key presses are
// answered (each answer notes how long the press waited).
import { WorkerCheckRunner } from '../../src/app/findings/checkRunner.ts';
import { InlineCheckRunner } from '../../src/app/findings/inlineCheckRunner.ts';
import { FindingsTracker, type TrackedPatch } from '../../src/app/findings/FindingsTracker.ts';
import { sceneFor, seededSite } from './site.ts';

const waits: number[] = [];
let checking = false;
let answeredWhileChecking = 0;
addEventListener('keydown', (event) => {
  waits.push(performance.now() - event.timeStamp);
  if (checking) answeredWhileChecking++;
  document.getElementById('keys')!.textContent = String(waits.length);
});

const noBytes = () => Promise.reject(new Error('the bench scene has no raster files'));

async function run(where: 'worker' | 'page', n: number) {
  const patches: TrackedPatch[] = seededSite(n).map((p) => ({ id: String(p.id), species: p.species, geometry: p.rings }));
  const tracker = new FindingsTracker(where === 'worker' ? new WorkerCheckRunner(noBytes) : new InlineCheckRunner(noBytes), sceneFor(n));
  const tasks: number[] = [];
  const observer = new PerformanceObserver((list) => {
    for (const entry of list.getEntries()) tasks.push(entry.duration);
  });
  observer.observe({ type: 'longtask' });
  waits.length = 0;
  answeredWhileChecking = 0;
  checking = true;
  const start = performance.now();
  await tracker.load(patches);
  const ms = performance.now() - start;
  checking = false;
  // One edit after the load: move a patch half a metre and re-check it.
  const moved = patches.map((p, i) => (i === Math.floor(n / 2) ? { ...p, geometry: p.geometry.map((part) => part.map((ring) => ring.map(([x, y]) => [x + 0.5, y] as [number, number]))) } : p));
  const editStart = performance.now();
  await tracker.sync(moved);
  const editMs = performance.now() - editStart;
  await new Promise((resolve) => setTimeout(resolve, 100)); // let the observer deliver
  observer.disconnect();
  tracker.dispose();
  return {
    ms, editMs, findings: tracker.findings().length, longTasks: tasks.length, longestTask: Math.max(0, ...tasks),
    keyPresses: waits.length, answeredWhileChecking, longestKeyWait: Math.max(0, ...waits),
  };
}

(window as unknown as { checksBench: unknown }).checksBench = { run, isChecking: () => checking };
