import type { Figure } from '../agreement/index.ts';
import type { SettledSheet } from '../rulings/settledSheet.ts';
import type { DelineationSheet, PassesFleiss, PassSheet } from './passComparison.ts';

// The agreement sheet as CSV (RFC 4180: comma-separated, fields with commas, quotes or
// line breaks quoted, quotes doubled, CRLF line ends). One table in long form, so a
// spreadsheet or a script reads every figure the same way:
//   section, row, column, value, explanation
// Undefined figures leave `value` empty and say why in `explanation`.

function field(value: string | number | null): string {
  if (value === null) return '';
  const text = typeof value === 'number' ? String(value) : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export interface SheetCsvInput {
  sheet: PassSheet;
  fleiss?: PassesFleiss | null;
  delineation?: DelineationSheet | null;
  /** what the rulings made of the two passes, when any patch they called is settled */
  settled?: SettledSheet | null;
}

export function agreementCsv({ sheet: s, fleiss, delineation, settled }: SheetCsvInput): string {
  const rows: (string | number | null)[][] = [['section', 'row', 'column', 'value', 'explanation']];
  const add = (section: string, row: string, column: string, value: number | string | null, explanation = '') => rows.push([section, row, column, value, explanation]);
  const figure = (section: string, row: string, f: Figure, explanation: string) => add(section, row, '', f.value, f.value === null ? f.reason : explanation);
  const { matrix, figures, explanations } = s.sheet;

  add('passes', 'first', '', s.first.id, `${s.first.interpreter}${s.first.blind ? ', blind' : ''}`);
  add('passes', 'second', '', s.second.id, `${s.second.interpreter}${s.second.blind ? ', blind' : ''}`);
  add('figures', 'n', '', figures.n, 'patches called in both passes');
  figure('figures', 'observed', figures.observed, explanations.observed);
  figure('figures', 'expected', figures.expected, explanations.expected);
  figure('figures', 'kappa', figures.kappa, explanations.kappa);
  figure('figures', 'kappa_se', figures.standardError, explanations.standardError);
  if (figures.ci95.value) {
    add('figures', 'kappa_ci95_low', '', figures.ci95.value[0], explanations.ci95);
    add('figures', 'kappa_ci95_high', '', figures.ci95.value[1], explanations.ci95);
  } else add('figures', 'kappa_ci95', '', null, figures.ci95.reason);
  figure('figures', 'pabak', s.sheet.pabak, explanations.pabak);

  matrix.classes.forEach((row, i) => matrix.classes.forEach((column, j) => {
    add('matrix counts', row, column, matrix.counts[i][j]);
    add('matrix row shares', row, column, s.sheet.rowShares[i][j]);
    add('matrix column shares', row, column, s.sheet.columnShares[i][j]);
  }));
  for (const c of s.sheet.perClass) figure('specific agreement', c.name, c.specific, c.explanation);
  for (const g of s.sheet.byConfidence) {
    add('by confidence', g.key, 'n', g.n);
    add('by confidence', g.key, 'observed', g.figures.observed.value);
    add('by confidence', g.key, 'kappa', g.figures.kappa.value, g.figures.kappa.reason ?? '');
  }
  for (const g of s.sheet.byGroup) {
    add('by species group', g.key, 'n', g.n);
    add('by species group', g.key, 'observed', g.figures.observed.value);
    add('by species group', g.key, 'kappa', g.figures.kappa.value, g.figures.kappa.reason ?? '');
  }
  if (fleiss) {
    add('fleiss', 'passes', '', fleiss.passIds.join(' '), `${fleiss.patchIds.length} patches called in every one`);
    figure('fleiss', 'observed', fleiss.figures.observed, '');
    figure('fleiss', 'expected', fleiss.figures.expected, '');
    figure('fleiss', 'kappa', fleiss.figures.kappa, fleiss.explanation);
  }
  if (settled) {
    const t = settled.disagreements;
    add('after the rulings', 'disagreements', 'total', t.total);
    add('after the rulings', 'disagreements', 'settled', t.settled, t.explanation);
    add('after the rulings', 'disagreements', 'open', t.open);
    for (const [on, n] of Object.entries(t.on)) add('after the rulings', 'settled on', on, n);
    for (const p of settled.passes) {
      const row = `${p.passId} (${p.interpreter})`;
      add('after the rulings', row, 'n', p.n, 'settled patches this pass called');
      add('after the rulings', row, 'observed', p.figures.observed.value, p.figures.observed.value === null ? p.figures.observed.reason : p.explanations.observed);
      add('after the rulings', row, 'kappa', p.figures.kappa.value, p.figures.kappa.value === null ? p.figures.kappa.reason : p.explanations.kappa);
    }
  }
  if (delineation) {
    const d = delineation.figures;
    const e = delineation.explanations;
    add('delineation', 'min_iou', '', d.minIou);
    add('delineation', 'matched', '', d.matched, e.matched);
    add('delineation', 'unmatched_first', '', d.unmatchedFirst, e.unmatched);
    add('delineation', 'unmatched_second', '', d.unmatchedSecond, e.unmatched);
    figure('delineation', 'mean_iou', d.meanIou, e.meanIou);
    figure('delineation', 'area_weighted_agreement', d.areaWeightedAgreement, e.areaWeightedAgreement);
  }
  return rows.map((r) => r.map(field).join(',')).join('\r\n') + '\r\n';
}
