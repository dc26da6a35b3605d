import { readFileSync } from 'node:fs';
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
      json: { type: 'boolean' },
    });
    if (positionals.length !== 1) throw new InputError(`expected one PATCHES.geojson, got ${positionals.length} file(s); see --help`);
    if (values.scene === undefined) throw new InputError('--scene MS.tif is needed: its grid decides which pixels are pure');
    const rule = ruleFromOptions(values);
    const assumeEpsg = numberOption('epsg', values.epsg, (n) => Number.isInteger(n) && n > 0, 'an EPSG code');
    const [file] = positionals;
    const scene = await openGeoTiffFile(values.scene);
    try {
      const grid = gridOf(scene);
      const labels = readLabels(file, grid.epsg, assumeEpsg);
      const report = await countScenePixels(labels, scene, rule);
      if (values.json) {
        out.stdout(JSON.stringify({
          file, scene: values.scene, crs: `EPSG:${labels.epsg}`,
          rule: { ...ruleJson(rule), text: report.ruleText },
          patches: report.patches.map((p) => ({ id: p.id, species: p.species, pure: p.pure, noData: p.noData, touched: p.touched, problems: p.problems })),
          classes: report.classes,
          messages: report.messages,
        }));
      } else {
        out.stdout(textReport(file, values.scene, report));
      }
      return 0;
    } finally {
      await scene.close();
    }
  },
};
