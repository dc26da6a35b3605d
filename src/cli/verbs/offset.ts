import { readFile, rename, rm, writeFile } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { transformer } from '../../core/crs.ts';
import { LabelFileError, readLabelFile, type LabelledPatch } from '../../core/geojson/labelFile.ts';
import { extentOfRings } from '../../core/geometry/measure.ts';
import type { Extent } from '../../core/geometry/types.ts';
import {
  defaultSettings, estimateByArea, estimateShift, sceneSignal, SceneSignalError, shiftPatches, shiftRecord,
  type AreaShifts, type OffsetEstimate, type ShiftRecord, type SignalKind,
} from '../../core/offset/index.ts';
import { requireGeoreference } from '../../core/tiff/inspectTiff.ts';
import { isTiffError } from '../../core/tiff/errors.ts';
import { InputError } from '../errors.ts';
import { openGeoTiffFile, type OpenGeoTiff } from '../openGeoTiff.ts';
import { describeFsError } from '../readFileRange.ts';
import { parseVerbArgs, type Verb, type VerbOutput } from '../verb.ts';

const usage = `fellfield offset FIELD.geojson --scene PAN.tif,MS.tif [--radius 3] [--signal ndvi|pan] [--areas N] [--json] [--apply OUT.geojson]

Estimates the systematic shift between field polygons (GPS) and the imagery: the
shift that best puts the polygons on their crowns, by the contrast of NDVI inside
each polygon against a ring just outside it, searched up to --radius metres at a
quarter of a panchromatic pixel and fitted below that. Prints the shift (metres and
panchromatic pixels), its 95 % uncertainty (bootstrap over the polygons) and the
polygons that do not fit it (outliers). Says so when the imagery gives no reliable
shift, rather than giving a number.

  --scene PAN,MS   the scene's panchromatic and multispectral GeoTIFFs (same CRS)
  --radius M       largest shift tried, metres (default 3)
  --signal S       ndvi (from the multispectral red and NIR bands, default) or pan
                   (panchromatic brightness)
  --areas N        also estimate a shift in each of N x N cells of the polygons'
                   extent and say whether one shift fits them all
  --json           print one JSON document: dx_m, dy_m (the shift to apply, east and
                   north), uncertainty_m, reliable, outliers and the details
  --apply OUT      write the shifted polygons to OUT (RFC 7946 GeoJSON), each with
                   the shift in its "offset" property; only with a reliable shift

Nothing is shifted unless --apply is given. Exit 0 done; 1 --apply asked but there is
no reliable shift (nothing written); 2 bad input (one line naming the file): a file
that cannot be read, polygons outside the scene, fewer than two polygons, a radius
as large as the scene.`;

const num = (v: number, d = 3) => Number(v.toFixed(d));

function parseScene(raw: string | undefined): string[] {
  if (!raw) throw new InputError('give the scene: --scene PAN.tif,MS.tif');
  const files = raw.split(',').map((f) => f.trim()).filter(Boolean);
  if (files.length !== 2) throw new InputError(`--scene takes two files, PAN.tif,MS.tif; got ${files.length}`);
  return files;
}

async function openScene(path: string): Promise<OpenGeoTiff> {
  const tiff = await openGeoTiffFile(path);
  try {
    requireGeoreference(tiff.summary);
  } catch (error) {
    await tiff.close();
    throw isTiffError(error) ? new InputError(error.message) : error;
  }
  return tiff;
}

async function readField(path: string, epsg: number) {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (error) {
    throw new InputError(`${path}: cannot read the file (${describeFsError(error)})`);
  }
  try {
    return readLabelFile(text, path, { targetEpsg: epsg });
  } catch (error) {
    if (error instanceof LabelFileError) throw new InputError(error.message);
    throw error;
  }
}

const intersects = (a: Extent, b: Extent) => a[0] < b[2] && a[2] > b[0] && a[1] < b[3] && a[3] > b[1];

function checkPlacement(field: string, patches: LabelledPatch[], scene: Extent, sceneName: string, radius: number): void {
  const usable = patches.filter((p) => extentOfRings(p.rings).every(Number.isFinite));
  if (usable.length < patches.length) {
    const bad = patches.find((p) => !usable.includes(p))!;
    throw new InputError(`${field}: polygon ${JSON.stringify(bad.id)} has positions that are not numbers`);
  }
  if (patches.length < 2) {
    throw new InputError(`${field}: holds ${patches.length} polygon${patches.length === 1 ? '' : 's'}; a common shift needs at least two (one polygon cannot tell it from its own error)`);
  }
  const outside = patches.filter((p) => !intersects(extentOfRings(p.rings), scene));
  if (outside.length > 0) {
    const ids = outside.slice(0, 5).map((p) => JSON.stringify(p.id)).join(', ');
    throw new InputError(
      `${field}: ${outside.length} of ${patches.length} polygons lie outside the scene ${sceneName} (${ids}${outside.length > 5 ? ', ...' : ''}); give only polygons on the scene`,
    );
  }
  const side = Math.min(scene[2] - scene[0], scene[3] - scene[1]);
  if (!(radius > 0) || 2 * radius >= side) {
    throw new InputError(`--radius ${radius} m: must be above 0 and under half the scene's side (${num(side / 2, 1)} m)`);
  }
}

function heatMap(estimate: OffsetEstimate): string[] {
  const { half, values } = estimate.surface;
  const side = 2 * half + 1;
  const finite = values.filter((v): v is number => v !== null);
  const lo = Math.min(...finite);
  const hi = Math.max(...finite);
  const shades = ' .:-=+*#%@';
  const lines: string[] = [];
  for (let row = side - 1; row >= 0; row--) {
    let line = '';
    for (let col = 0; col < side; col++) {
      const v = values[row * side + col];
      line += v === null ? ' ' : shades[hi > lo ? Math.min(9, Math.floor(((v - lo) / (hi - lo)) * 10)) : 0];
    }
    lines.push(`    |${line}|`);
  }
  return lines;
}

function textReport(field: string, estimate: OffsetEstimate, panPixel: number, polygons: number, applied: string | null): string {
  const lines = [`${field}: ${polygons} polygons, signal ${estimate.settings.signal}, search radius ${estimate.settings.radius} m`];
  if (estimate.reliable) {
    const dx = estimate.dx!;
    const dy = estimate.dy!;
    lines.push(`  shift      ${num(dx)} m east, ${num(dy)} m north (${num(dx / panPixel, 2)}, ${num(dy / panPixel, 2)} panchromatic pixels)`);
    lines.push(`  uncertainty ${num(estimate.uncertainty!)} m (95 % radius, bootstrap over ${estimate.bootstrap!.replicates} resamples of the polygons)`);
  } else {
    lines.push('  no reliable shift:');
    for (const reason of estimate.reasons) lines.push(`    - ${reason}`);
  }
  lines.push(`  peak       ${num(estimate.significance, 1)} standard errors above the rest of the surface`);
  const outliers = estimate.patches.filter((p) => p.outlier);
  lines.push(`  outliers   ${outliers.length === 0 ? 'none' : outliers.length}`);
  for (const p of outliers) {
    const own = p.residual ? `fits ${num(p.residual[0], 2)} m east, ${num(p.residual[1], 2)} m north of the common shift` : 'no peak of its own';
    const fit = p.fit === null ? '' : p.fit < 0
      ? '; its contrast is reversed at the common shift (lower inside than around)'
      : `; its contrast at the common shift is ${Math.round(p.fit * 100)} % of its own best`;
    lines.push(`    ${String(p.id)}: ${own}${fit}`);
  }
  lines.push(`  score surface (north up, ${estimate.surface.step} m steps, brighter is a better fit):`);
  lines.push(...heatMap(estimate));
  lines.push(applied ? `  wrote the shifted polygons to ${applied}` : '  nothing shifted (use --apply OUT.geojson to write shifted polygons)');
  return lines.join('\n');
}

function areaLines(areas: AreaShifts): string[] {
  const verdict = areas.oneShiftFits === null ? 'too few cells with a reliable shift to tell' : areas.oneShiftFits ? 'one shift fits every cell' : 'one shift does not fit every cell';
  const lines = [`  per area (${areas.cellsAcross} x ${areas.cellsAcross} cells, south-west first): ${verdict}`];
  for (const c of areas.cells) {
    const what = c.reliable
      ? `${num(c.dx!)} m east, ${num(c.dy!)} m north, +-${num(c.uncertainty!)} m${c.agrees === false ? ' (differs from the common shift)' : ''}`
      : `no reliable shift (${c.reasons[0] ?? 'unknown'})`;
    lines.push(`    cell ${c.col + 1},${c.row + 1}: ${c.polygons} polygons, ${what}`);
  }
  return lines;
}

function jsonReport(field: string, scene: string[], estimate: OffsetEstimate, panPixel: number, polygons: number, applied: string | null) {
  return {
    field,
    scene,
    polygons,
    signal: estimate.settings.signal,
    reliable: estimate.reliable,
    reasons: estimate.reasons,
    dx_m: estimate.dx,
    dy_m: estimate.dy,
    dx_px: estimate.dx === null ? null : estimate.dx / panPixel,
    dy_px: estimate.dy === null ? null : estimate.dy / panPixel,
    uncertainty_m: estimate.uncertainty,
    candidate_m: estimate.candidate,
    significance: estimate.significance,
    bootstrap: estimate.bootstrap,
    outliers: estimate.outliers,
    patches: estimate.patches.map((p) => ({
      id: p.id, contrast: p.contrast, residual_m: p.residual, distance_m: p.distance, fit: p.fit, outlier: p.outlier,
    })),
    surface: { step_m: estimate.surface.step, half: estimate.surface.half, rows: 'south to north', values: estimate.surface.values },
    settings: estimate.settings,
    applied,
  };
}

/** Writes the shifted polygons as RFC 7946 GeoJSON (lon/lat) next to OUT, then renames. */
async function writeShifted(out: string, fieldText: string, patches: LabelledPatch[], epsg: number, sourceEpsg: number, record: ShiftRecord) {
  const doc = JSON.parse(fieldText) as { features: Record<string, unknown>[]; crs?: unknown };
  const moved = shiftPatches(patches.map((p) => p.rings), record.shift);
  const back = epsg === sourceEpsg ? (xy: [number, number]) => xy : transformer(epsg, sourceEpsg);
  const round = sourceEpsg === 4326 ? 9 : 4;
  const provenance = {
    dx_m: num(record.shift.dx, 4), dy_m: num(record.shift.dy, 4), uncertainty_m: num(record.uncertaintyM, 4),
    crs: `EPSG:${epsg}`, method: record.method,
  };
  patches.forEach((patch, i) => {
    const feature = doc.features[patch.index];
    const coordinates = moved[i].map((rings) => rings.map((ring) => ring.map((xy) => back(xy).map((v) => num(v, round)))));
    const geometry = feature.geometry as { type: string };
    feature.geometry = geometry.type === 'Polygon' ? { type: 'Polygon', coordinates: coordinates[0] } : { type: 'MultiPolygon', coordinates };
    const properties = (feature.properties ?? {}) as Record<string, unknown>;
    feature.properties = { ...properties, offset: { ...provenance, outlier: record.outliers.includes(patch.id) } };
  });
  const partial = join(dirname(out), `.${basename(out)}.partial-${process.pid}`);
  try {
    await writeFile(partial, `${JSON.stringify(doc)}\n`);
    await rename(partial, out);
  } catch (error) {
    await rm(partial, { force: true });
    throw new InputError(`${out}: cannot write the file (${describeFsError(error)})`);
  }
}

async function run(args: string[], out: VerbOutput): Promise<number> {
  const { values, positionals } = parseVerbArgs('offset', args, {
    scene: { type: 'string' }, radius: { type: 'string' }, signal: { type: 'string' }, areas: { type: 'string' }, json: { type: 'boolean' }, apply: { type: 'string' },
  });
  if (positionals.length !== 1) {
    throw new InputError(positionals.length === 0 ? 'give the field polygons: fellfield offset FIELD.geojson --scene PAN.tif,MS.tif' : `give one field file, not ${positionals.length}`);
  }
  const field = positionals[0];
  const sceneFiles = parseScene(values.scene);
  const radius = values.radius === undefined ? 3 : Number(values.radius);
  if (!Number.isFinite(radius) || radius <= 0) throw new InputError(`--radius must be a positive number of metres, got '${values.radius}'`);
  const signal = (values.signal ?? 'ndvi') as SignalKind;
  if (signal !== 'ndvi' && signal !== 'pan') throw new InputError(`--signal takes ndvi or pan, got '${values.signal}'`);
  const cells = values.areas === undefined ? 0 : Number(values.areas);
  if (!Number.isInteger(cells) || cells < 0 || cells > 8) throw new InputError(`--areas takes a whole number of cells across from 1 to 8, got '${values.areas}'`);

  const pan = await openScene(sceneFiles[0]);
  let ms: OpenGeoTiff | null = null;
  try {
    ms = await openScene(sceneFiles[1]);
    if (pan.summary.bands !== 1) throw new InputError(`${pan.path}: the panchromatic file has ${pan.summary.bands} bands, expected 1 (order: --scene PAN.tif,MS.tif)`);
    if (ms.summary.epsg !== pan.summary.epsg) {
      throw new InputError(`${ms.path}: its CRS (EPSG:${ms.summary.epsg}) is not the panchromatic file's (EPSG:${pan.summary.epsg})`);
    }
    const source = signal === 'ndvi' ? ms : pan;
    const epsg = pan.summary.epsg!;
    const file = await readField(field, epsg);
    const scene: Extent = [
      Math.max(pan.summary.extent[0], ms.summary.extent[0]), Math.max(pan.summary.extent[1], ms.summary.extent[1]),
      Math.min(pan.summary.extent[2], ms.summary.extent[2]), Math.min(pan.summary.extent[3], ms.summary.extent[3]),
    ];
    checkPlacement(field, file.patches, scene, source.path, radius);

    const panPixel = pan.summary.pixelSize[0];
    const settings = defaultSettings(panPixel, source.summary.pixelSize[0], { radius, signal });
    const all = extentOfRings(file.patches.flatMap((p) => p.rings));
    const margin = radius + settings.ownReach + settings.ringWidth + 2 * source.summary.pixelSize[0];
    let grid;
    try {
      grid = await sceneSignal(source, signal, [all[0] - margin, all[1] - margin, all[2] + margin, all[3] + margin]);
    } catch (error) {
      if (error instanceof SceneSignalError || isTiffError(error)) throw new InputError(error.message);
      throw error;
    }
    const patches = file.patches.map((p) => ({ id: p.id, rings: p.rings }));
    const estimate = estimateShift(patches, grid, settings);
    const areas = cells > 0 ? estimateByArea(patches, grid, settings, estimate, cells) : null;

    let applied: string | null = null;
    if (values.apply !== undefined) {
      if (!estimate.reliable) {
        out.stderr(`fellfield offset: no reliable shift, so nothing was written to ${values.apply}: ${estimate.reasons.join('; ')}`);
      } else {
        const text = await readFile(field, 'utf8');
        await writeShifted(values.apply, text, file.patches, file.epsg, file.sourceEpsg, shiftRecord(estimate, file.patches.map((p) => p.id)));
        applied = values.apply;
      }
    }
    out.stdout(values.json
      ? JSON.stringify({ ...jsonReport(field, sceneFiles, estimate, panPixel, file.patches.length, applied), areas }, null, 2)
      : [textReport(field, estimate, panPixel, file.patches.length, applied), ...(areas ? areaLines(areas) : [])].join('\n'));
    return values.apply !== undefined && !applied ? 1 : 0;
  } finally {
    await pan.close();
    await ms?.close();
  }
}

export const offset: Verb = {
  name: 'offset',
  summary: 'estimate the shift between field polygons and the imagery; optionally write the shifted polygons',
  usage,
  run,
};
