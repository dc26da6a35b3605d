import type { Figure } from '../agreement/index.ts';
import type { SheetCsvInput } from './sheetCsv.ts';

// The agreement sheet as lines of plain text: what the saved report (PNG or PDF) shows,
// figure by figure with its explanation, and the confusion matrix in fixed columns.

const f3 = (f: Figure) => (f.value === null ? 'not defined' : f.value.toFixed(3));
const pct = (x: number | null) => (x === null ? '–' : `${(100 * x).toFixed(0)}%`);

export interface ReportLine {
  text: string;
  kind: 'title' | 'heading' | 'figure' | 'explanation' | 'table';
}

export function agreementReport({ sheet: s, fleiss, delineation, settled }: SheetCsvInput, title: string): ReportLine[] {
  const lines: ReportLine[] = [];
  const push = (kind: ReportLine['kind'], text: string) => lines.push({ kind, text });
  const { matrix, figures, explanations } = s.sheet;
  push('title', title);
  push('explanation', `First: pass ${s.first.id} (${s.first.interpreter}). Second: pass ${s.second.id} (${s.second.interpreter}${s.second.blind ? ', blind' : ''}). ${figures.n} patches called in both.`);
  push('heading', 'Agreement');
  const fig = (name: string, f: Figure, why: string) => {
    push('figure', `${name}: ${f3(f)}`);
    push('explanation', f.value === null ? `Not defined: ${f.reason}.` : why);
  };
  fig('Observed agreement', figures.observed, explanations.observed);
  fig('Chance agreement', figures.expected, explanations.expected);
  fig("Cohen's kappa", figures.kappa, explanations.kappa);
  fig('Standard error of kappa', figures.standardError, explanations.standardError);
  push('figure', `95 % confidence interval: ${figures.ci95.value ? `${figures.ci95.value[0].toFixed(3)} to ${figures.ci95.value[1].toFixed(3)}` : 'not defined'}`);
  push('explanation', figures.ci95.value ? explanations.ci95 : `Not defined: ${figures.ci95.reason}.`);
  fig('PABAK', s.sheet.pabak, explanations.pabak);

  push('heading', 'Confusion matrix (rows: first, columns: second; count, row share)');
  const width = Math.max(10, ...matrix.classes.map((c) => c.length + 1));
  const cell = (t: string) => t.padStart(width);
  push('table', `${''.padEnd(width)}${matrix.classes.map(cell).join('')}${cell('total')}`);
  matrix.classes.forEach((c, i) => {
    push('table', `${c.padEnd(width)}${matrix.counts[i].map((n, j) => cell(`${n} ${pct(s.sheet.rowShares[i][j])}`)).join('')}${cell(String(matrix.rowTotals[i]))}`);
  });
  push('table', `${'total'.padEnd(width)}${matrix.columnTotals.map((n) => cell(String(n))).join('')}${cell(String(matrix.n))}`);

  push('heading', 'Specific agreement per class');
  for (const c of s.sheet.perClass) push('figure', `${c.name}: ${f3(c.specific)} — ${c.specific.value === null ? c.specific.reason : c.explanation}`);
  for (const [heading, groups] of [['By confidence of the first call', s.sheet.byConfidence], ['By species group', s.sheet.byGroup]] as const) {
    push('heading', heading);
    for (const g of groups) push('figure', `${g.key}: ${g.n} patches, observed ${f3(g.figures.observed)}, kappa ${f3(g.figures.kappa)}`);
  }
  if (fleiss) {
    push('heading', `Fleiss' kappa over ${fleiss.passIds.join(', ')}`);
    fig("Fleiss' kappa", fleiss.figures.kappa, fleiss.explanation);
  }
  if (settled) {
    const t = settled.disagreements;
    push('heading', 'After the rulings (the calls against the settled species)');
    push('figure', `Disagreements settled: ${t.settled} of ${t.total}, ${t.open} open`);
    push('explanation', t.explanation);
    for (const p of settled.passes) {
      push('figure', `${p.passId} (${p.interpreter}): ${p.n} settled patches called, as settled ${f3(p.figures.observed)}, kappa ${f3(p.figures.kappa)}`);
      push('explanation', `${p.explanations.observed} ${p.explanations.kappa}`);
    }
  }
  if (delineation) {
    const d = delineation.figures;
    const e = delineation.explanations;
    push('heading', `Independent delineation ${delineation.delineationPassId} against ${delineation.firstPassId} (IoU at least ${d.minIou})`);
    push('figure', `Matched: ${d.matched}`);
    push('explanation', e.matched);
    push('figure', `Unmatched: ${d.unmatchedFirst} first, ${d.unmatchedSecond} second`);
    push('explanation', e.unmatched);
    fig('Mean IoU', d.meanIou, e.meanIou);
    fig('Area-weighted agreement', d.areaWeightedAgreement, e.areaWeightedAgreement);
  }
  push('explanation', 'Labels are interpretations: verify in the field before management decisions.');
  return lines;
}
