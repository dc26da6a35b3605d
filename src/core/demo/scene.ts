// Where and when the demo scene is: a fictional alpine basin placed, on purpose, over
// open ocean (WGS 84 / UTM zone 8N, about 40.0 N 135.1 W, far from any coast), so it can
// never be mistaken for a real survey. Everything about the place is invented.

export const BASIN_NAME = 'Quarrow Basin (fictional)';
/** WGS 84 / UTM zone 8N. */
export const DEMO_EPSG = 32608;
export const DEMO_CRS_NAME = 'WGS 84 / UTM zone 8N';
/** Top-left corner of the scene, metres in DEMO_EPSG. */
export const DEMO_ORIGIN: readonly [number, number] = [493000, 4430000];
/** Panchromatic pixel size, metres. */
export const PAN_PIXEL_M = 0.3;
/** Full demo size, panchromatic pixels on a side. */
export const FULL_SIZE = 4096;

export type DateKey = 'early' | 'late';
export const DATE_KEYS: readonly DateKey[] = ['early', 'late'];

export interface SceneDate {
  key: DateKey;
  /** Acquisition date, ISO 8601. */
  date: string;
  /** Sun azimuth, degrees clockwise from north. */
  sunAzimuthDeg: number;
  /** Sun elevation above the horizon, degrees. */
  sunElevationDeg: number;
}

export const SCENE_DATES: Record<DateKey, SceneDate> = {
  early: { key: 'early', date: '2025-07-24', sunAzimuthDeg: 148, sunElevationDeg: 63 },
  late: { key: 'late', date: '2025-09-26', sunAzimuthDeg: 162, sunElevationDeg: 43 },
};

/** The extent and grid of one generated scene. */
export interface SceneGrid {
  /** Panchromatic pixels on a side (a multiple of 4 x 256 keeps tiles whole, not required). */
  size: number;
  /** Multispectral pixels on a side (size / 4). */
  msSize: number;
  originX: number;
  originY: number;
  panPixel: number;
  msPixel: number;
  /** Side of the scene, metres. */
  sideM: number;
}

export function sceneGrid(size: number): SceneGrid {
  if (!Number.isInteger(size) || size < 64 || size % 4 !== 0 || size > 16384) {
    throw new RangeError(`scene size must be a multiple of 4 between 64 and 16384 pixels, got ${size}`);
  }
  return {
    size,
    msSize: size / 4,
    originX: DEMO_ORIGIN[0],
    originY: DEMO_ORIGIN[1],
    panPixel: PAN_PIXEL_M,
    msPixel: PAN_PIXEL_M * 4,
    sideM: size * PAN_PIXEL_M,
  };
}

/** Unit vector (east, north) pointing from the ground towards the sun's azimuth. */
export function sunDirection(date: SceneDate): [number, number] {
  const a = (date.sunAzimuthDeg * Math.PI) / 180;
  return [Math.sin(a), Math.cos(a)];
}
