import { Random } from '../random.ts';
import { crownOwnership, shadowMask } from './rasterize.ts';
import { placeCrowns, type Crown } from './crowns.ts';
import { fieldGeoJson, walkCrowns, type FieldCollection, type FieldSurvey } from './field.ts';
import { purityCounts, type PurityCounts } from './purity.ts';
import { renderDate, type RenderedDate } from './render.ts';
import { DATE_KEYS, FULL_SIZE, SCENE_DATES, sceneGrid, type DateKey, type SceneGrid } from './scene.ts';
import { buildTerrain, type Terrain } from './terrain.ts';
import { buildTruth, type Truth } from './truth.ts';

// The whole demo scene, in memory: terrain, crowns, the two dates' images, the field
// survey and the truth. Every random choice comes from a named stream of one seed, so
// the same seed gives the same scene, bit for bit.

export interface DemoOptions {
  seed: number;
  /** Panchromatic pixels on a side (default 4096); smaller sizes make the same basin in miniature. */
  size?: number;
  /** Progress lines for the user. */
  onProgress?: (line: string) => void;
  /** Dates to render (default both); the rest of the scene is the same whatever is chosen,
   * so two workers can each render one date of the same scene. */
  dates?: readonly DateKey[];
  /** The field crew's systematic shift, metres east and north, instead of a drawn one
   * (the truth's offset is then its negative). */
  fieldShift?: readonly [number, number];
}

export interface DemoScene {
  seed: number;
  grid: SceneGrid;
  terrain: Terrain;
  crowns: Crown[];
  /** Crown index + 1 per panchromatic pixel, 0 for ground. */
  owner: Int32Array;
  purity: PurityCounts;
  survey: FieldSurvey;
  field: FieldCollection;
  truth: Truth;
  /** Rendered images of the dates asked for. */
  images: Partial<Record<DateKey, RenderedDate>>;
}

export const RARE_SPECIES = 'RHPE';

export function synthesizeDemo(options: DemoOptions): DemoScene {
  const { seed } = options;
  const say = options.onProgress ?? (() => {});
  const grid = sceneGrid(options.size ?? FULL_SIZE);
  const root = new Random(seed);

  say(`terrain: ${grid.sideM.toFixed(1)} m square, ${grid.size} px at ${grid.panPixel} m`);
  const terrain = buildTerrain(grid, root.fork('terrain').uint32());
  const crowns = placeCrowns(grid, terrain, root.fork('crowns'));
  say(`crowns: ${crowns.length} placed`);
  const owner = crownOwnership(grid, crowns);
  const purity = purityCounts(grid, owner, crowns.length);
  say(`pure multispectral pixels: ${purity.pure} of ${purity.touched} touching crowns`);

  const survey = walkCrowns(crowns, visibleShares(grid, crowns, owner), RARE_SPECIES, root.fork('field'), options.fieldShift);
  say(`field polygons: ${survey.polygons.length} walked`);

  const renderSeed = root.fork('render').uint32();
  const images: Partial<Record<DateKey, RenderedDate>> = {};
  for (const key of DATE_KEYS.filter((k) => !options.dates || options.dates.includes(k))) {
    const date = SCENE_DATES[key];
    const shadow = shadowMask(grid, crowns, date);
    let reported = 0;
    images[key] = renderDate({
      grid, terrain, crowns, owner, shadow, date, seed: renderSeed,
      onProgress: (done) => {
        const percent = Math.floor(done * 4) * 25;
        if (percent > reported) {
          reported = percent;
          say(`rendering ${key} (${date.date}): ${percent}%`);
        }
      },
    });
  }
  const truth = buildTruth(seed, grid, crowns, survey, purity);
  return { seed, grid, terrain, crowns, owner, purity, survey, field: fieldGeoJson(survey), truth, images };
}

/** Share of each crown's outline area that is seen (not under a taller crown). */
function visibleShares(grid: SceneGrid, crowns: readonly Crown[], owner: Int32Array): Float64Array {
  const seen = new Float64Array(crowns.length);
  for (let i = 0; i < owner.length; i++) if (owner[i] > 0) seen[owner[i] - 1]++;
  const pixelArea = grid.panPixel * grid.panPixel;
  for (const c of crowns) {
    // Area inside r(theta) = r0 (1 + sum a_k cos(k theta + phi_k)): pi r0^2 (1 + sum a_k^2 / 2).
    const area = Math.PI * c.radius ** 2 * (1 + c.wobble.reduce((s, w) => s + (w.amplitude ** 2) / 2, 0));
    seen[c.index] = (seen[c.index] * pixelArea) / area;
  }
  return seen;
}
