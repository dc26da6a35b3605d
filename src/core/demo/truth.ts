import type { Position } from '../geometry/types.ts';
import { PAN_PER_MS } from './bands.ts';
import { CROWN_VARIATION, crownOutline, crownSpectrum, type Crown } from './crowns.ts';
import { GPS_NOISE_SD_M, type FieldSurvey } from './field.ts';
import type { PurityCounts } from './purity.ts';
import { ILLUMINATION, MS_NOISE_DN, PAN_NOISE_DN } from './render.ts';
import { BASIN_NAME, DEMO_CRS_NAME, DEMO_EPSG, type SceneGrid } from './scene.ts';

// The truth file: what the generator knows and tests check against. Positions are in
// the scene CRS (metres); spectra are digital numbers under unit illumination.

export interface TruthCrown {
  id: string;
  species: string;
  condition: Crown['condition'];
  centre: Position;
  radius: number;
  height: number;
  /** Closed counterclockwise ring sampled from the outline curve (32 vertices). */
  outline: Position[];
  spectrum: { early: number[]; late: number[] };
  /** Multispectral pixels whose sixteen panchromatic sub-pixels all show this crown. */
  purePixels: number;
  /** The field polygon walked around this crown, or null. */
  fieldId: string | null;
}

export interface Truth {
  kind: 'fellfield demo truth';
  version: 1;
  seed: number;
  basin: string;
  crs: { epsg: number; name: string };
  grid: { panSize: number; msSize: number; origin: Position; panPixel: number; msPixel: number };
  /** Add (dx, dy) to field polygon coordinates (scene CRS) to put them on the imagery. */
  offset: { dx: number; dy: number; units: 'm' };
  gpsNoiseSd: number;
  variation: {
    crownBrightness: readonly number[];
    bandJitter: number;
    stressedBrowning: readonly number[];
    brownBrowning: readonly number[];
    illumination: readonly number[];
    msNoiseDn: number;
    panNoiseDn: number;
  };
  purity: {
    guarantee: string;
    purePixels: number;
    pixelsTouchingCrowns: number;
    share: number;
    crownsWithPurePixels: number;
  };
  crowns: TruthCrown[];
  field: { id: string; crownId: string; species: string }[];
}

const round = (value: number, decimals: number) => Number(value.toFixed(decimals));
const roundPosition = ([x, y]: Position): Position => [round(x, 3), round(y, 3)];

export const PURITY_GUARANTEE =
  `Each multispectral value is the mean of the ${PAN_PER_MS} x ${PAN_PER_MS} panchromatic-resolution sub-pixels it covers. ` +
  'A multispectral pixel whose sub-pixel centres all lie in one crown (and in no taller crown) is pure: for every band b, ' +
  `|DN_b - F * spectrum_b| <= ${MS_NOISE_DN} + 0.5 with one illumination factor F in [${ILLUMINATION.range.join(', ')}] ` +
  'shared by all bands, where spectrum is the crown\'s spectrum for that date. Crowns cast shadows on the ground only, never on crowns.';

export function buildTruth(
  seed: number,
  grid: SceneGrid,
  crowns: readonly Crown[],
  survey: FieldSurvey,
  purity: PurityCounts,
): Truth {
  const fieldByCrown = new Map(survey.polygons.map((p) => [p.crownId, p.id]));
  let crownsWithPure = 0;
  for (const count of purity.pureByCrown) if (count > 0) crownsWithPure++;
  return {
    kind: 'fellfield demo truth',
    version: 1,
    seed,
    basin: BASIN_NAME,
    crs: { epsg: DEMO_EPSG, name: DEMO_CRS_NAME },
    grid: { panSize: grid.size, msSize: grid.msSize, origin: [grid.originX, grid.originY], panPixel: grid.panPixel, msPixel: grid.msPixel },
    offset: { dx: round(-survey.shift[0], 4), dy: round(-survey.shift[1], 4), units: 'm' },
    gpsNoiseSd: GPS_NOISE_SD_M,
    variation: {
      crownBrightness: CROWN_VARIATION.brightness,
      bandJitter: CROWN_VARIATION.bandJitter,
      stressedBrowning: CROWN_VARIATION.stressedBrowning,
      brownBrowning: CROWN_VARIATION.brownBrowning,
      illumination: ILLUMINATION.range,
      msNoiseDn: MS_NOISE_DN,
      panNoiseDn: PAN_NOISE_DN,
    },
    purity: {
      guarantee: PURITY_GUARANTEE,
      purePixels: purity.pure,
      pixelsTouchingCrowns: purity.touched,
      share: purity.touched ? round(purity.pure / purity.touched, 4) : 0,
      crownsWithPurePixels: crownsWithPure,
    },
    crowns: crowns.map((c) => ({
      id: c.id,
      species: c.species,
      condition: c.condition,
      centre: roundPosition([c.cx, c.cy]),
      radius: round(c.radius, 3),
      height: round(c.height, 2),
      outline: crownOutline(c).map(roundPosition),
      spectrum: {
        early: crownSpectrum(c, 'early').map((v) => round(v, 2)),
        late: crownSpectrum(c, 'late').map((v) => round(v, 2)),
      },
      purePixels: purity.pureByCrown[c.index],
      fieldId: fieldByCrown.get(c.id) ?? null,
    })),
    field: survey.polygons.map((p) => ({ id: p.id, crownId: p.crownId, species: p.species })),
  };
}
