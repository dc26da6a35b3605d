import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { demoRasterFiles } from '../../../src/core/demo/files.ts';
import { synthesizeDemo } from '../../../src/core/demo/synthesize.ts';
import type { Truth } from '../../../src/core/demo/truth.ts';

// A generated demo site on disk for the offset checks: the early date's pan.tif and
// ms.tif, field.geojson and truth.json, in a fresh temporary folder.

export interface DemoSite {
  dir: string;
  pan: string;
  ms: string;
  field: string;
  truth: Truth;
  /** Truth crown of each field polygon id. */
  crownOf: Map<string, Truth['crowns'][number]>;
}

export function writeDemoScene(options: { seed: number; size: number; fieldShift?: [number, number] }): DemoSite {
  const scene = synthesizeDemo({ ...options, dates: ['early'] });
  const dir = mkdtempSync(join(tmpdir(), `fellfield-offset-${options.seed}-`));
  for (const file of demoRasterFiles(scene, 'early', () => {})) writeFileSync(join(dir, file.name), file.bytes);
  writeFileSync(join(dir, 'field.geojson'), JSON.stringify(scene.field));
  writeFileSync(join(dir, 'truth.json'), JSON.stringify(scene.truth));
  const byId = new Map(scene.truth.crowns.map((c) => [c.id, c]));
  const crownOf = new Map(scene.truth.field.map((f) => [f.id, byId.get(f.crownId)!]));
  return { dir, pan: join(dir, 'pan.tif'), ms: join(dir, 'ms.tif'), field: join(dir, 'field.geojson'), truth: scene.truth, crownOf };
}
