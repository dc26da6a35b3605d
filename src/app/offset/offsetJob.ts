import { estimateByArea, estimateFromTemplates, type AreaShifts, type OffsetEstimate, type OffsetPatch, type OffsetSettings, type SignalGrid } from '../../core/offset/index.ts';
import { patchTemplate, type PatchTemplate } from '../../core/offset/patchTemplate.ts';
import { hashUnit } from '../../core/random.ts';

// The search itself, as one job: what the offset worker runs, and what tests run in
// their own thread. Templates are built in chunks so progress can be told between them.

export interface OffsetJob {
  patches: OffsetPatch[];
  grid: SignalGrid;
  settings: OffsetSettings;
  /** Also a shift per cell of an N x N grid over the polygons (0 or absent: none). */
  areasAcross?: number;
}

export interface OffsetJobResult {
  estimate: OffsetEstimate;
  /** null unless asked for */
  areas: AreaShifts | null;
}

export interface OffsetProgress {
  stage: 'templates' | 'search' | 'areas';
  done: number;
  total: number;
}

const CHUNK = 50;

export function runOffsetJob(job: OffsetJob, onProgress: (p: OffsetProgress) => void = () => {}): OffsetJobResult {
  const { patches, grid, settings } = job;
  if (patches.length < 2) throw new RangeError(`needs at least two polygons to tell a common shift from their own errors, got ${patches.length}`);
  const templates: PatchTemplate[] = [];
  for (let i = 0; i < patches.length; i++) {
    // The same phase per position as templatesFor, so the app and the command line agree to the bit.
    const p = patches[i];
    templates.push(patchTemplate(p.id, p.rings, grid, settings, [hashUnit(settings.seed, i, 0, 1), hashUnit(settings.seed, i, 0, 2)]));
    if ((i + 1) % CHUNK === 0 || i === patches.length - 1) onProgress({ stage: 'templates', done: i + 1, total: patches.length });
  }
  onProgress({ stage: 'search', done: 0, total: 1 });
  const estimate = estimateFromTemplates(templates, grid, settings);
  onProgress({ stage: 'search', done: 1, total: 1 });
  let areas: AreaShifts | null = null;
  if (job.areasAcross) {
    onProgress({ stage: 'areas', done: 0, total: 1 });
    areas = estimateByArea(patches, grid, settings, estimate, job.areasAcross);
    onProgress({ stage: 'areas', done: 1, total: 1 });
  }
  return { estimate, areas };
}
