import { describe, expect, it } from 'vitest';
import { estimateByArea } from '../../../src/core/offset/areaShifts.ts';
import { defaultSettings, estimateShift } from '../../../src/core/offset/estimateShift.ts';
import { fieldPolygons, syntheticScene } from './synthetic.ts';

// A shift per area: one shift over the scene fits every cell; a scene whose western
// half sits off by another shift does not, and the cells say which shift is where.

const settings = defaultSettings(0.3, 1.2, { replicates: 100 });

describe('estimateByArea', () => {
  const scene = syntheticScene({ seed: 21, size: 200, crowns: 100 });

  it('finds that one shift fits when it does', () => {
    const patches = fieldPolygons(scene, [1, -0.5], 3);
    const common = estimateShift(patches, scene.grid, settings);
    const areas = estimateByArea(patches, scene.grid, settings, common, 2);
    expect(areas.cells).toHaveLength(4);
    expect(areas.cells.reduce((s, c) => s + c.polygons, 0)).toBe(patches.length);
    expect(areas.oneShiftFits).toBe(true);
  });

  it('says one shift does not fit when half the scene is off by another', () => {
    const centreX = scene.grid.originX + (scene.grid.width * scene.grid.pixelX) / 2;
    const east = fieldPolygons(scene, [1, -0.5], 4);
    const west = fieldPolygons(scene, [-0.5, 1.2], 4);
    const patches = east.map((p, i) => (scene.crowns[i].x < centreX ? west[i] : p));
    const common = estimateShift(patches, scene.grid, settings);
    const areas = estimateByArea(patches, scene.grid, settings, common, 2);
    expect(areas.oneShiftFits).toBe(false);
    for (const cell of areas.cells.filter((c) => c.reliable)) {
      const expected = cell.extent[2] <= centreX + 1 ? [-0.5, 1.2] : cell.extent[0] >= centreX - 1 ? [1, -0.5] : null;
      if (!expected) continue;
      expect(Math.hypot(cell.dx! - expected[0], cell.dy! - expected[1])).toBeLessThan(0.15);
    }
  });
});
