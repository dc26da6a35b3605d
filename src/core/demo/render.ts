import { hashUnit } from '../random.ts';
import { BAND_COUNT, DN_MAX, DN_PER_REFLECTANCE, PAN_PER_MS, panWeights } from './bands.ts';
import { crownSpectrum, type Crown } from './crowns.ts';
import { panPixelCentre } from './rasterize.ts';
import { sunDirection, type SceneDate, type SceneGrid } from './scene.ts';
import { groundSpectra, shadowTransmission } from './spectra.ts';
import { groundAt, groundTexture, type Terrain } from './terrain.ts';

// Renders one date of the scene. Everything is first computed at panchromatic
// resolution as eight band values per sub-pixel (in digital numbers, before noise);
// then the panchromatic pixel is the pan-weighted sum of its own sub-pixel, and the
// multispectral pixel is the plain mean of the 4 x 4 sub-pixels it covers. So a
// multispectral value is exactly the area-weighted mix of what the pixel covers, and
// the two images agree. Each sensor then adds its own small bounded noise.

/** Within-crown illumination: the sunward side is brighter, plus foliage grain. */
export const ILLUMINATION = { sunward: 0.15, grain: 0.1, range: [0.75, 1.25] } as const;
/** Sensor noise bounds, digital numbers (triangular, never beyond +-amplitude). */
export const PAN_NOISE_DN = 8;
export const MS_NOISE_DN = 6;

export interface RenderedDate {
  /** Panchromatic image, row-major, size x size. */
  pan: Uint16Array;
  /** Eight multispectral bands, each row-major, msSize x msSize. */
  ms: Uint16Array[];
}

export interface RenderInputs {
  grid: SceneGrid;
  terrain: Terrain;
  crowns: readonly Crown[];
  /** From crownOwnership(). */
  owner: Int32Array;
  /** From shadowMask() for this date. */
  shadow: Uint8Array;
  date: SceneDate;
  seed: number;
  /** Called now and then with the share done (0-1). */
  onProgress?: (done: number) => void;
}

/** Triangular noise in (-amplitude, amplitude), a pure function of its coordinates. */
function sensorNoise(seed: number, x: number, y: number, k: number, amplitude: number): number {
  return (hashUnit(seed, x, y, 2 * k) + hashUnit(seed, x, y, 2 * k + 1) - 1) * amplitude;
}


export function renderDate(inputs: RenderInputs): RenderedDate {
  const { grid, terrain, crowns, owner, shadow, date, seed } = inputs;
  const n = grid.size;
  const m = grid.msSize;
  const pan = new Uint16Array(n * n);
  const ms = Array.from({ length: BAND_COUNT }, () => new Uint16Array(m * m));
  const spectra = crowns.map((c) => Float64Array.from(crownSpectrum(c, date.key)));
  const [sunX, sunY] = sunDirection(date);
  const dateSalt = date.key === 'early' ? 1 : 2;
  const textureSeed = seed + 101;
  const panSeed = seed + 211 * dateSalt;
  const msSeed = seed + 307 * dateSalt;
  const value = new Float64Array(BAND_COUNT);
  const sum = new Float64Array(m * BAND_COUNT);
  const panW = Float64Array.from(panWeights);
  // Module constants copied into locals: the loop below runs once per pixel.
  const bands = BAND_COUNT;
  const sub = PAN_PER_MS;
  const dnMax = DN_MAX;
  const toDn = (v: number) => Math.min(dnMax, Math.max(0, Math.round(v)));
  const gain = DN_PER_REFLECTANCE;
  const transmission = Float64Array.from(shadowTransmission);
  const groundOf = groundAt;
  const textureOf = groundTexture;
  const hash = hashUnit;
  const noise = sensorNoise;
  const tundraGreen = Float64Array.from(groundSpectra.tundraGreen[date.key]);
  const tundraDry = Float64Array.from(groundSpectra.tundraDry[date.key]);
  const groundSpectrum = Object.fromEntries(
    Object.entries(groundSpectra).map(([k, v]) => [k, Float64Array.from(v[date.key])]),
  ) as Record<keyof typeof groundSpectra, Float64Array>;

  for (let my = 0; my < m; my++) {
    sum.fill(0);
    for (let sy = 0; sy < sub; sy++) {
      const py = my * sub + sy;
      for (let px = 0; px < n; px++) {
        const i = py * n + px;
        const o = owner[i];
        if (o > 0) {
          // Crown: its spectrum times the local illumination, the same factor in every band.
          const crown = crowns[o - 1];
          const [x, y] = panPixelCentre(grid, px, py);
          const towardsSun = Math.min(1, Math.max(-1, ((x - crown.cx) * sunX + (y - crown.cy) * sunY) / crown.radius));
          const f = 1 + ILLUMINATION.sunward * towardsSun + ILLUMINATION.grain * (2 * hash(seed + 401, px, py) - 1);
          const s = spectra[o - 1];
          for (let b = 0; b < bands; b++) value[b] = s[b] * f;
        } else {
          const ground = groundOf(terrain, date.key, (px + 0.5) / sub, (py + 0.5) / sub);
          const texture = textureOf(textureSeed, ground.material, px, py) * gain;
          const shade = shadow[i] === 1;
          if (ground.material === 'tundra') {
            const t = ground.dryness;
            for (let b = 0; b < bands; b++) value[b] = ((1 - t) * tundraGreen[b] + t * tundraDry[b]) * texture;
          } else {
            const spectrum = groundSpectrum[ground.material];
            for (let b = 0; b < bands; b++) value[b] = spectrum[b] * texture;
          }
          if (shade) for (let b = 0; b < bands; b++) value[b] *= transmission[b];
        }
        let panValue = 0;
        const base = ((px / sub) | 0) * bands;
        for (let b = 0; b < bands; b++) {
          panValue += panW[b] * value[b];
          sum[base + b] += value[b];
        }
        pan[i] = toDn(panValue + noise(panSeed, px, py, 0, PAN_NOISE_DN));
      }
    }
    const area = sub * sub;
    for (let mx = 0; mx < m; mx++) {
      for (let b = 0; b < bands; b++) {
        ms[b][my * m + mx] = toDn(sum[mx * bands + b] / area + noise(msSeed, mx, my, b, MS_NOISE_DN));
      }
    }
    if (inputs.onProgress && (my % 64 === 63 || my === m - 1)) inputs.onProgress((my + 1) / m);
  }
  return { pan, ms };
}
