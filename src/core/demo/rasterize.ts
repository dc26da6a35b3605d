import { crownContains, crownMaxRadius, type Crown } from './crowns.ts';
import { speciesByCode } from './roster.ts';
import { sunDirection, type SceneDate, type SceneGrid } from './scene.ts';

// Crowns burnt into panchromatic-resolution masks: which crown each pixel sees (the
// taller one where crowns overlap) and which ground pixels lie in a cast shadow.
// A pixel belongs to a crown when its centre lies inside the crown's outline curve.

/** Scene CRS position of a panchromatic pixel's centre. */
export function panPixelCentre(grid: SceneGrid, px: number, py: number): [number, number] {
  return [grid.originX + (px + 0.5) * grid.panPixel, grid.originY - (py + 0.5) * grid.panPixel];
}

/** Pixel-index bounds (inclusive) of a disc, clipped to the scene. */
function pixelBounds(grid: SceneGrid, x0: number, y0: number, x1: number, y1: number) {
  const clamp = (v: number) => Math.min(grid.size - 1, Math.max(0, v));
  return {
    left: clamp(Math.floor((x0 - grid.originX) / grid.panPixel)),
    right: clamp(Math.ceil((x1 - grid.originX) / grid.panPixel)),
    top: clamp(Math.floor((grid.originY - y1) / grid.panPixel)),
    bottom: clamp(Math.ceil((grid.originY - y0) / grid.panPixel)),
  };
}

/** Crown index + 1 for every panchromatic pixel (0 for ground); taller crowns on top. */
export function crownOwnership(grid: SceneGrid, crowns: readonly Crown[]): Int32Array {
  const owner = new Int32Array(grid.size * grid.size);
  const byHeight = [...crowns].sort((a, b) => a.height - b.height || a.index - b.index);
  for (const crown of byHeight) {
    const r = crownMaxRadius(crown);
    const box = pixelBounds(grid, crown.cx - r, crown.cy - r, crown.cx + r, crown.cy + r);
    for (let py = box.top; py <= box.bottom; py++) {
      for (let px = box.left; px <= box.right; px++) {
        const [x, y] = panPixelCentre(grid, px, py);
        if (crownContains(crown, x, y)) owner[py * grid.size + px] = crown.index + 1;
      }
    }
  }
  return owner;
}

/** Length of a crown's shadow on flat ground, metres. */
export function shadowLength(crown: Crown, date: SceneDate): number {
  return crown.height / Math.tan((date.sunElevationDeg * Math.PI) / 180);
}

/** 1 where a crown's cast shadow falls, else 0. Shadows are cast away from the sun as a
 * tapered band from the crown to the projected top (narrow for conifers, broad for
 * shrubs), never reaching the sunward side; the renderer darkens only ground pixels with them, never crowns. */
export function shadowMask(grid: SceneGrid, crowns: readonly Crown[], date: SceneDate): Uint8Array {
  const mask = new Uint8Array(grid.size * grid.size);
  const [sx, sy] = sunDirection(date);
  const dx = -sx;
  const dy = -sy;
  for (const crown of crowns) {
    const length = shadowLength(crown, date);
    // Starting from the crown's smallest radius keeps the sunward ground out of shadow.
    const base = crown.radius * (1 - crown.wobble.reduce((sum, w) => sum + w.amplitude, 0));
    const tip = crown.radius * (speciesByCode(crown.species).group === 'conifer' ? 0.15 : 0.7);
    const ex = crown.cx + dx * length;
    const ey = crown.cy + dy * length;
    const box = pixelBounds(
      grid,
      Math.min(crown.cx - base, ex - tip), Math.min(crown.cy - base, ey - tip),
      Math.max(crown.cx + base, ex + tip), Math.max(crown.cy + base, ey + tip),
    );
    for (let py = box.top; py <= box.bottom; py++) {
      for (let px = box.left; px <= box.right; px++) {
        const [x, y] = panPixelCentre(grid, px, py);
        const along = ((x - crown.cx) * dx + (y - crown.cy) * dy) / length;
        const t = Math.min(1, Math.max(0, along));
        const radius = base + (tip - base) * t;
        if (Math.hypot(x - crown.cx - t * length * dx, y - crown.cy - t * length * dy) <= radius) {
          mask[py * grid.size + px] = 1;
        }
      }
    }
  }
  return mask;
}
