import { LabelFileError, readLabelFile } from '../../core/geojson/labelFile.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { applyScheme, schemeProblem, type Scheme } from '../../core/training/scheme.ts';
import { foldReport, type FoldSummary } from '../../core/training/foldReport.ts';
import { assignFolds, HELD_OUT, type FoldPatch } from '../../core/training/folds.ts';
import { applyFoldGap, GAP_LEFT_OUT } from '../../core/training/foldGap.ts';
import { InputError } from '../errors.ts';
import { openGeoTiffFile } from '../openGeoTiff.ts';
import { parseVerbArgs, type Verb } from '../verb.ts';
import { countScenePixels, gridOf, numberOption, readLabels, readText, ruleFromOptions } from './pixels.ts';

const usage = `fellfield folds PATCHES.geojson [--k 5] [--block 50] [--seed 1] [--held-out REGION.geojson]
                [--gap M [--gap-report]] [--scheme SCHEME.json] [--scene MS.tif [--rule R] [--buffer M] [--min-cover F]]
                [--epsg N] [--json]

Deals patches into k folds for cross-validation that does not flatter: a patch is
never split, and square blocks of --block metres go whole to one fold (a patch goes
with the block holding the centre of its bounding box), so neighbours never train and
test against each other. Blocks are dealt largest first to the fold whose class shares
they bring nearest the whole; --seed breaks ties, and the same seed gives the same folds.

  --k N               number of folds (default 5)
  --block M           block side in metres of the CRS (default 50); blocks are aligned to
                      multiples of M, so they stay put as patches are added
  --seed N            default 1
  --held-out FILE     a GeoJSON Polygon or MultiPolygon (or features of them): patches
                      whose centre lies inside are an independent test set, in no fold
  --gap M             patches nearer than M metres to a patch of another fold (patches
                      across a block edge can touch) are left out of every fold, so the
                      folds keep at least M apart; per fold it says how many
  --gap-report        keep them in their folds and only count them
  --scheme FILE       JSON {"name": "...", "classOf": {"SPECIES": "class", ...}}: folds
                      are stratified by class; a species the scheme leaves out is named
                      and its patches are left out (default: every species its own class)
  --scene MS.tif      stratify by pure pixels (rule options as for fellfield pixels)
                      instead of by patch counts
  --json              one JSON document: {"patches": [{"id", "species", "class", "fold",
                      "block"}], "folds": [{"fold", "patches", "blocks", "classCounts",
                      "classWeights", "classShares", "minTrainDistance", "nearestPair",
                      "withinGap"}], "heldOut", "classShares", "maxShareDeviation", "gap",
                      "messages"}; a patch left out by the gap has "fold": "gap"

Per fold it reports the class counts and the smallest distance between one of the
fold's patches and a patch of another fold (what the fold is tested against while the
others train), and the same for the held-out set against all folds.`;

/** A region file: a GeoJSON geometry, Feature or FeatureCollection of polygons. */
function readRegion(path: string, targetEpsg: number): MultiPolygonRings {
  let doc: Record<string, unknown>;
  try {
    doc = JSON.parse(readText(path));
  } catch (error) {
    if (error instanceof InputError) throw error;
    throw new InputError(`${path}: not valid JSON (${(error as Error).message})`);
  }
  const geometries: unknown[] = doc?.type === 'FeatureCollection' && Array.isArray(doc.features)
    ? doc.features.map((f: { geometry?: unknown }) => f?.geometry)
    : doc?.type === 'Feature' ? [doc.geometry] : [doc];
  // Through the label reader, so the region is read and projected just as patches are.
  const wrapped = {
    type: 'FeatureCollection',
    ...(doc?.crs ? { crs: doc.crs } : {}),
    features: geometries.map((geometry, i) => ({ type: 'Feature', id: i, properties: { species: 'region' }, geometry })),
  };
  try {
    const file = readLabelFile(JSON.stringify(wrapped), path, { targetEpsg });
    const parts = file.patches.flatMap((p) => p.rings);
    if (parts.length === 0) throw new InputError(`${path}: the held-out region has no polygon`);
    return parts;
  } catch (error) {
    if (error instanceof LabelFileError) throw new InputError(error.message.replace(/feature (\d+) \(id \d+\)/, 'polygon $1'));
    throw error;
  }
}

function readScheme(path: string): Scheme {
  let scheme: Scheme;
  try {
    scheme = JSON.parse(readText(path));
  } catch (error) {
    if (error instanceof InputError) throw error;
    throw new InputError(`${path}: not valid JSON (${(error as Error).message})`);
  }
  if (typeof scheme !== 'object' || scheme === null || typeof scheme.classOf !== 'object' || scheme.classOf === null) {
    throw new InputError(`${path}: expected {"name": "...", "classOf": {"SPECIES": "class", ...}}`);
  }
  const problem = schemeProblem(scheme);
  if (problem) throw new InputError(`${path}: ${problem}`);
  return scheme;
}

const metres = (d: number | null) => (d === null ? 'n/a' : `${d.toFixed(2)} m`);

function summaryLine(s: FoldSummary, gap: string | null): string {
  const counts = Object.entries(s.classCounts).map(([c, n]) => `${c} ${n}`).join(', ');
  const name = s.fold === 'held-out' ? 'held-out' : `fold ${s.fold + 1}`;
  const within = gap ? `; ${s.withinGap} within the gap (${gap})` : '';
  return `${name.padEnd(9)} ${String(s.patches).padStart(6)} patch(es) in ${String(s.blocks).padStart(4)} block(s); nearest training patch ${metres(s.minTrainDistance)}${within}; ${counts}`;
}

export const folds: Verb = {
  name: 'folds',
  summary: 'deal patches into spatially blocked, stratified cross-validation folds',
  usage,
  async run(args, out) {
    const { values, positionals } = parseVerbArgs('folds', args, {
      k: { type: 'string' },
      block: { type: 'string' },
      seed: { type: 'string' },
      'held-out': { type: 'string' },
      gap: { type: 'string' },
      'gap-report': { type: 'boolean' },
      scheme: { type: 'string' },
      scene: { type: 'string' },
      rule: { type: 'string' },
      buffer: { type: 'string' },
      'min-cover': { type: 'string' },
      epsg: { type: 'string' },
      json: { type: 'boolean' },
    });
    if (positionals.length !== 1) throw new InputError(`expected one PATCHES.geojson, got ${positionals.length} file(s); see --help`);
    const [file] = positionals;
    const k = numberOption('k', values.k, (n) => Number.isInteger(n) && n >= 2, 'a whole number of 2 or more') ?? 5;
    const blockSize = numberOption('block', values.block, (n) => n > 0, 'a block side in metres (above 0)') ?? 50;
    const seed = numberOption('seed', values.seed, (n) => Number.isInteger(n) && n >= 0, 'a whole number (0 or more)') ?? 1;
    const gapM = numberOption('gap', values.gap, (n) => n >= 0, 'a distance in metres (0 or more)') ?? 0;
    if (values['gap-report'] && values.gap === undefined) throw new InputError('--gap-report needs --gap M');
    const assumeEpsg = numberOption('epsg', values.epsg, (n) => Number.isInteger(n) && n > 0, 'an EPSG code');
    const pixelRuleGiven = values.rule !== undefined || values.buffer !== undefined || values['min-cover'] !== undefined;
    if (pixelRuleGiven && values.scene === undefined) throw new InputError('--rule, --buffer and --min-cover need --scene MS.tif');
    const scheme = values.scheme !== undefined ? readScheme(values.scheme) : null;

    let weights: number[] | null = null;
    let labels;
    const messages: string[] = [];
    if (values.scene !== undefined) {
      const rule = ruleFromOptions(values);
      const scene = await openGeoTiffFile(values.scene);
      try {
        labels = readLabels(file, gridOf(scene).epsg, assumeEpsg);
        const report = await countScenePixels(labels, scene, rule);
        weights = report.patches.map((p) => p.pure);
        messages.push(...report.messages);
      } finally {
        await scene.close();
      }
    } else {
      labels = readLabels(file, undefined, assumeEpsg);
    }
    const heldOut = values['held-out'] !== undefined ? readRegion(values['held-out'], labels.epsg) : null;

    const species = labels.patches.map((p) => p.species);
    const applied = scheme ? applyScheme(scheme, species) : { classes: species, unmapped: [], messages: [] };
    messages.push(...applied.messages);
    const kept = labels.patches.map((p, i) => ({ p, i })).filter(({ i }) => applied.classes[i] !== null);
    const patches: FoldPatch[] = kept.map(({ p, i }) => ({ id: p.id, cls: applied.classes[i]!, rings: p.rings, weight: weights ? weights[i] : 1 }));
    const dealt = assignFolds(patches, { k, blockSize, seed, heldOut });
    const { assignment, gap } = gapM > 0 ? applyFoldGap(patches, dealt, gapM, values['gap-report'] ? 'report' : 'leave-out') : { assignment: dealt, gap: null };
    messages.push(...assignment.messages);
    const report = foldReport(patches, assignment, gap);
    const gapText = gap ? `${gap.action === 'report' ? 'reported' : 'left out'}, ${gapM} m` : null;

    const foldOf = new Map<number, number>(kept.map(({ i }, j) => [i, assignment.fold[j]]));
    const blockOf = new Map<number, number>(kept.map(({ i }, j) => [i, assignment.block[j]]));
    const patchRows = labels.patches.map((p, i) => {
      const f = foldOf.get(i);
      const b = blockOf.get(i);
      const block = b !== undefined && b >= 0 ? [assignment.blocks[b].col, assignment.blocks[b].row] : null;
      return {
        id: p.id, species: p.species, class: applied.classes[i],
        fold: f === GAP_LEFT_OUT ? 'gap' : f === undefined || f < HELD_OUT ? null : f === HELD_OUT ? 'held-out' : f + 1,
        block,
      };
    });
    if (values.json) {
      out.stdout(JSON.stringify({
        file, crs: `EPSG:${labels.epsg}`, k, blockSize, seed,
        scheme: scheme?.name ?? null,
        weight: weights ? 'pure pixels' : 'patches',
        patches: patchRows,
        folds: report.folds.map((f) => ({ ...f, fold: (f.fold as number) + 1 })),
        heldOut: report.heldOut,
        classShares: report.classShares,
        maxShareDeviation: report.maxShareDeviation,
        gap: report.gap,
        messages,
      }));
    } else {
      const lines = [
        `${file}: ${patches.length} patch(es) into ${k} folds of ${blockSize} m blocks (seed ${seed}), stratified by ${weights ? 'pure pixels' : 'patches'}${scheme ? ` under scheme "${scheme.name}"` : ''}`,
        `largest gap between a fold's class share and the whole: ${(report.maxShareDeviation * 100).toFixed(1)} percentage points`,
        '',
        ...report.folds.map((f) => summaryLine(f, gapText)),
        ...(report.heldOut ? [summaryLine(report.heldOut, gapText)] : []),
      ];
      if (messages.length) lines.push('', 'notes', ...messages.map((m) => `  ${m}`));
      out.stdout(lines.join('\n'));
    }
    return 0;
  },
};
