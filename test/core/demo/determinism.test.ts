import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { demoFiles } from '../../../src/core/demo/files.ts';
import { synthesizeDemo } from '../../../src/core/demo/synthesize.ts';

// Same seed, same bytes; another seed, another scene. Hashes by node:crypto's SHA-256,
// so the manifest's own digests (made with Web Crypto) are checked as well.
// (The full-size run is checked in test/reference/demo-gdal.test.ts.)

async function hashes(seed: number, size: number): Promise<Map<string, string>> {
  const files = await demoFiles(synthesizeDemo({ seed, size }));
  return new Map(files.map((f) => [f.name, createHash('sha256').update(f.bytes).digest('hex')]));
}

describe('demo determinism', () => {
  it('gives byte-identical files for the same seed and different ones for another seed', async () => {
    const first = await hashes(42, 256);
    const again = await hashes(42, 256);
    const other = await hashes(43, 256);
    expect([...first.keys()].sort()).toEqual(['field.geojson', 'manifest.json', 'ms-late.tif', 'ms.tif', 'pan-late.tif', 'pan.tif', 'roster.json', 'truth.json']);
    expect(again).toEqual(first);
    for (const name of ['pan.tif', 'ms.tif', 'pan-late.tif', 'ms-late.tif', 'field.geojson', 'truth.json', 'manifest.json']) {
      expect(other.get(name), name).not.toBe(first.get(name));
    }
    // The roster does not depend on the seed.
    expect(other.get('roster.json')).toBe(first.get('roster.json'));
  }, 120_000);

  it('lists every other file in the manifest with its true SHA-256 and size', async () => {
    const files = await demoFiles(synthesizeDemo({ seed: 7, size: 256 }));
    const manifest = JSON.parse(new TextDecoder().decode(files.find((f) => f.name === 'manifest.json')!.bytes));
    const listed = new Map<string, { sha256: string; bytes: number; role: string }>(manifest.files.map((f: { name: string }) => [f.name, f]));
    for (const file of files.filter((f) => f.name !== 'manifest.json')) {
      const entry = listed.get(file.name);
      expect(entry, file.name).toBeDefined();
      expect(entry!.sha256).toBe(createHash('sha256').update(file.bytes).digest('hex'));
      expect(entry!.bytes).toBe(file.bytes.length);
      expect(entry!.role.length).toBeGreaterThan(3);
    }
    expect(manifest.seed).toBe(7);
    expect(manifest.crs.epsg).toBe(32608);
    expect(manifest.dates.map((d: { date: string }) => d.date)).toEqual(['2025-07-24', '2025-09-26']);
    expect(manifest.bands.map((b: { name: string }) => b.name)).toEqual(['coastal', 'blue', 'green', 'yellow', 'red', 'red edge', 'NIR1', 'NIR2']);
  }, 60_000);

  it('keeps the field survey and offset of a seed whatever the scene size', () => {
    // Named random streams: the offset is drawn from its own stream.
    const small = synthesizeDemo({ seed: 11, size: 128 });
    const larger = synthesizeDemo({ seed: 11, size: 256 });
    expect(larger.truth.offset).toEqual(small.truth.offset);
  }, 60_000);
});
