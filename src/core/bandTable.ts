// Band tables: the name and centre wavelength of each band of a multiband raster.
// Presets follow the common 4-band (blue, green, red, near-infrared) and 8-band
// (coastal to NIR2) layouts of very-high-resolution sensors; wavelengths are typical
// centres, rounded (common practice; they vary a few nm between sensors).

export interface BandEntry {
  /** 1-based band number in the file. */
  index: number;
  name: string;
  /** Centre wavelength in nanometres, when known. */
  centre_nm: number | null;
}

const presets: Record<number, [string, number][]> = {
  3: [['red', 660], ['green', 545], ['blue', 480]],
  4: [['blue', 480], ['green', 545], ['red', 660], ['NIR', 830]],
  8: [['coastal', 425], ['blue', 480], ['green', 545], ['yellow', 605], ['red', 660], ['red edge', 725], ['NIR1', 830], ['NIR2', 950]],
};

/** The preset for a band count, or null when there is none. */
export function presetBandTable(bandCount: number): BandEntry[] | null {
  const preset = presets[bandCount];
  return preset ? preset.map(([name, centre], i) => ({ index: i + 1, name, centre_nm: centre })) : null;
}

/**
 * The band table of a raster: names and wavelengths from the file where it has them,
 * else the preset for its band count, else plain numbers.
 */
export function bandTableFor(bandCount: number, names: (string | null)[] | null, wavelengths: (number | null)[] | null): BandEntry[] {
  const named = names?.length === bandCount && names.every((n) => n && n.trim());
  const fitting = wavelengths?.length === bandCount ? wavelengths : null;
  if (named) {
    return names!.map((name, i) => ({ index: i + 1, name: name!.trim(), centre_nm: fitting?.[i] ?? null }));
  }
  return presetBandTable(bandCount) ?? Array.from({ length: bandCount }, (_, i) => ({ index: i + 1, name: `band ${i + 1}`, centre_nm: fitting?.[i] ?? null }));
}

/**
 * Why the band names (and wavelengths) in a file's metadata cannot be the band table of
 * a raster with `bandCount` bands, or null when they can (or when there are none).
 */
export function bandTableProblem(bandCount: number, names: (string | null)[] | null, wavelengths: (number | null)[] | null): string | null {
  if (names && names.some((n) => n && n.trim()) && names.length !== bandCount) {
    return `its metadata names ${names.length} bands but the raster has ${bandCount}, so ${presetBandTable(bandCount) ? `the ${bandCount}-band preset is` : 'band numbers are'} used instead`;
  }
  if (wavelengths && wavelengths.some((w) => w !== null) && wavelengths.length !== bandCount) {
    return `its metadata gives ${wavelengths.length} wavelengths for ${bandCount} bands; they are left out`;
  }
  return null;
}
