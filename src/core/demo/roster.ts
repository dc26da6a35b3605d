// The demo roster: invented treeline species for the fictional demo basin. Names are
// made up for the demo and stand for no real survey. Default colours are taken from the
// colour-blind-safe palette of Okabe & Ito (2008), "Color Universal Design".

export type SpeciesGroup = 'conifer' | 'broadleaf shrub' | 'other';

export interface RosterSpecies {
  /** Short code a field crew writes down. */
  code: string;
  scientificName: string;
  commonName: string;
  group: SpeciesGroup;
  /** Default display colour, #rrggbb. */
  colour: string;
  /** Keyboard key that tags a patch with this species. */
  key: string;
}

/** Okabe & Ito (2008) palette, by its published colour names. */
export const okabeIto = {
  black: '#000000',
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
} as const;

export const demoRoster: readonly RosterSpecies[] = [
  { code: 'ABFI', scientificName: 'Abies fictiva', commonName: 'ridge fir', group: 'conifer', colour: okabeIto.bluishGreen, key: '1' },
  { code: 'PIEX', scientificName: 'Pinus exemplaris', commonName: 'pale-bark pine', group: 'conifer', colour: okabeIto.blue, key: '2' },
  { code: 'PISI', scientificName: 'Picea simulata', commonName: 'basin spruce', group: 'conifer', colour: okabeIto.skyBlue, key: '3' },
  { code: 'SAIN', scientificName: 'Salix inventa', commonName: 'brook willow', group: 'broadleaf shrub', colour: okabeIto.yellow, key: '4' },
  { code: 'BEFA', scientificName: 'Betula fabulosa', commonName: 'crag birch', group: 'broadleaf shrub', colour: okabeIto.orange, key: '5' },
  { code: 'VAFI', scientificName: 'Vaccinium ficticium', commonName: 'scree bilberry', group: 'broadleaf shrub', colour: okabeIto.vermillion, key: '6' },
  { code: 'RHPE', scientificName: 'Rhododendron perrarum', commonName: 'hidden rosebay', group: 'other', colour: okabeIto.reddishPurple, key: '7' },
];

/** Looks a species up by code; throws on an unknown code. */
export function speciesByCode(code: string): RosterSpecies {
  const found = demoRoster.find((s) => s.code === code);
  if (!found) throw new RangeError(`unknown demo species code '${code}'`);
  return found;
}
