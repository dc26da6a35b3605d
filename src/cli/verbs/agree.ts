import { readFileSync } from 'node:fs';
import { basename } from 'node:path';
import type { GroupAgreement } from '../../core/agreement/breakdown.ts';
import { delineationFigures, type DelineationFigures } from '../../core/agreement/delineation.ts';
import { cohenKappa } from '../../core/agreement/cohenKappa.ts';
import { confusionMatrix, seenClasses } from '../../core/agreement/confusionMatrix.ts';
import { explainDelineation, explainFleiss } from '../../core/agreement/explanations.ts';
import type { Figure } from '../../core/agreement/figure.ts';
import { fleissKappa, ratingTable } from '../../core/agreement/fleissKappa.ts';
import { matchByIou } from '../../core/agreement/iouMatch.ts';
import type { PairedCall } from '../../core/agreement/pairedCall.ts';
import { alignById, collidingIds, pairById, type CallOnPatch, type IdMismatch } from '../../core/agreement/pairById.ts';
import { pabak } from '../../core/agreement/pabak.ts';
import { agreementSheet, type AgreementSheet } from '../../core/agreement/sheet.ts';
import { LabelFileError, readLabelFile, type LabelFile, type LabelledPatch } from '../../core/geojson/labelFile.ts';
import { InputError } from '../errors.ts';
import { parseVerbArgs, type Verb } from '../verb.ts';

const usage = `fellfield agree A.geojson B.geojson [--by id | --match iou [--min-iou 0.5]] [--json]
fellfield agree A.geojson B.geojson C.geojson ... [--json]

Measures how well two interpreters agree on the species of the same patches.
A's calls are the rows of the confusion matrix, B's the columns. With three or
more files (paired by id), Fleiss' kappa over all of them and Cohen's kappa for
every pair of files.

  --by id          pair features by their GeoJSON id (default); every id must be in both files
  --match iou      pair outlines one-to-one by IoU (two independent delineations)
  --min-iou X      smallest IoU a matched pair may have, in (0, 1] (default 0.5)
  --json           print one JSON document instead of text

Species come from each feature's "species" property; the breakdowns use A's
"confidence" and "group" properties when present.`;

function readLabels(path: string, options: { targetEpsg?: number } = {}): LabelFile {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(`${path}: cannot read the file (${code === 'ENOENT' ? 'no such file' : code ?? 'unknown error'})`);
  }
  try {
    return readLabelFile(text, path, options);
  } catch (error) {
    if (error instanceof LabelFileError) throw new InputError(error.message);
    throw error;
  }
}

function callOf(patch: LabelledPatch): CallOnPatch {
  const call: CallOnPatch = { id: patch.id, species: patch.species };
  const { confidence, group } = patch.properties;
  if (typeof confidence === 'string') call.confidence = confidence;
  if (typeof group === 'string') call.group = group;
  return call;
}

const sample = (ids: string[]) =>
  ids.length === 0 ? '' : ` (e.g. ${ids.slice(0, 3).map((id) => JSON.stringify(id)).join(', ')}${ids.length > 3 ? ', …' : ''})`;

/** Refuses a file with no features or with ids that pairing could not tell apart. */
function checkIds(path: string, file: LabelFile) {
  const twice = collidingIds(file.patches.map(callOf));
  if (twice.length) throw new InputError(`${path}: ids ${twice.map((id) => JSON.stringify(id)).join(', ')} occur both as numbers and as text`);
  if (file.patches.length === 0) throw new InputError(`${path}: the FeatureCollection has no features`);
}

function mismatchError(pathA: string, pathB: string, m: IdMismatch): InputError {
  if (m.shared === 0) {
    return new InputError(`${pathA} and ${pathB} share no feature id: nothing to compare (${m.onlyFirst.length} ids in ${pathA}, ${m.onlySecond.length} in ${pathB})`);
  }
  return new InputError(
    `${pathA} and ${pathB} have mismatched ids: ${m.onlyFirst.length} only in ${pathA}${sample(m.onlyFirst)}, ` +
      `${m.onlySecond.length} only in ${pathB}${sample(m.onlySecond)}; ${m.shared} shared`,
  );
}

/** Pairs the two files' features by id, refusing any mismatch with counts on each side. */
function pairFilesById(pathA: string, a: LabelFile, pathB: string, b: LabelFile): PairedCall[] {
  checkIds(pathA, a);
  checkIds(pathB, b);
  const result = pairById(a.patches.map(callOf), b.patches.map(callOf));
  if (result.ok) return result.pairs;
  throw mismatchError(pathA, pathB, result.mismatch);
}

/** Three or more files: Fleiss' kappa over all, Cohen's kappa for each pair of files. */
function severalFiles(paths: string[], asJson: boolean): string {
  const files = paths.map((path) => readLabels(path));
  files.forEach((file, r) => checkIds(paths[r], file));
  const result = alignById(files.map((f) => f.patches.map(callOf)));
  if (!result.ok) {
    const r = result.mismatches.findIndex((m) => m.onlyFirst.length || m.onlySecond.length || m.shared === 0);
    throw mismatchError(paths[0], paths[r + 1], result.mismatches[r]);
  }
  const { calls } = result.aligned;
  const classes = seenClasses(calls.flat(), []);
  const { table } = ratingTable(calls, classes);
  const fleiss = fleissKappa(classes, table);
  const pairwise = [];
  for (let r = 0; r < paths.length; r++) {
    for (let s = r + 1; s < paths.length; s++) {
      const m = confusionMatrix(calls.map((c) => c[r]), calls.map((c) => c[s]), classes);
      pairwise.push({ first: paths[r], second: paths[s], figures: cohenKappa(m), pabak: pabak(m) });
    }
  }
  if (asJson) {
    return JSON.stringify({
      files: paths,
      paired_by: 'id',
      n: fleiss.subjects,
      raters: fleiss.raters,
      classes,
      fleiss_kappa: fleiss.kappa.value,
      fleiss_observed: fleiss.observed.value,
      fleiss_expected: fleiss.expected.value,
      fleiss_se_null: fleiss.standardErrorNull.value,
      ...(fleiss.kappa.reason ? { reason: fleiss.kappa.reason } : {}),
      category_shares: fleiss.categoryShares,
      explanation: explainFleiss(fleiss),
      pairwise: pairwise.map((p) => ({
        first: p.first,
        second: p.second,
        observed: p.figures.observed.value,
        kappa: p.figures.kappa.value,
        kappa_se: p.figures.standardError.value,
        kappa_ci95: p.figures.ci95.value,
        pabak: p.pabak.value,
        ...(p.figures.kappa.reason ? { reason: p.figures.kappa.reason } : {}),
      })),
    }, null, 2);
  }
  const width = Math.max(...pairwise.map((p) => `${basename(p.first)} × ${basename(p.second)}`.length));
  return [
    `Agreement of ${paths.length} label files, paired by id: ${fleiss.subjects} ${fleiss.subjects === 1 ? 'patch' : 'patches'}`,
    '',
    `Fleiss' kappa       ${num(fleiss.kappa).padStart(16)}  ${explainFleiss(fleiss)}`,
    `Observed agreement  ${num(fleiss.observed).padStart(16)}  Share of agreeing pairs of interpreters, averaged over the patches.`,
    `Chance agreement    ${num(fleiss.expected).padStart(16)}  Agreement expected from the pooled class shares alone.`,
    '',
    "Cohen's kappa for each pair of files",
    ...pairwise.map((p) =>
      `  ${`${basename(p.first)} × ${basename(p.second)}`.padEnd(width)}  kappa ${num(p.figures.kappa)}  observed ${num(p.figures.observed)}  PABAK ${num(p.pabak)}`),
  ].join('\n');
}

/** Pairs the outlines of two delineations by IoU; the pairs carry both files' species. */
function pairFilesByIou(a: LabelFile, b: LabelFile, minIou: number) {
  const matching = matchByIou(
    a.patches.map((p) => ({ id: String(p.id), rings: p.rings })),
    b.patches.map((p) => ({ id: String(p.id), rings: p.rings })),
    { minIou },
  );
  const pairs: PairedCall[] = matching.pairs.map((m) => {
    const call = callOf(a.patches[m.first]);
    const pair: PairedCall = { id: `${a.patches[m.first].id}~${b.patches[m.second].id}`, first: call.species, second: b.patches[m.second].species };
    if (call.confidence !== undefined) pair.confidence = call.confidence;
    if (call.group !== undefined) pair.group = call.group;
    return pair;
  });
  const figures = delineationFigures(matching, a.patches.map((p) => p.species), b.patches.map((p) => p.species));
  const matched = matching.pairs.map((m) => ({ a: a.patches[m.first].id, b: b.patches[m.second].id, iou: m.iou }));
  return { pairs, figures, matched };
}

function parseMinIou(text: string | undefined): number {
  if (text === undefined) return 0.5;
  const value = Number(text);
  if (!(value > 0 && value <= 1)) throw new InputError(`agree: --min-iou takes a number in (0, 1], got '${text}'`);
  return value;
}

// JSON output: snake_case, undefined figures as null with their reason.

function collectReasons(figures: Record<string, Figure<unknown>>): Record<string, string> {
  const reasons: Record<string, string> = {};
  for (const [name, figure] of Object.entries(figures)) if (figure.reason !== null) reasons[name] = figure.reason;
  return reasons;
}

function groupJson(groups: GroupAgreement[]) {
  return groups.map((g) => ({
    key: g.key,
    n: g.n,
    observed: g.figures.observed.value,
    kappa: g.figures.kappa.value,
    kappa_se: g.figures.standardError.value,
    ...(g.figures.kappa.reason ? { reason: g.figures.kappa.reason } : {}),
  }));
}

function delineationJson(d: DelineationFigures, matched: { a: string | number; b: string | number; iou: number }[]) {
  const reasons = collectReasons({ mean_iou: d.meanIou, area_weighted_agreement: d.areaWeightedAgreement });
  return {
    min_iou: d.minIou,
    first_count: d.firstCount,
    second_count: d.secondCount,
    matched: d.matched,
    unmatched_first: d.unmatchedFirst,
    unmatched_second: d.unmatchedSecond,
    mean_iou: d.meanIou.value,
    area_weighted_agreement: d.areaWeightedAgreement.value,
    matched_area_share_first: d.matchedAreaShareFirst.value,
    matched_area_share_second: d.matchedAreaShareSecond.value,
    ...(Object.keys(reasons).length ? { reasons } : {}),
    explanations: explainDelineation(d),
    pairs: matched,
  };
}

function sheetJson(sheet: AgreementSheet) {
  const f = sheet.figures;
  const reasons = collectReasons({
    observed: f.observed, expected: f.expected, kappa: f.kappa, kappa_se: f.standardError,
    kappa_ci95: f.ci95, pabak: sheet.pabak,
  });
  return {
    n: f.n,
    observed: f.observed.value,
    expected: f.expected.value,
    kappa: f.kappa.value,
    kappa_se: f.standardError.value,
    kappa_ci95: f.ci95.value,
    kappa_se_null: f.standardErrorNull.value,
    pabak: sheet.pabak.value,
    ...(f.kappa.reason ? { reason: f.kappa.reason } : {}),
    ...(Object.keys(reasons).length ? { reasons } : {}),
    classes: sheet.matrix.classes,
    matrix: sheet.matrix.counts,
    row_shares: sheet.rowShares,
    column_shares: sheet.columnShares,
    per_class: sheet.perClass.map((c) => ({
      class: c.name, both: c.both, first: c.firstTotal, second: c.secondTotal, specific: c.specific.value,
      ...(c.specific.reason ? { reason: c.specific.reason } : {}),
    })),
    by_confidence: groupJson(sheet.byConfidence),
    by_group: groupJson(sheet.byGroup),
    explanations: {
      observed: sheet.explanations.observed,
      expected: sheet.explanations.expected,
      kappa: sheet.explanations.kappa,
      kappa_se: sheet.explanations.standardError,
      kappa_ci95: sheet.explanations.ci95,
      pabak: sheet.explanations.pabak,
    },
  };
}

// Text output: the matrix, then each figure with its one-line explanation.

const num = (figure: Figure, digits = 3) => (figure.value === null ? 'undefined' : figure.value.toFixed(digits));

function matrixText(sheet: AgreementSheet): string[] {
  const { classes, counts, rowTotals, columnTotals, n } = sheet.matrix;
  const labelWidth = Math.max(5, ...classes.map((c) => c.length));
  const cellWidth = Math.max(5, ...classes.map((c) => c.length), String(n).length);
  const cells = (values: (string | number)[]) => values.map((v) => String(v).padStart(cellWidth)).join(' ');
  return [
    `${''.padEnd(labelWidth)}  ${cells(classes)} | ${'total'.padStart(cellWidth)}`,
    ...classes.map((c, i) => `${c.padEnd(labelWidth)}  ${cells(counts[i])} | ${String(rowTotals[i]).padStart(cellWidth)}`),
    `${'total'.padEnd(labelWidth)}  ${cells(columnTotals)} | ${String(n).padStart(cellWidth)}`,
  ];
}

function groupText(title: string, groups: GroupAgreement[]): string[] {
  if (groups.length === 0) return [];
  const width = Math.max(...groups.map((g) => g.key.length));
  return ['', title, ...groups.map((g) =>
    `  ${g.key.padEnd(width)}  ${`n=${g.n}`.padEnd(8)}  observed ${num(g.figures.observed)}  kappa ${num(g.figures.kappa)}` +
      (g.figures.kappa.reason ? ` (${g.figures.kappa.reason})` : ''))];
}

function sheetText(sheet: AgreementSheet, header: string): string[] {
  const f = sheet.figures;
  const e = sheet.explanations;
  const ci = f.ci95.value ? `[${f.ci95.value[0].toFixed(3)}, ${f.ci95.value[1].toFixed(3)}]` : 'undefined';
  const rows: [string, string, string][] = [
    ['Observed agreement', num(f.observed), e.observed],
    ['Chance agreement', num(f.expected), e.expected],
    ["Cohen's kappa", num(f.kappa), e.kappa],
    ['Standard error', num(f.standardError), e.standardError],
    ['95 % interval', ci, e.ci95],
    ['PABAK', num(sheet.pabak), e.pabak],
  ];
  const classWidth = Math.max(...sheet.perClass.map((c) => c.name.length), 5);
  return [
    header,
    '',
    ...matrixText(sheet),
    '',
    ...rows.map(([name, value, why]) => `${name.padEnd(19)} ${value.padStart(16)}  ${why}`),
    '',
    'Specific agreement per class',
    ...sheet.perClass.map((c) => `  ${c.name.padEnd(classWidth)}  ${num(c.specific)}  ${c.explanation}`),
    ...groupText('By confidence (first file)', sheet.byConfidence),
    ...groupText('By species group (first file)', sheet.byGroup),
  ];
}

function delineationText(d: DelineationFigures): string[] {
  const e = explainDelineation(d);
  return [
    '',
    `Delineation (IoU at least ${d.minIou})`,
    `  matched           ${String(d.matched).padStart(8)}  ${e.matched}`,
    `  unmatched         ${`${d.unmatchedFirst} / ${d.unmatchedSecond}`.padStart(8)}  ${e.unmatched}`,
    `  mean IoU          ${num(d.meanIou).padStart(8)}  ${e.meanIou}`,
    `  area-weighted     ${num(d.areaWeightedAgreement).padStart(8)}  ${e.areaWeightedAgreement}`,
  ];
}

export const agree: Verb = {
  name: 'agree',
  summary: "interpreter agreement between two label files: confusion matrix, Cohen's kappa, PABAK",
  usage,
  async run(args, out) {
    const { values, positionals } = parseVerbArgs('agree', args, {
      by: { type: 'string' },
      match: { type: 'string' },
      'min-iou': { type: 'string' },
      json: { type: 'boolean', default: false },
    });
    if (positionals.length < 2) {
      throw new InputError(`agree: expected two label files (A.geojson B.geojson), got ${positionals.length}`);
    }
    if (values.by !== undefined && values.by !== 'id') throw new InputError(`agree: --by takes 'id', got '${values.by}'`);
    if (values.match !== undefined && values.match !== 'iou') throw new InputError(`agree: --match takes 'iou', got '${values.match}'`);
    if (values.by !== undefined && values.match !== undefined) throw new InputError('agree: choose --by id or --match iou, not both');
    if (values['min-iou'] !== undefined && values.match === undefined) throw new InputError('agree: --min-iou needs --match iou');
    const byIou = values.match === 'iou';
    const minIou = parseMinIou(values['min-iou']);
    if (positionals.length > 2) {
      if (byIou) throw new InputError(`agree: --match iou compares two delineations, got ${positionals.length} files`);
      out.stdout(severalFiles(positionals, values.json ?? false));
      return 0;
    }
    const [pathA, pathB] = positionals;

    const a = readLabels(pathA);
    // Measure the second file in the first one's CRS so the outlines can overlap.
    const b = readLabels(pathB, byIou ? { targetEpsg: a.epsg } : {});
    const delineation = byIou ? pairFilesByIou(a, b, minIou) : null;
    const pairs = delineation ? delineation.pairs : pairFilesById(pathA, a, pathB, b);
    const sheet = agreementSheet(pairs);

    if (values.json) {
      out.stdout(JSON.stringify({
        first: pathA,
        second: pathB,
        paired_by: byIou ? 'iou' : 'id',
        ...sheetJson(sheet),
        // The patches to reconcile: each pair the two files call differently.
        disagreements: pairs.filter((p) => p.first !== p.second).map((p) => ({ id: p.id, first: p.first, second: p.second })),
        ...(delineation ? { delineation: delineationJson(delineation.figures, delineation.matched) } : {}),
      }, null, 2));
      return 0;
    }
    const how = byIou ? `matched by IoU (at least ${minIou})` : 'paired by id';
    const header = `Agreement of ${basename(pathA)} (rows) and ${basename(pathB)} (columns), ${how}: ${pairs.length} ${pairs.length === 1 ? 'patch' : 'patches'}`;
    const lines = sheetText(sheet, header);
    if (delineation) lines.push(...delineationText(delineation.figures));
    const differing = pairs.filter((p) => p.first !== p.second);
    if (differing.length) {
      const shown = differing.slice(0, 10).map((p) => `  ${p.id}: ${p.first} / ${p.second}`);
      const more = differing.length > 10 ? [`  … and ${differing.length - 10} more (all of them with --json)`] : [];
      lines.push('', `Disagreements (${differing.length}), first file / second file`, ...shown, ...more);
    }
    out.stdout(lines.join('\n'));
    return 0;
  },
};
