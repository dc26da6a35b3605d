import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { bandTableFor } from '../../core/bandTable.ts';
import { writeChips } from '../../core/export/chips.ts';
import { buildSamples, ndvi, type RasterBands, type SampleColumn, type SpectralIndex } from '../../core/export/samples.ts';
import { samplesCsv } from '../../core/export/samplesCsv.ts';
import { samplesParquet } from '../../core/export/samplesParquet.ts';
import { indexBands } from '../../core/render/indices.ts';
import type { SampleType } from '../../core/tiff/writeGeoTiff.ts';
import { LabelFileError, readLabelFile, type LabelFile } from '../../core/geojson/labelFile.ts';
import type { RasterGrid } from '../../core/geometry/rasterGrid.ts';
import { countPixels, type NoDataTest, type PixelCountReport } from '../../core/pixels/pixelCounts.ts';
import { DEFAULT_BUFFER_M, DEFAULT_MIN_COVER, ruleProblem, RULE_KINDS, type PixelRule } from '../../core/pixels/rule.ts';
import { readWindowBands } from '../../core/raster/readWindow.ts';
import { InputError } from '../errors.ts';
import { openGeoTiffFile, type OpenGeoTiff } from '../openGeoTiff.ts';
import { parseVerbArgs, type Verb } from '../verb.ts';

const usage = `fellfield pixels PATCHES.geojson --scene MS.tif [--rule inside|centre|cover]
                 [--buffer 0.5] [--min-cover 0.5] [--epsg N] [--json]

Counts the pure multispectral pixels of each patch and of each species: the pixels
whose spectrum belongs to the patch alone, and so are fit to train a classifier.

  --scene MS.tif     the multispectral GeoTIFF: its grid places the pixels; its no-data
                     value (if any) marks pixels left out and reported
  --rule R           which pixels count (default inside):
                       inside  the footprint lies wholly inside the patch shrunk inward
                               by --buffer metres (default 0.5, a field GPS accuracy)
                       centre  the pixel centre lies inside the patch
                       cover   at least --min-cover (default 0.5) of the footprint's
                               area lies inside the patch (exact area, not sampled)
  --epsg N           CRS of projected coordinates in a file without a "crs" member
  --samples FILE     write one row per pure pixel to FILE (.csv, RFC 4180, or .parquet):
                     patch_id, species, class (the species), fold (empty), row, col, x, y
                     (pixel centre), cover, every band, ndvi (when the band table has red
                     and NIR), and with --pan the mean, standard deviation (population)
                     and count of the panchromatic pixels centred inside each pixel
  --pan PAN.tif      the panchromatic GeoTIFF of the same scene, for --samples and --chips
  --chips DIR        write one chip per patch to DIR: an N x N window of every band around
                     its pure pixel nearest their mean, and the pan window over the same
                     ground, with index.csv listing them
  --chip-size N      chip side in multispectral pixels (default 9)
  --chip-format F    npy (NumPy arrays, shape bands x rows x columns; default) or geotiff
  --json             one JSON document:
                       {"patches": [{"id", "species", "pure", "noData", "touched",
                        "problems"}], "classes": {species: pure pixels}, "rule",
                        "messages"}

Problems are told per patch and the rest is still counted: a buffer wider than the
patch, chosen pixels holding no data, a patch off the raster. Input: a GeoJSON
FeatureCollection whose features have an "id" and a "species"; lon/lat (RFC 7946)
is measured in the scene's CRS.`;

export function readText(path: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a directory' : code ?? 'unknown error';
    throw new InputError(`${path}: cannot read the file (${why})`);
  }
}

export function numberOption(name: string, value: string | undefined, test: (n: number) => boolean, expected: string): number | undefined {
  if (value === undefined) return undefined;
  const n = Number(value);
  if (value.trim() === '' || !Number.isFinite(n) || !test(n)) throw new InputError(`--${name}: expected ${expected}, got '${value}'`);
  return n;
}

export function readLabels(path: string, targetEpsg: number | undefined, assumeEpsg: number | undefined): LabelFile {
  const text = readText(path);
  try {
    return readLabelFile(text, path, { targetEpsg, assumeEpsg });
  } catch (error) {
    if (error instanceof LabelFileError) throw new InputError(error.message);
    throw error;
  }
}

/** The pixel rule from --rule, --buffer and --min-cover. */
export function ruleFromOptions(values: { rule?: string; buffer?: string; 'min-cover'?: string }): PixelRule {
  const kind = values.rule ?? 'inside';
  if (!(RULE_KINDS as readonly string[]).includes(kind)) throw new InputError(`--rule: expected one of ${RULE_KINDS.join(', ')}, got '${kind}'`);
  if (values.buffer !== undefined && kind !== 'inside') throw new InputError(`--buffer: only the inside rule shrinks the patch (the rule is ${kind})`);
  if (values['min-cover'] !== undefined && kind !== 'cover') throw new InputError(`--min-cover: only the cover rule uses it (the rule is ${kind})`);
  const buffer = numberOption('buffer', values.buffer, (n) => n >= 0, 'a distance in metres (0 or more)') ?? DEFAULT_BUFFER_M;
  const minCover = numberOption('min-cover', values['min-cover'], (n) => n > 0 && n <= 1, 'a share in (0, 1]') ?? DEFAULT_MIN_COVER;
  const rule: PixelRule = kind === 'inside' ? { kind, buffer } : kind === 'cover' ? { kind, minCover } : { kind: 'centre' };
  const problem = ruleProblem(rule);
  if (problem) throw new InputError(problem);
  return rule;
}

/** The grid of a georeferenced raster, from its header. */
export function gridOf(scene: OpenGeoTiff): RasterGrid {
  const { summary } = scene;
  if (!summary.georeferenced) throw new InputError(`${scene.path}: the GeoTIFF has no georeference, so it cannot place the patches`);
  if (summary.epsg === null) throw new InputError(`${scene.path}: the GeoTIFF names no EPSG code for its CRS`);
  return {
    originX: summary.origin[0], originY: summary.origin[1],
    pixelWidth: summary.pixelSize[0], pixelHeight: summary.pixelSize[1],
    width: summary.width, height: summary.height, epsg: summary.epsg,
  };
}

/**
 * Counts pure pixels with the scene's no-data pixels left out: every band of each
 * patch's window is read (only its blocks), and a pixel with no data in any band is out.
 */
export async function countScenePixels(labels: LabelFile, scene: OpenGeoTiff, rule: PixelRule): Promise<PixelCountReport> {
  const grid = gridOf(scene);
  const report = countPixels(labels.patches, grid, rule);
  const { nodata } = scene.summary;
  const bands = Array.from({ length: scene.summary.bands }, (_, b) => b);
  const holes = new Set<number>();
  for (const patch of report.patches) {
    const { row0, col0, width, height } = patch.pixels.coverage;
    if (patch.pixels.rows.length === 0) continue;
    let values;
    try {
      values = await readWindowBands(scene.read, scene.summary, { level: 0, x: col0, y: row0, width, height, bands });
    } catch (error) {
      throw new InputError(`${scene.path}: cannot read the pixels under patch ${patch.id} (${(error as Error).message})`);
    }
    for (let i = 0; i < patch.pixels.rows.length; i++) {
      const at = (patch.pixels.rows[i] - row0) * width + (patch.pixels.cols[i] - col0);
      // Without a declared value, only NaN (in float rasters) means no data.
      const missing = values.some((band) => (nodata === null || Number.isNaN(nodata) ? Number.isNaN(band[at]) : band[at] === nodata));
      if (missing) holes.add(patch.pixels.rows[i] * grid.width + patch.pixels.cols[i]);
    }
  }
  if (holes.size === 0) return report;
  const noData: NoDataTest = (row, col) => holes.has(row * grid.width + col);
  return countPixels(labels.patches, grid, rule, noData);
}

function writeOut(path: string, content: string | Uint8Array): void {
  try {
    writeFileSync(path, content);
  } catch (error) {
    throw new InputError(`${path}: cannot write the file (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`);
  }
}

/** The bands of a scene over a pixel window (clipped to the raster), as RasterBands on the window's own grid. */
async function windowBands(scene: OpenGeoTiff, x0: number, y0: number, x1: number, y1: number): Promise<RasterBands | null> {
  const grid = gridOf(scene);
  const cx0 = Math.max(0, x0), cy0 = Math.max(0, y0), cx1 = Math.min(grid.width, x1), cy1 = Math.min(grid.height, y1);
  if (cx1 <= cx0 || cy1 <= cy0) return null;
  const s = scene.summary;
  const bands = await readWindowBands(scene.read, s, { level: 0, x: cx0, y: cy0, width: cx1 - cx0, height: cy1 - cy0, bands: Array.from({ length: s.bands }, (_, b) => b) });
  return {
    grid: { ...grid, originX: grid.originX + cx0 * grid.pixelWidth, originY: grid.originY - cy0 * grid.pixelHeight, width: cx1 - cx0, height: cy1 - cy0 },
    bands, names: bandTableFor(s.bands, s.bandNames, s.bandWavelengthsNm).map((b) => b.name), noData: s.nodata,
  };
}

/** The pan window over the same ground as a multispectral window. */
async function panWindow(pan: OpenGeoTiff, ms: RasterBands): Promise<RasterBands | null> {
  const g = gridOf(pan);
  const x0 = Math.floor((ms.grid.originX - g.originX) / g.pixelWidth + 1e-9);
  const y0 = Math.floor((g.originY - ms.grid.originY) / g.pixelHeight + 1e-9);
  const x1 = Math.ceil((ms.grid.originX + ms.grid.width * ms.grid.pixelWidth - g.originX) / g.pixelWidth - 1e-9);
  const y1 = Math.ceil((g.originY - (ms.grid.originY - ms.grid.height * ms.grid.pixelHeight)) / g.pixelHeight - 1e-9);
  return windowBands(pan, x0, y0, x1, y1);
}

function ndviOf(scene: OpenGeoTiff): SpectralIndex[] {
  const s = scene.summary;
  const bands = indexBands(bandTableFor(s.bands, s.bandNames, s.bandWavelengthsNm), 'ndvi');
  return 'problem' in bands ? [] : [ndvi(bands.b, bands.a)];
}

/** The sample table, read patch by patch (only the blocks under each patch). */
async function sceneSamples(report: PixelCountReport, scene: OpenGeoTiff, pan: OpenGeoTiff | null) {
  const grid = gridOf(scene);
  const indices = ndviOf(scene);
  let columns: SampleColumn[] | null = null;
  let rows = 0;
  const messages: string[] = [];
  for (const p of report.patches) {
    const { row0, col0, width, height } = p.pixels.coverage;
    if (p.pixels.rows.length === 0) continue;
    const ms = (await windowBands(scene, col0, row0, col0 + width, row0 + height))!;
    const panBands = pan ? await panWindow(pan, ms) : null;
    const table = buildSamples([{ id: p.id, species: p.species, cls: p.species, fold: null, pixels: p.pixels }], grid, ms, { indices, ...(panBands ? { pan: panBands } : {}) });
    messages.push(...table.messages);
    if (!columns) columns = table.columns;
    else table.columns.forEach((c, i) => columns![i].values.push(...c.values));
    rows += table.rows;
  }
  return { columns: columns ?? [], rows, messages };
}

/** One chip per patch, written to `dir` with index.csv. */
async function sceneChips(report: PixelCountReport, scene: OpenGeoTiff, pan: OpenGeoTiff | null, dir: string, size: number, format: 'npy' | 'geotiff'): Promise<number> {
  const grid = gridOf(scene);
  try {
    mkdirSync(dir, { recursive: true });
  } catch (error) {
    throw new InputError(`${dir}: cannot make the folder (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`);
  }
  const sampleType: SampleType = (['uint8', 'uint16', 'int16', 'float32'] as string[]).includes(scene.summary.dtype) ? scene.summary.dtype as SampleType : 'float32';
  const index: string[] = [];
  let count = 0;
  for (const p of report.patches) {
    if (p.pixels.rows.length === 0) continue;
    const { row0, col0, width, height } = p.pixels.coverage;
    const ms = await windowBands(scene, col0 - size, row0 - size, col0 + width + size, row0 + height + size);
    if (!ms) continue;
    const panBands = pan ? await panWindow(pan, ms) : null;
    const set = writeChips([{ id: p.id, species: p.species, cls: p.species, fold: null, pixels: p.pixels }], grid, ms, panBands, { size, format, sampleType });
    for (const f of set.files) writeOut(join(dir, f.name), f.bytes);
    count += set.files.length;
    const lines = set.index.split('\r\n').filter(Boolean);
    index.push(...(index.length ? lines.slice(1) : lines));
    report.messages.push(...set.messages);
  }
  writeOut(join(dir, 'index.csv'), index.length ? `${index.join('\r\n')}\r\n` : '');
  return count;
}

export function ruleJson(rule: PixelRule): Record<string, unknown> {
  return { ...rule };
}

function textReport(file: string, scene: string, report: PixelCountReport): string {
  const total = report.patches.reduce((n, p) => n + p.pure, 0);
  const lines = [`${file} on ${scene}: ${report.patches.length} patch(es), ${total} pure pixel(s); rule: ${report.ruleText}`, '', 'species    pure pixels  patches'];
  for (const [species, pure] of Object.entries(report.classes).sort(([, a], [, b]) => b - a)) {
    const patches = report.patches.filter((p) => p.species === species).length;
    lines.push(`${species.padEnd(10)} ${String(pure).padStart(11)}  ${String(patches).padStart(7)}`);
  }
  if (report.messages.length) lines.push('', 'notes', ...report.messages.map((m) => `  ${m}`));
  return lines.join('\n');
}

export const pixels: Verb = {
  name: 'pixels',
  summary: 'count pure multispectral pixels per patch and per species',
  usage,
  async run(args, out) {
    const { values, positionals } = parseVerbArgs('pixels', args, {
      scene: { type: 'string' },
      rule: { type: 'string' },
      buffer: { type: 'string' },
      'min-cover': { type: 'string' },
      epsg: { type: 'string' },
      samples: { type: 'string' },
      pan: { type: 'string' },
      chips: { type: 'string' },
      'chip-size': { type: 'string' },
      'chip-format': { type: 'string' },
      json: { type: 'boolean' },
    });
    if (positionals.length !== 1) throw new InputError(`expected one PATCHES.geojson, got ${positionals.length} file(s); see --help`);
    if (values.samples !== undefined && !/\.(csv|parquet)$/i.test(values.samples)) throw new InputError(`--samples: expected a file name ending in .csv or .parquet, got '${values.samples}'`);
    const chipSize = numberOption('chip-size', values['chip-size'], (n) => Number.isInteger(n) && n >= 1 && n <= 512, 'a whole number of pixels, 1 to 512') ?? 9;
    const chipFormat = values['chip-format'] ?? 'npy';
    if (chipFormat !== 'npy' && chipFormat !== 'geotiff') throw new InputError(`--chip-format: expected npy or geotiff, got '${chipFormat}'`);
    if (values.scene === undefined) throw new InputError('--scene MS.tif is needed: its grid decides which pixels are pure');
    const rule = ruleFromOptions(values);
    const assumeEpsg = numberOption('epsg', values.epsg, (n) => Number.isInteger(n) && n > 0, 'an EPSG code');
    const [file] = positionals;
    const scene = await openGeoTiffFile(values.scene);
    const panScene = values.pan !== undefined ? await openGeoTiffFile(values.pan) : null;
    try {
      const grid = gridOf(scene);
      if (panScene && gridOf(panScene).epsg !== grid.epsg) throw new InputError(`${values.pan}: its CRS (EPSG:${gridOf(panScene).epsg}) differs from ${values.scene} (EPSG:${grid.epsg})`);
      const labels = readLabels(file, grid.epsg, assumeEpsg);
      const report = await countScenePixels(labels, scene, rule);
      const written: string[] = [];
      if (values.samples !== undefined) {
        const table = await sceneSamples(report, scene, panScene);
        report.messages.push(...table.messages);
        const bytes = /\.parquet$/i.test(values.samples) ? samplesParquet(table, { fellfield_rule: report.ruleText, fellfield_patches: file }) : samplesCsv(table);
        writeOut(values.samples, bytes);
        written.push(`${values.samples}: ${table.rows} sample(s)`);
      }
      if (values.chips !== undefined) {
        const count = await sceneChips(report, scene, panScene, values.chips, chipSize, chipFormat);
        written.push(`${values.chips}: ${count} chip file(s) and index.csv`);
      }
      if (values.json) {
        out.stdout(JSON.stringify({
          file, scene: values.scene, crs: `EPSG:${labels.epsg}`,
          rule: { ...ruleJson(rule), text: report.ruleText },
          patches: report.patches.map((p) => ({ id: p.id, species: p.species, pure: p.pure, noData: p.noData, touched: p.touched, problems: p.problems })),
          classes: report.classes,
          messages: report.messages,
          written,
        }));
      } else {
        out.stdout([textReport(file, values.scene, report), ...(written.length ? ['', 'written', ...written.map((w) => `  ${w}`)] : [])].join('\n'));
      }
      return 0;
    } finally {
      await scene.close();
      await panScene?.close();
    }
  },
};
