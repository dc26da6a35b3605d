import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { NoDataMask, readMasksFor } from '../../src/core/checks/noDataMask.ts';
import { runChecks } from '../../src/core/checks/runChecks.ts';
import { readLabelFile } from '../../src/core/geojson/labelFile.ts';
import { gridOfSummary } from '../../src/core/geometry/rasterGrid.ts';
import { extentOfRings, multiPolygonArea } from '../../src/core/geometry/measure.ts';
import { inspectTiff } from '../../src/core/tiff/inspectTiff.ts';
import { openFileRange } from '../../src/cli/readFileRange.ts';
import { main } from '../../src/cli/main.ts';

// Patches over no-data pixels against an outside computation. The scene is a two-band
// GeoTIFF written by GDAL 3.6.2 (Debian gdal-bin, fixtures/nodata/make.sh, version in
// VERSION.txt) with GDAL_NODATA 0: a north-west collar with no data in both bands and a
// block where band 2 alone has none. The expected areas and shares come from
// fixtures/nodata/make_expected.py: the source grids read with numpy 1.24 and each
// patch intersected with the union of the no-data pixel squares by Shapely 1.8.5 / GEOS
// (Debian python3-shapely). Tolerance: 1e-9 relative plus 1e-9 m² absolute; findings
// carry shares rounded to 4 digits and areas to 0.001 m².

const here = join(dirname(fileURLToPath(import.meta.url)), 'fixtures/nodata');
const tif = join(here, 'nodata-ms.tif');
const expected = JSON.parse(readFileSync(join(here, 'expected.json'), 'utf8')) as {
  patches: { id: string; area_m2: number; nodata_m2: number; share: number }[];
};
const labels = readLabelFile(readFileSync(join(here, 'patches.geojson'), 'utf8'), 'patches.geojson');

const opened: { close(): Promise<void> }[] = [];
afterAll(async () => {
  for (const file of opened) await file.close();
});

/** The fixture raster with a reader that counts the bytes asked for. */
async function scene() {
  const file = await openFileRange(tif);
  opened.push(file);
  const summary = await inspectTiff(file.read, file.size, 'nodata-ms.tif');
  const reads: [number, number][] = [];
  const read = (offset: number, length: number) => {
    reads.push([offset, length]);
    return file.read(offset, length);
  };
  return { summary, read, reads };
}

describe('patches over no-data pixels, against numpy and Shapely', () => {
  it('the fixture has patches wholly, partly and not at all over no-data, and both kinds of no-data', () => {
    expect(expected.patches.filter((p) => p.share > 0.999).length).toBe(2);
    expect(expected.patches.filter((p) => p.share > 0.01 && p.share < 0.99).length).toBe(3);
    expect(expected.patches.filter((p) => p.share === 0).length).toBe(2);
  });

  it('measures the area of each patch over no-data pixels as Shapely does', async () => {
    const { summary, read } = await scene();
    expect(summary.nodata).toBe(0);
    const mask = NoDataMask.of(summary)!;
    const extents = labels.patches.map((p) => extentOfRings(p.rings));
    await readMasksFor([{ mask, read }], extents);
    for (const patch of labels.patches) {
      const reference = expected.patches.find((p) => p.id === patch.id)!;
      const area = multiPolygonArea(patch.rings);
      expect(Math.abs(area - reference.area_m2)).toBeLessThanOrEqual(1e-9 * reference.area_m2 + 1e-9);
      const cover = mask.cover(patch.rings, extentOfRings(patch.rings), area);
      const measured = cover?.areaM2 ?? 0;
      expect(Math.abs(measured - reference.nodata_m2), String(patch.id)).toBeLessThanOrEqual(1e-9 * reference.area_m2 + 1e-9);
    }
  });

  it('reports them as off-image findings with their share, and reads only the blocks under the patches', async () => {
    const { summary, read, reads } = await scene();
    const mask = NoDataMask.of(summary)!;
    await readMasksFor([{ mask, read }], labels.patches.map((p) => extentOfRings(p.rings)));
    // 3 x 3 tiles of 16 x 16; the patches lie over some of them only.
    const level = summary.levels[0];
    const under = new Set<number>();
    for (const p of labels.patches) {
      const [x0, y0, x1, y1] = extentOfRings(p.rings);
      for (const [x, y] of [[x0, y0], [x1, y0], [x0, y1], [x1, y1]]) {
        under.add(Math.floor((summary.origin[1] - y) / summary.pixelSize[1] / 16) * 3 + Math.floor((x - summary.origin[0]) / summary.pixelSize[0] / 16));
      }
    }
    expect(mask.blocksRead).toBe(under.size);
    expect(under.size).toBeLessThan(level.blocksAcross * level.blocksDown);
    const blockBytes = new Set(Array.from(level.offsets, (offset, i) => `${offset}:${level.byteCounts[i]}`));
    for (const [offset, length] of reads) expect(blockBytes.has(`${offset}:${length}`)).toBe(true);

    const grid = gridOfSummary(summary);
    const report = runChecks(labels.patches, { scene: { pan: grid, ms: grid, noData: [mask] } });
    for (const reference of expected.patches) {
      const finding = report.findings.find((f) => f.kind === 'off-image' && f.patches[0] === reference.id);
      if (reference.share === 0) {
        expect(finding, reference.id).toBeUndefined();
        continue;
      }
      expect(finding, reference.id).toBeDefined();
      expect(Math.abs(finding!.shares![0] - reference.share)).toBeLessThanOrEqual(5e-5);
      expect(Math.abs(finding!.area_m2! - reference.nodata_m2)).toBeLessThanOrEqual(0.0005 + 1e-9);
      expect(finding!.message).toContain(reference.share > 0.999 ? 'wholly over no-data' : 'partly over no-data');
    }
  });

  it('fellfield check --scene reports the same, and --nodata names another value', async () => {
    let stdout = '';
    const io = { stdout: (t: string) => { stdout += t; }, stderr: () => {} };
    expect(await main(['check', join(here, 'patches.geojson'), '--scene', tif, '--json'], io)).toBe(0);
    const offImage = (JSON.parse(stdout).findings as { kind: string; patches: string[]; shares: number[] }[]).filter((f) => f.kind === 'off-image');
    expect(offImage.map((f) => f.patches[0]).sort()).toEqual(expected.patches.filter((p) => p.share > 0).map((p) => p.id).sort());
    // A value no pixel holds: nothing is over no-data.
    stdout = '';
    expect(await main(['check', join(here, 'patches.geojson'), '--scene', tif, '--json', '--nodata', '65535', '--fail-on', 'off-image'], io)).toBe(0);
    expect(JSON.parse(stdout).counts['off-image']).toBe(0);
  }, 60_000);
});
