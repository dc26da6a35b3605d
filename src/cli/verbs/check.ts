import { readFileSync } from 'node:fs';
import { FINDING_KINDS, type Finding, type FindingKind } from '../../core/checks/findings.ts';
import { runChecks } from '../../core/checks/runChecks.ts';
import { NoDataMask, readMasksFor } from '../../core/checks/noDataMask.ts';
import type { PatchInput } from '../../core/checks/preparedPatch.ts';
import { defaultSettings, type CheckSettings, type SceneGrids } from '../../core/checks/settings.ts';
import { LabelFileError, readLabelFile } from '../../core/geojson/labelFile.ts';
import { extentOfRings } from '../../core/geometry/measure.ts';
import { gridOfSummary } from '../../core/geometry/rasterGrid.ts';
import { vertexCount } from '../../core/geometry/validity.ts';
import { isTiffError } from '../../core/tiff/errors.ts';
import type { TiffSummary } from '../../core/tiff/inspectTiff.ts';
import { InputError } from '../errors.ts';
import { inspectInWorker } from '../inspectInWorker.ts';
import { openFileRange } from '../readFileRange.ts';
import { parseVerbArgs, type Verb } from '../verb.ts';

const usage = `fellfield check PATCHES.geojson [--scene PAN.tif,MS.tif] [--json] [--fail-on KINDS]

Checks labelled patches for what would spoil a training set. Findings:
  invalid         not a valid polygon (OGC Simple Features): self-intersection, open or
                  too-short ring, repeated positions, hole outside its shell, zero area
  overlap-same    two patches of the same species overlap (pixels counted twice)
  overlap-mixed   two patches of different species overlap (pixels with two labels)
  near-duplicate  two outlines with IoU above --iou (default 0.9)
  mixed-tag       a patch tagged "mixed", or whose tags disagree
  undersized      area under --min-area-px multispectral pixels (default 2), or fewer
                  pure multispectral pixels than --min-pure (default 1; needs --scene)
  off-image       outside the scene, across its edge, or over no-data pixels (needs
                  --scene; no-data by the rasters' GDAL_NODATA tag or --nodata)

  --scene PAN.tif,MS.tif  the scene's panchromatic and multispectral GeoTIFFs (one file
                          serves as both); their grids set the sliver tolerance, pure
                          pixels and the image edge, and lon/lat input is measured in
                          their CRS
  --nodata V              the scene rasters' no-data value (a number, or nan), over
                          their GDAL_NODATA tag; a pixel is no-data when any band
                          holds it. Only the blocks under the patches are read
  --fail-on KINDS         comma-separated kinds, or "all": exit 1 when any is found
  --epsg N                CRS of projected coordinates in a file without a "crs" member
  --sliver-m2 X           overlaps up to X m² are digitizing noise (default 0.1 of a
                          panchromatic pixel, 0.009 m² without a scene)
  --iou X                 near-duplicate threshold (default 0.9)
  --min-pure N            fewest pure multispectral pixels (default 1)
  --min-area-px X         smallest area in multispectral pixels (default 2)
  --max-vertices N        outlines with more vertices are reported, not checked (20000)
  --json                  print one JSON document: {"findings": [...], "counts": {...}}

Input: a GeoJSON FeatureCollection; each feature has an "id" and a "species"
property. Further interpreters' calls go in an optional "tags" property: an array
of species codes or of {"species", "interpreter", "confidence"} objects; a patch
whose species and tags are not all the same, or any of them "mixed", is mixed-tag.
Lon/lat (RFC 7946) is measured in metres in its UTM zone (or the scene's CRS).`;

function readText(path: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a directory' : code ?? 'unknown error';
    throw new InputError(`${path}: cannot read the file (${why})`);
  }
}

function numberOption(name: string, value: string | undefined, test: (n: number) => boolean, expected: string): number | undefined {
  if (value === undefined) return undefined;
  const n = Number(value);
  if (value.trim() === '' || !Number.isFinite(n) || !test(n)) throw new InputError(`--${name}: expected ${expected}, got '${value}'`);
  return n;
}

function failKinds(value: string | undefined): Set<FindingKind> {
  if (value === undefined) return new Set();
  const names = value.split(',').map((s) => s.trim()).filter(Boolean);
  if (names.includes('all')) return new Set(FINDING_KINDS);
  for (const name of names) {
    if (!(FINDING_KINDS as readonly string[]).includes(name)) {
      throw new InputError(`--fail-on: unknown kind '${name}' (kinds: ${FINDING_KINDS.join(', ')}, or all)`);
    }
  }
  if (names.length === 0) throw new InputError('--fail-on: give at least one kind');
  return new Set(names as FindingKind[]);
}

/** The header of one scene raster (read in a guarded worker), georeferenced with an EPSG code. */
async function rasterSummary(path: string): Promise<TiffSummary> {
  const { summary } = await inspectInWorker(path, { check: 'none' });
  if (!summary.georeferenced) throw new InputError(`${path}: the GeoTIFF has no georeference, so it cannot place the patches`);
  if (summary.epsg === null) throw new InputError(`${path}: the GeoTIFF names no EPSG code for its CRS`);
  return summary;
}

interface SceneFiles {
  scene: SceneGrids;
  epsg?: number;
  /** The distinct raster files with their headers, for the no-data check. */
  rasters: { path: string; summary: TiffSummary }[];
}

async function readScene(value: string | undefined): Promise<SceneFiles> {
  if (value === undefined) return { scene: {}, rasters: [] };
  const paths = value.split(',').map((s) => s.trim()).filter(Boolean);
  if (paths.length < 1 || paths.length > 2) throw new InputError(`--scene: expected PAN.tif,MS.tif (or one raster), got '${value}'`);
  const rasters = [];
  for (const path of new Set(paths)) rasters.push({ path, summary: await rasterSummary(path) });
  const pan = gridOfSummary(rasters[0].summary);
  const ms = gridOfSummary(rasters[rasters.length - 1].summary);
  if (pan.epsg !== ms.epsg) {
    throw new InputError(`${paths[1]}: its CRS (EPSG:${ms.epsg}) differs from ${paths[0]} (EPSG:${pan.epsg})`);
  }
  return { scene: { pan, ms }, epsg: pan.epsg, rasters };
}

/**
 * Where the scene rasters hold no data, read for the blocks under the patches only.
 * Patches past the vertex limit are not checked, so their boxes are not read.
 */
async function noDataMasks(rasters: SceneFiles['rasters'], patches: PatchInput[], override: number | undefined, maxVertices: number): Promise<NoDataMask[]> {
  const masks: NoDataMask[] = [];
  const extents = patches.filter((p) => vertexCount(p.rings) <= maxVertices).map((p) => extentOfRings(p.rings));
  for (const { path, summary } of rasters) {
    const mask = NoDataMask.of(summary, override);
    if (!mask) continue;
    const file = await openFileRange(path);
    try {
      await readMasksFor([{ mask, read: file.read }], extents);
    } catch (error) {
      if (isTiffError(error)) throw new InputError(error.message);
      throw error;
    } finally {
      await file.close();
    }
    masks.push(mask);
  }
  return masks;
}

const round2 = (v: number) => Math.round(v * 100) / 100;

function textReport(file: string, patches: number, epsg: number, findings: Finding[], counts: Record<FindingKind, number>): string {
  const lines = [`${file}: ${patches} patch(es), measured in EPSG:${epsg}; ${findings.length} finding(s)`];
  for (const kind of FINDING_KINDS) {
    const ofKind = findings.filter((f) => f.kind === kind);
    if (ofKind.length === 0) continue;
    lines.push('', `${kind} (${counts[kind]})`);
    for (const f of ofKind) {
      const size = f.area_m2 === null ? '' : ` [${round2(f.area_m2)} m²]`;
      lines.push(`  ${f.severity === 'error' ? 'error  ' : 'warning'} ${f.message}${size}`);
      lines.push(`          fix: ${f.fix.text}`);
    }
  }
  return lines.join('\n');
}

export const check: Verb = {
  name: 'check',
  summary: 'find overlaps, mixed-species conflicts, broken, undersized and off-image patches',
  usage,
  async run(args, out) {
    const { values, positionals } = parseVerbArgs('check', args, {
      scene: { type: 'string' },
      'fail-on': { type: 'string' },
      epsg: { type: 'string' },
      'sliver-m2': { type: 'string' },
      iou: { type: 'string' },
      'min-pure': { type: 'string' },
      'min-area-px': { type: 'string' },
      'max-vertices': { type: 'string' },
      nodata: { type: 'string' },
      json: { type: 'boolean' },
    });
    if (positionals.length !== 1) throw new InputError(`expected one PATCHES.geojson, got ${positionals.length} file(s); see --help`);
    const [file] = positionals;
    const failOn = failKinds(values['fail-on']);
    const settings: Partial<CheckSettings> = {
      sliverAreaM2: numberOption('sliver-m2', values['sliver-m2'], (n) => n >= 0, 'an area in m² (0 or more)'),
      nearDuplicateIoU: numberOption('iou', values.iou, (n) => n > 0 && n <= 1, 'a number in (0, 1]'),
      minPurePixels: numberOption('min-pure', values['min-pure'], (n) => Number.isInteger(n) && n >= 0, 'a whole number'),
      minAreaInMsPixels: numberOption('min-area-px', values['min-area-px'], (n) => n >= 0, 'a number of pixels (0 or more)'),
      maxVertices: numberOption('max-vertices', values['max-vertices'], (n) => Number.isInteger(n) && n >= 4, 'a whole number of at least 4'),
    };
    const assumeEpsg = numberOption('epsg', values.epsg, (n) => Number.isInteger(n) && n > 0, 'an EPSG code');
    const noDataValue = values.nodata?.trim().toLowerCase() === 'nan' ? NaN
      : numberOption('nodata', values.nodata, () => true, 'a number or nan');

    const text = readText(file);
    const { scene, epsg: sceneEpsg, rasters } = await readScene(values.scene);
    let labels;
    try {
      labels = readLabelFile(text, file, { targetEpsg: sceneEpsg, assumeEpsg });
    } catch (error) {
      if (error instanceof LabelFileError) throw new InputError(error.message);
      throw error;
    }
    const maxVertices = settings.maxVertices ?? defaultSettings().maxVertices;
    const noData = await noDataMasks(rasters, labels.patches, noDataValue, maxVertices);
    const report = runChecks(labels.patches, { settings, scene: noData.length ? { ...scene, noData } : scene });
    if (values.json) {
      out.stdout(JSON.stringify({ file, crs: `EPSG:${labels.epsg}`, patches: labels.patches.length, ...report }));
    } else {
      out.stdout(textReport(file, labels.patches.length, labels.epsg, report.findings, report.counts));
    }
    return report.findings.some((f) => failOn.has(f.kind)) ? 1 : 0;
  },
};
