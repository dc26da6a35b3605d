import { describe, expect, it } from 'vitest';
import { demoSiteFile, DEMO_FIELD_PASS } from '../../../src/core/export/demoSiteFile.ts';
import { readSiteFile } from '../../../src/core/export/siteFile.ts';
import { demoFiles } from '../../../src/core/demo/files.ts';
import { synthesizeDemo } from '../../../src/core/demo/synthesize.ts';
import { transformer } from '../../../src/core/crs.ts';

// The demo site file built from a small generated demo: its scenes, roster and field
// polygons as the demo's own files state them.

const scene = synthesizeDemo({ seed: 3, size: 256 });
const files = await demoFiles(scene);

describe('the demo site file', () => {
  it('holds the demo\'s scenes by SHA-256, its roster and every field polygon tagged in the field pass', async () => {
    const file = await demoSiteFile(files);
    expect(file.name).toMatch(/site/);
    const { state } = await readSiteFile(new TextDecoder().decode(file.bytes), file.name);
    const manifest = JSON.parse(new TextDecoder().decode(files.find((f) => f.name === 'manifest.json')!.bytes));
    const sceneFiles = [...state.scenes.values()].flatMap((s) => s.files.map((f) => [f.name, f.sha256]));
    expect(sceneFiles.sort()).toEqual(manifest.files.filter((f: { name: string }) => f.name.endsWith('.tif')).map((f: { name: string; sha256: string }) => [f.name, f.sha256]).sort());
    expect(state.roster.map((e) => e.code)).toEqual(JSON.parse(new TextDecoder().decode(files.find((f) => f.name === 'roster.json')!.bytes)).species.map((s: { code: string }) => s.code));
    expect(state.patches.size).toBe(scene.field.features.length);
    const back = transformer(state.site!.epsg, 4326);
    for (const feature of scene.field.features) {
      const patch = state.patches.get(feature.properties.id)!;
      expect(state.tags.get(`${patch.id}|${DEMO_FIELD_PASS}`)?.species).toBe(feature.properties.species);
      const [lon, lat] = back(patch.geometry[0][0][0]);
      expect(lon).toBeCloseTo(feature.geometry.coordinates[0][0][0], 7);
      expect(lat).toBeCloseTo(feature.geometry.coordinates[0][0][1], 7);
    }
    expect(state.passes.get(DEMO_FIELD_PASS)?.endedAt).not.toBeNull();
  });

  it('is the same bytes for the same demo', async () => {
    const [a, b] = [await demoSiteFile(files), await demoSiteFile(files)];
    expect(Buffer.from(a.bytes).equals(Buffer.from(b.bytes))).toBe(true);
  });
});
