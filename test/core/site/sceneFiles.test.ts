import { describe, expect, it } from 'vitest';
import { matchSceneFiles } from '../../../src/core/site/sceneFiles.ts';
import type { SceneRef } from '../../../src/core/site/types.ts';

const scenes: SceneRef[] = [
  { id: 'scene-1', date: '2025-07-24', epsg: 32608, files: [{ role: 'pan', name: 'pan.tif', size: 100, sha256: 'a' }, { role: 'ms', name: 'ms.tif', size: 50, sha256: 'b' }] },
  // A second date whose panchromatic file has the same name as the first's, in another folder.
  { id: 'scene-2', date: '2025-09-26', epsg: 32608, files: [{ role: 'pan', name: 'pan.tif', size: 120, sha256: 'c' }, { role: 'ms', name: 'ms-late.tif', size: 60, sha256: 'd' }] },
];

describe('matchSceneFiles', () => {
  it('pairs files by name and size, whatever order they were picked in', () => {
    const picked = [{ name: 'ms-late.tif', size: 60 }, { name: 'pan.tif', size: 120 }, { name: 'ms.tif', size: 50 }, { name: 'pan.tif', size: 100 }];
    const { matches, unused } = matchSceneFiles(scenes, picked);
    expect(matches.map((m) => [m.sceneId, m.file.name, m.picked?.size])).toEqual([
      ['scene-1', 'pan.tif', 100], ['scene-1', 'ms.tif', 50], ['scene-2', 'pan.tif', 120], ['scene-2', 'ms-late.tif', 60],
    ]);
    expect(matches.every((m) => m.problem === null)).toBe(true);
    expect(unused).toEqual([]);
  });

  it('leaves a file missing when it was not picked, and names a namesake of another size', () => {
    const picked = [{ name: 'pan.tif', size: 99 }, { name: 'ms.tif', size: 50 }, { name: 'notes.txt', size: 3 }];
    const { matches, unused } = matchSceneFiles(scenes, picked);
    expect(matches[0].picked).toBeNull();
    expect(matches[0].problem).toBe("pan.tif: is 99 bytes, but the site's pan.tif was 100 bytes; it is another file");
    expect(matches[1].picked).toEqual({ name: 'ms.tif', size: 50 });
    expect(matches[3]).toMatchObject({ picked: null, problem: null });
    expect(unused.map((f) => f.name)).toEqual(['pan.tif', 'notes.txt']);
  });

  it('takes one picked file for one scene file only', () => {
    const { matches } = matchSceneFiles([scenes[0], { ...scenes[0], id: 'copy' }], [{ name: 'pan.tif', size: 100 }]);
    expect(matches.filter((m) => m.picked).length).toBe(1);
  });
});
