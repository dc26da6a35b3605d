import * as fs from 'node:fs';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import initSqlJs from 'sql.js';
import type { RasterGrid } from '../../core/geometry/rasterGrid.ts';
import { ExportError } from '../../core/export/ExportError.ts';
import { EXPORT_FORMATS, exportSite, type ExportFile, type ExportFormat, type ExportSummary } from '../../core/export/exportSite.ts';
import type { ExportOptions, ExportSelection } from '../../core/export/options.ts';
import { readSiteFile, type OpenedSite } from '../../core/export/siteFile.ts';
import { DEFAULT_BUFFER_M, DEFAULT_MIN_COVER, ruleProblem, type PixelRule } from '../../core/pixels/rule.ts';
import { schemeProblem, type Scheme } from '../../core/training/scheme.ts';
import { namedSchemes } from '../../core/export/namedSchemes.ts';
import { InputError } from '../errors.ts';
import { inspectInWorker } from '../inspectInWorker.ts';
import { parseVerbArgs, type Verb } from '../verb.ts';

const usage = `fellfield export SITE-FILE --format geojson|gpkg --out DIR [options] [--json]

Exports the labelled patches of a site file with their provenance: the data file
(GeoJSON in WGS 84 longitude/latitude, or a GeoPackage in the site's own CRS), the
site's history beside it (NAME.site.json) and a W3C PROV document (NAME.prov.json)
whose ledger head verifies that history. Files are written under temporary names and
renamed into place only when all of them are complete.

  --format F        geojson or gpkg
  --out DIR         the folder to write into (made if missing)
  --name NAME       file names start with NAME (default: labels)
  --pass ID         one pass's calls only (default: the consensus of tags and rulings)
  --all-passes      every patch with every tag, the consensus beside them
  --open WHAT       patches with an open disagreement: refuse (default), leave-out, include
  --scheme NAME     classes: a scheme stored with the site (made on the Training
                    sheet) by its name, species (default), groups, GROUP (that group's
                    species apart, the rest as "other"), or a JSON file {"name", "classOf"}
  --folds K         assign K spatial folds (blocks of --fold-block metres, default 50;
                    --fold-seed N, default 1)
  --ms FILE         the multispectral GeoTIFF whose grid counts pure pixels
  --pixel-rule R    inside (default, buffer ${DEFAULT_BUFFER_M} m), inside:BUFFER, centre, cover[:SHARE]
  --json            print one JSON document instead of text`;

/** The file system calls the writer makes; tests hand in one that fails. */
export interface WriteCalls {
  writeFileSync: (path: string, bytes: Uint8Array) => void;
  renameSync: (from: string, to: string) => void;
  rmSync: (path: string, options: { force: boolean }) => void;
  mkdirSync: (path: string, options: { recursive: boolean }) => unknown;
}

const realCalls: WriteCalls = {
  writeFileSync: (p, b) => fs.writeFileSync(p, b),
  renameSync: fs.renameSync,
  rmSync: fs.rmSync,
  mkdirSync: fs.mkdirSync,
};

function explainCode(error: unknown): string {
  const code = (error as NodeJS.ErrnoException).code;
  const plain: Record<string, string> = {
    ENOSPC: 'the disk is full', EDQUOT: 'the disk quota is used up', EACCES: 'permission denied', EPERM: 'not permitted',
    EROFS: 'the file system is read-only', ENOTDIR: 'a part of the path is not a folder', ENOENT: 'no such file or folder',
  };
  return code ? `${plain[code] ?? code} (${code})` : (error as Error).message;
}

/**
 * Writes every file under a temporary name first and renames them into place only when
 * all are written, so a failure leaves no file, whole or half, under a final name.
 */
export function writeExportFiles(dir: string, files: readonly ExportFile[], calls: WriteCalls = realCalls): string[] {
  try {
    calls.mkdirSync(dir, { recursive: true });
  } catch (error) {
    throw new InputError(`cannot use the output folder ${dir}: ${explainCode(error)}`);
  }
  const partial = files.map((f) => join(dir, `.${f.name}.partial-${process.pid}`));
  try {
    files.forEach((f, i) => calls.writeFileSync(partial[i], f.bytes));
  } catch (error) {
    for (const p of partial) calls.rmSync(p, { force: true });
    throw new InputError(`cannot write the export into ${dir}: ${explainCode(error)}; nothing was written`);
  }
  const written: string[] = [];
  for (const [i, f] of files.entries()) {
    const target = join(dir, f.name);
    try {
      calls.renameSync(partial[i], target);
      written.push(target);
    } catch (error) {
      for (const p of partial.slice(i)) calls.rmSync(p, { force: true });
      throw new InputError(`cannot put ${target} in place: ${explainCode(error)}`);
    }
  }
  return written;
}

function readSiteText(path: string): string {
  try {
    return fs.readFileSync(path, 'utf8');
  } catch (error) {
    throw new InputError(`${path}: cannot read the site file (${explainCode(error)})`);
  }
}

/** A scheme by name over the site's roster, or read from a JSON file. */
function schemeOf(value: string | undefined, opened: OpenedSite): Scheme | null {
  if (value === undefined) return null;
  const named = namedSchemes(opened.state.roster, opened.state.schemes);
  const found = named.find((n) => n.name === value);
  if (found) return found.scheme;
  if (!value.endsWith('.json')) {
    throw new InputError(`--scheme: unknown scheme '${value}' (${named.map((n) => n.name).join(', ')}, or a .json file)`);
  }
  let scheme: Scheme;
  try {
    scheme = JSON.parse(fs.readFileSync(value, 'utf8')) as Scheme;
  } catch (error) {
    throw new InputError(`${value}: cannot read the scheme (${error instanceof SyntaxError ? error.message : explainCode(error)})`);
  }
  const problem = schemeProblem(scheme);
  if (problem) throw new InputError(`${value}: ${problem}`);
  return scheme;
}

function pixelRuleOf(value: string | undefined): PixelRule {
  const [kind, arg] = (value ?? 'inside').split(':');
  const number = (fallback: number) => (arg === undefined ? fallback : Number(arg));
  let rule: PixelRule;
  if (kind === 'inside') rule = { kind: 'inside', buffer: number(DEFAULT_BUFFER_M) };
  else if (kind === 'centre') rule = { kind: 'centre' };
  else if (kind === 'cover') rule = { kind: 'cover', minCover: number(DEFAULT_MIN_COVER) };
  else throw new InputError(`--pixel-rule: unknown rule '${value}' (inside[:BUFFER], centre, cover[:SHARE])`);
  const problem = ruleProblem(rule);
  if (problem) throw new InputError(`--pixel-rule: ${problem}`);
  return rule;
}

async function msGrid(path: string, epsg: number): Promise<RasterGrid> {
  const { summary } = await inspectInWorker(path, { check: 'none' });
  if (!summary.georeferenced) throw new InputError(`${path}: the GeoTIFF has no georeference, so it cannot place the patches`);
  if (summary.epsg !== epsg) throw new InputError(`${path}: its CRS (EPSG:${summary.epsg}) is not the site's (EPSG:${epsg})`);
  return { originX: summary.origin[0], originY: summary.origin[1], pixelWidth: summary.pixelSize[0], pixelHeight: summary.pixelSize[1], width: summary.width, height: summary.height, epsg };
}

function positiveInteger(name: string, value: string | undefined, min: number): number | undefined {
  if (value === undefined) return undefined;
  if (!/^\d+$/.test(value) || Number(value) < min) throw new InputError(`--${name} must be a whole number of ${min} or more, got '${value}'`);
  return Number(value);
}

export function appVersion(): string {
  try {
    const path = resolve(fileURLToPath(import.meta.url), '../../../../package.json');
    return String((JSON.parse(fs.readFileSync(path, 'utf8')) as { version?: string }).version ?? 'unknown');
  } catch {
    return 'unknown';
  }
}

function textSummary(summary: ExportSummary, dir: string): string {
  const lines = [`${summary.site}: ${summary.patches} patch(es) exported as ${summary.format} into ${dir}`];
  for (const l of summary.leftOut) lines.push(`  left out: ${l.count} ${l.reason}`);
  for (const m of summary.messages) lines.push(`  note: ${m}`);
  for (const f of summary.files) lines.push(`  ${f.name}  ${f.bytes} bytes  sha256 ${f.sha256}`);
  lines.push(`  ledger head: event ${summary.ledgerHead.seq}, ${summary.ledgerHead.hash}`);
  lines.push('Labels are interpretations: verify in the field before any management decision.');
  return lines.join('\n');
}

export const exportVerb: Verb = {
  name: 'export',
  summary: 'export a site file\'s labelled patches as GeoJSON or GeoPackage, with provenance',
  usage,
  async run(args, out) {
    const { values, positionals } = parseVerbArgs('export', args, {
      format: { type: 'string' }, out: { type: 'string' }, name: { type: 'string' }, pass: { type: 'string' },
      'all-passes': { type: 'boolean' }, open: { type: 'string' }, scheme: { type: 'string' }, folds: { type: 'string' },
      'fold-block': { type: 'string' }, 'fold-seed': { type: 'string' }, ms: { type: 'string' }, 'pixel-rule': { type: 'string' },
      json: { type: 'boolean' },
    });
    if (positionals.length !== 1) throw new InputError(`expected one SITE-FILE, got ${positionals.length}\n${usage.split('\n')[0]}`);
    const format = values.format as ExportFormat | undefined;
    if (!format || !EXPORT_FORMATS.includes(format)) throw new InputError(`--format must be ${EXPORT_FORMATS.join(' or ')}, got '${values.format ?? ''}'`);
    if (!values.out) throw new InputError('--out DIR is required: the folder to write the export into');
    if (values.pass && values['all-passes']) throw new InputError('--pass and --all-passes exclude each other');
    const open = (values.open ?? 'refuse') as ExportOptions['open'];
    if (!['refuse', 'leave-out', 'include'].includes(open!)) throw new InputError(`--open must be refuse, leave-out or include, got '${values.open}'`);

    const sitePath = positionals[0];
    try {
      const opened = await readSiteFile(readSiteText(sitePath), sitePath);
      const selection: ExportSelection = values.pass ? { kind: 'pass', passId: values.pass } : values['all-passes'] ? { kind: 'all-passes' } : { kind: 'consensus' };
      const k = positiveInteger('folds', values.folds, 2);
      const folds = k === undefined ? null : { k, blockSize: positiveInteger('fold-block', values['fold-block'], 1) ?? 50, seed: positiveInteger('fold-seed', values['fold-seed'], 0) ?? 1 };
      const epsg = opened.state.site!.epsg;
      const pixels = values.ms ? { grid: await msGrid(values.ms, epsg), rule: pixelRuleOf(values['pixel-rule']) } : null;
      const scheme = schemeOf(values.scheme, opened);
      const sql = format === 'gpkg' ? await initSqlJs() : undefined;
      const { files, summary } = await exportSite(opened, { selection, scheme, folds, pixels, open }, {
        format, baseName: values.name, appVersion: appVersion(), time: new Date().toISOString(), sql,
      });
      const dir = resolve(values.out);
      writeExportFiles(dir, files);
      out.stdout(values.json ? JSON.stringify({ out: dir, ...summary }) : textSummary(summary, dir));
      return 0;
    } catch (error) {
      if (error instanceof ExportError) throw new InputError(error.message);
      if (error instanceof RangeError) throw new InputError(`${sitePath}: ${error.message}`);
      throw error;
    }
  },
};
