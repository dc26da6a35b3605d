import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import initSqlJs from 'sql.js';
import { exportSite, type ExportFormat } from '../../src/core/export/exportSite.ts';
import type { MultiPolygonRings } from '../../src/core/geometry/types.ts';
import { square, twoPassSite, type SiteBuilder } from '../core/export/siteBuilder.ts';

// A site whose outlines test the writers' geometry rules: a plain square, a ring with a
// hole written with the wrong winding (exterior clockwise, hole counterclockwise), and a
// patch of two parts. Written to a temporary folder for the outside readers.

const wrongWayWithHole: MultiPolygonRings = [[
  [[493400, 4429100], [493400, 4429120], [493420, 4429120], [493420, 4429100], [493400, 4429100]],
  [[493405, 4429105], [493415, 4429105], [493415, 4429115], [493405, 4429115], [493405, 4429105]],
]];
const twoParts: MultiPolygonRings = [...square(493500, 4429100, 5), ...square(493510.123456789, 4429100.987654321, 4)];

export async function geometrySite(): Promise<SiteBuilder> {
  const b = await twoPassSite(6);
  for (const [id, geometry] of [['H1', wrongWayWithHole], ['M1', twoParts]] as const) {
    await b.patch(id, geometry);
    await b.tag(id, 'a', 'ABFI', 'ana', 'sure');
  }
  return b;
}

export async function writtenExport(b: SiteBuilder, format: ExportFormat): Promise<{ dir: string; data: string; prov: string; history: string }> {
  const dir = mkdtempSync(join(tmpdir(), `fellfield-export-${format}-`));
  const sql = format === 'gpkg' ? await initSqlJs() : undefined;
  const { files } = await exportSite(b.opened, { selection: { kind: 'consensus' } }, { format, appVersion: '0.1.0', time: '2031-02-03T04:05:06.000Z', sql });
  for (const f of files) writeFileSync(join(dir, f.name), f.bytes);
  return { dir, data: join(dir, files[0].name), history: join(dir, files[1].name), prov: join(dir, files[2].name) };
}
