// The demo scene's band table and radiometry. Centre wavelengths are round figures of
// our own for an eight-band very-high-resolution sensor (coastal to second NIR); the
// panchromatic band is modelled as a weighted sum of the bands it spans, so the pan
// image and the multispectral image tell the same story (pan-sharpening looks right).

export interface BandInfo {
  name: string;
  /** Centre wavelength, nm. */
  centreNm: number;
}

export const demoBands: readonly BandInfo[] = [
  { name: 'coastal', centreNm: 425 },
  { name: 'blue', centreNm: 480 },
  { name: 'green', centreNm: 545 },
  { name: 'yellow', centreNm: 605 },
  { name: 'red', centreNm: 660 },
  { name: 'red edge', centreNm: 725 },
  { name: 'NIR1', centreNm: 830 },
  { name: 'NIR2', centreNm: 950 },
];

export const BAND_COUNT = demoBands.length;

/** The panchromatic band's centre and its weights over the eight bands (sum 1): it spans
 * blue to NIR1, roughly 450-800 nm. */
export const panCentreNm = 625;
export const panWeights: readonly number[] = [0, 0.12, 0.2, 0.18, 0.18, 0.16, 0.16, 0];

/** Digital numbers per unit reflectance; 11-bit data saturate at 2047. */
export const DN_PER_REFLECTANCE = 1900;
export const DN_MAX = 2047;

/** The multispectral pixel is this many panchromatic pixels on a side. */
export const PAN_PER_MS = 4;
