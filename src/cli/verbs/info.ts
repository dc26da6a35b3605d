import { crsUnits } from '../../core/crs.ts';
import type { TiffSummary } from '../../core/tiff/inspectTiff.ts';
import { InputError } from '../errors.ts';
import { inspectInWorker } from '../inspectInWorker.ts';
import { parseVerbArgs, type Verb, type VerbOutput } from '../verb.ts';

const usage = `fellfield info FILE.tif [--json] [--verify] [--require-georef] [--timeout SECONDS]

Describes a GeoTIFF: size, bands, data type, CRS (EPSG code and name), pixel size,
extent, tiling, compression, overviews, no-data, band names and wavelengths.
The file is read by ranges (its header and directories, then a few tiles) in a
worker that is stopped if it runs longer than the timeout.

  --json             print one JSON document instead of text
  --verify           decode every tile of every level, not only the first of each band
  --require-georef   treat a file without georeferencing or EPSG code as bad input
  --timeout S        give up on the file after S seconds (default 20)

Bad input (exit 2, one line naming the file and the problem): not a TIFF, truncated,
a looping or overlong directory chain, absurd declared sizes, a tile that does not
decode to its declared size, a file that takes past the timeout.
Warnings (exit 0, told on stderr): no georeferencing (the app shows such a file in
pixel space), a CRS without an EPSG code, a compression this tool cannot decode,
ignored masks or pages. With --require-georef the first two are errors.`;

const units = { metre: 'm', degree: 'degrees', pixel: 'px' } as const;

/** Up to 12 significant digits, without trailing zeros. */
function num(value: number): string {
  if (Number.isNaN(value)) return 'nan';
  return String(Number(value.toPrecision(12)));
}

function size(width: number, height: number): string {
  return `${width} x ${height}`;
}

function bytes(n: number): string {
  if (n < 1024) return `${n} bytes`;
  if (n < 1024 ** 2) return `${(n / 1024).toFixed(1)} KiB`;
  if (n < 1024 ** 3) return `${(n / 1024 ** 2).toFixed(1)} MiB`;
  return `${(n / 1024 ** 3).toFixed(2)} GiB`;
}

const predictorNames: Record<number, string> = { 1: 'no predictor', 2: 'horizontal predictor', 3: 'floating-point predictor' };

export function infoJson(s: TiffSummary, checkedBlocks: number): Record<string, unknown> {
  const overviewLevels = s.levels.slice(1);
  return {
    file: s.fileName,
    file_size: s.fileSize,
    width: s.width,
    height: s.height,
    bands: s.bands,
    dtype: s.dtype,
    bits_per_sample: s.bitsPerSample,
    georeferenced: s.georeferenced,
    epsg: s.epsg,
    crs_name: s.crsName,
    units: s.georeferenced ? crsUnits(s.epsg) : 'pixel',
    pixel_size: s.pixelSize,
    origin: s.origin,
    extent: s.extent,
    tiled: s.tiled,
    tile_size: s.tileSize,
    block_size: [s.levels[0].blockWidth, s.levels[0].blockHeight],
    interleave: s.planar === 2 || s.bands === 1 ? 'band' : 'pixel',
    compression: s.compression,
    predictor: s.predictor,
    overviews: s.overviews,
    overview_sizes: overviewLevels.map((l) => [l.width, l.height]),
    nodata: s.nodata !== null && Number.isNaN(s.nodata) ? 'nan' : s.nodata,
    band_names: s.bandNames,
    band_wavelengths_nm: s.bandWavelengthsNm,
    byte_order: s.littleEndian ? 'little-endian' : 'big-endian',
    bigtiff: s.bigTiff,
    decodable: s.decodable,
    checked_blocks: checkedBlocks,
    warnings: s.warnings,
  };
}

export function infoText(s: TiffSummary): string {
  const unit = s.georeferenced ? units[crsUnits(s.epsg)] : 'px';
  const crs = s.epsg !== null ? `EPSG:${s.epsg}${s.crsName ? `, ${s.crsName}` : ''}` : s.crsName ? `${s.crsName} (no EPSG code)` : 'none';
  const rows: [string, string][] = [
    ['size', `${size(s.width, s.height)} pixels, ${s.bands} band${s.bands === 1 ? '' : 's'}, ${s.dtype}`],
    ['CRS', s.georeferenced ? crs : `${crs}; no georeferencing, pixel space`],
    ['pixel size', `${num(s.pixelSize[0])} x ${num(s.pixelSize[1])} ${unit}`],
    ['origin', `${num(s.origin[0])}, ${num(s.origin[1])} (top-left corner)`],
    ['extent', `${num(s.extent[0])}, ${num(s.extent[1])} to ${num(s.extent[2])}, ${num(s.extent[3])} (min x, min y to max x, max y)`],
    [
      'layout',
      `${s.tileSize ? `tiles of ${size(...s.tileSize)}` : `strips of ${s.levels[0].blockHeight} rows`}` +
        `${s.bands > 1 ? (s.planar === 2 ? ', band-separate' : ', pixel-interleaved') : ''}`,
    ],
    ['compression', s.compression === 'none' ? 'none' : `${s.compression}, ${predictorNames[s.predictor] ?? `predictor ${s.predictor}`}`],
    ['overviews', s.overviews === 0 ? 'none' : `${s.overviews}: ${s.levels.slice(1).map((l) => size(l.width, l.height)).join(', ')}`],
    ['no-data', s.nodata === null ? 'none' : num(s.nodata)],
  ];
  if (s.bandNames || s.bandWavelengthsNm) {
    const bands = Array.from({ length: s.bands }, (_, b) => {
      const name = s.bandNames?.[b];
      const nm = s.bandWavelengthsNm?.[b];
      return `${b + 1} ${name ?? '(unnamed)'}${nm !== null && nm !== undefined ? ` (${num(nm)} nm)` : ''}`;
    });
    rows.push(['bands', bands.join('; ')]);
  }
  rows.push(['file', `${bytes(s.fileSize)}, ${s.bigTiff ? 'BigTIFF' : 'classic TIFF'}, ${s.littleEndian ? 'little' : 'big'}-endian`]);
  const width = Math.max(...rows.map(([k]) => k.length));
  return [s.fileName, ...rows.map(([k, v]) => `  ${k.padEnd(width)}  ${v}`)].join('\n');
}

async function run(args: string[], out: VerbOutput): Promise<number> {
  const { values, positionals } = parseVerbArgs('info', args, {
    json: { type: 'boolean' },
    verify: { type: 'boolean' },
    'require-georef': { type: 'boolean' },
    timeout: { type: 'string' },
  });
  if (positionals.length !== 1) {
    throw new InputError(positionals.length === 0 ? 'give one file: fellfield info FILE.tif' : `give one file, not ${positionals.length}`);
  }
  const path = positionals[0];
  const timeout = values.timeout === undefined ? 20 : Number(values.timeout);
  if (!(timeout > 0) || !Number.isFinite(timeout)) throw new InputError(`--timeout must be a positive number of seconds, got '${values.timeout}'`);

  const { summary, checkedBlocks } = await inspectInWorker(path, {
    timeoutMs: timeout * 1000,
    check: values.verify ? 'all' : 'first',
  });
  if (values['require-georef']) {
    if (!summary.georeferenced) throw new InputError(`${path}: no georeferencing (--require-georef)`);
    if (summary.epsg === null) throw new InputError(`${path}: no EPSG code for the CRS (--require-georef)`);
  }
  for (const warning of summary.warnings) out.stderr(`fellfield info: ${path}: warning: ${warning}`);
  out.stdout(values.json ? JSON.stringify(infoJson(summary, checkedBlocks), null, 2) : infoText(summary));
  return 0;
}

export const info: Verb = {
  name: 'info',
  summary: 'describe a GeoTIFF: size, bands, data type, CRS, extent, tiling, compression, overviews',
  usage,
  run,
};
