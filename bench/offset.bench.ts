// offset.estimate: the field-to-imagery shift of 300 polygons (--size large: 1000) over
// a 3 m radius on the demo scene (seed 1, 4096 pixels), by the coarse-to-fine search,
// beside the brute-force baseline that scores every shift of the disc at the final
// lattice step.
import { crownOutline } from '../src/core/demo/crowns.ts';
import { demoRasterFiles } from '../src/core/demo/files.ts';
import { synthesizeDemo } from '../src/core/demo/synthesize.ts';
import { readLabelFile } from '../src/core/geojson/labelFile.ts';
import { extentOfRings } from '../src/core/geometry/measure.ts';
import type { MultiPolygonRings } from '../src/core/geometry/types.ts';
import { bruteForceShift } from '../src/core/offset/bruteForce.ts';
import { defaultSettings, estimateShift, templatesFor, type OffsetPatch } from '../src/core/offset/estimateShift.ts';
import { sceneSignal } from '../src/core/offset/sceneSignal.ts';
import { inspectTiff } from '../src/core/tiff/inspectTiff.ts';
import { result, seeded, time, type Benchmark, type BenchSize } from './harness.ts';


/** The demo's field polygons, topped up to 300 (or 1000) with outlines of further crowns walked the same way (crew shift plus GPS noise). */
async function setUp(size: BenchSize) {
  const sceneSize = 4096;
  const count = size === 'large' ? 1000 : 300;
  const scene = synthesizeDemo({ seed: 1, size: sceneSize, dates: ['early'] });
  const field = readLabelFile(JSON.stringify(scene.field), 'field.geojson', { targetEpsg: 32608 });
  const patches: OffsetPatch[] = field.patches.map((p) => ({ id: p.id, rings: p.rings }));
  const walked = new Set(scene.survey.polygons.map((p) => p.crownId));
  const random = seeded(9);
  const gauss = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
  const [sx, sy] = scene.survey.shift;
  for (const crown of scene.crowns) {
    if (patches.length >= count) break;
    if (walked.has(crown.id) || crown.radius < 1) continue;
    const ring = crownOutline(crown, 20).map(([x, y]) => [x + sx + 0.3 * gauss(), y + sy + 0.3 * gauss()] as [number, number]);
    ring[ring.length - 1] = [ring[0][0], ring[0][1]];
    patches.push({ id: `B${patches.length}`, rings: [[ring]] as MultiPolygonRings });
  }
  const ms = demoRasterFiles(scene, 'early').find((f) => f.name === 'ms.tif')!.bytes;
  const read = async (offset: number, length: number) => ms.subarray(offset, offset + length);
  const summary = await inspectTiff(read, ms.length, 'ms.tif');
  const settings = defaultSettings(0.3, summary.pixelSize[0]);
  const all = extentOfRings(patches.flatMap((p) => p.rings));
  const m = settings.radius + settings.ownReach + settings.ringWidth + 3;
  const grid = await sceneSignal({ read, summary }, 'ndvi', [all[0] - m, all[1] - m, all[2] + m, all[3] + m]);
  return { sceneSize, patches, grid, settings, truth: scene.truth.offset };
}

export const benchmarks: Benchmark[] = [
  {
    name: 'offset.estimate',
    async run(size) {
      const { sceneSize, patches, grid, settings, truth } = await setUp(size);
      let ours: [number, number] | null = null;
      let base: [number, number] | null = null;
      const templating = await time(() => templatesFor(patches, grid, settings));
      // Both sides build their sample templates inside the timing.
      const timed = await time(() => {
        const estimate = estimateShift(patches, grid, settings);
        ours = estimate.reliable ? [estimate.dx!, estimate.dy!] : null;
      });
      const fineStep = settings.coarseStep / settings.refine;
      const baseline = await time(() => {
        base = bruteForceShift(templatesFor(patches, grid, settings), grid, settings.radius, fineStep);
      }, { warmup: 0 });
      const error = (s: [number, number] | null) => (s ? Number(Math.hypot(s[0] - truth.dx, s[1] - truth.dy).toFixed(4)) : null);
      return [result('offset.estimate', patches.length, timed, 'every shift at the final step', baseline, {
        scene_px: sceneSize,
        radius_m: settings.radius,
        final_step_m: fineStep,
        templates_ms: Math.round(templating.median * 100) / 100,
        error_m: error(ours),
        baseline_error_m: error(base),
        bootstrap_replicates: settings.replicates,
      })];
    },
  },
];
