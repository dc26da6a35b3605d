import type { SampleTable } from './samples.ts';

// The sample table as CSV (RFC 4180: comma-separated, CRLF line ends, fields with a
// comma, quote or line break quoted, quotes doubled). Empty fields are nulls. Numbers
// are written in full (JavaScript's shortest round-trip form), so they read back exact.

function field(value: string | number | null): string {
  if (value === null) return '';
  const text = typeof value === 'number' ? (Number.isFinite(value) ? String(value) : '') : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function samplesCsv(table: SampleTable): string {
  const lines = [table.columns.map((c) => field(c.name)).join(',')];
  for (let r = 0; r < table.rows; r++) lines.push(table.columns.map((c) => field(c.values[r])).join(','));
  return `${lines.join('\r\n')}\r\n`;
}
