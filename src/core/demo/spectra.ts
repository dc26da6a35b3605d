import type { DateKey } from './scene.ts';

// Reflectance spectra (0-1) of the demo's materials at the eight band centres
// (425, 480, 545, 605, 660, 725, 830, 950 nm). They are invented but shaped like the
// textbook curves (green peak, red absorption, red-edge rise to a NIR plateau for
// foliage; flat for rock; bright and falling into the NIR for snow; dark for water):
// common practice, values of our own. Conifers are dark and close to one another;
// broadleaf shrubs are brighter in the red edge and NIR and turn (yellow, orange, red)
// by the late date, losing NIR; conifers barely change.

export type Spectrum = readonly number[];

type Seasonal = Record<DateKey, Spectrum>;

/** Species spectra by roster code. */
export const speciesSpectra: Record<string, Seasonal> = {
  ABFI: {
    early: [0.028, 0.032, 0.058, 0.044, 0.031, 0.142, 0.292, 0.300],
    late: [0.028, 0.032, 0.056, 0.044, 0.032, 0.138, 0.284, 0.292],
  },
  PIEX: {
    early: [0.030, 0.034, 0.062, 0.047, 0.034, 0.150, 0.305, 0.312],
    late: [0.030, 0.034, 0.060, 0.047, 0.035, 0.146, 0.296, 0.303],
  },
  PISI: {
    early: [0.027, 0.031, 0.055, 0.042, 0.030, 0.136, 0.278, 0.286],
    late: [0.027, 0.031, 0.054, 0.042, 0.031, 0.133, 0.272, 0.280],
  },
  SAIN: {
    early: [0.034, 0.044, 0.098, 0.070, 0.044, 0.245, 0.448, 0.455],
    late: [0.048, 0.060, 0.138, 0.165, 0.128, 0.242, 0.330, 0.338],
  },
  BEFA: {
    early: [0.031, 0.040, 0.086, 0.060, 0.040, 0.222, 0.402, 0.410],
    late: [0.040, 0.045, 0.082, 0.128, 0.148, 0.215, 0.298, 0.306],
  },
  VAFI: {
    early: [0.030, 0.040, 0.080, 0.058, 0.044, 0.198, 0.342, 0.350],
    late: [0.035, 0.040, 0.050, 0.080, 0.128, 0.168, 0.248, 0.256],
  },
  RHPE: {
    early: [0.029, 0.035, 0.070, 0.050, 0.035, 0.170, 0.330, 0.338],
    late: [0.029, 0.035, 0.068, 0.050, 0.036, 0.166, 0.322, 0.330],
  },
};

/** Dead or badly stressed foliage: brown, flat red edge, low NIR. */
export const brownFoliage: Spectrum = [0.050, 0.058, 0.088, 0.118, 0.138, 0.178, 0.238, 0.258];

/** Background materials. */
export const groundSpectra = {
  tundraGreen: {
    early: [0.038, 0.048, 0.082, 0.078, 0.066, 0.170, 0.262, 0.276],
    late: [0.046, 0.056, 0.088, 0.104, 0.104, 0.168, 0.218, 0.234],
  },
  tundraDry: {
    early: [0.052, 0.062, 0.092, 0.105, 0.108, 0.160, 0.210, 0.228],
    late: [0.056, 0.066, 0.094, 0.115, 0.122, 0.158, 0.196, 0.212],
  },
  rock: {
    early: [0.140, 0.150, 0.168, 0.180, 0.188, 0.198, 0.215, 0.226],
    late: [0.140, 0.150, 0.168, 0.180, 0.188, 0.198, 0.215, 0.226],
  },
  scree: {
    early: [0.172, 0.184, 0.204, 0.216, 0.226, 0.236, 0.252, 0.262],
    late: [0.172, 0.184, 0.204, 0.216, 0.226, 0.236, 0.252, 0.262],
  },
  snow: {
    early: [0.880, 0.885, 0.870, 0.850, 0.820, 0.760, 0.660, 0.420],
    late: [0.800, 0.810, 0.800, 0.780, 0.750, 0.690, 0.590, 0.360],
  },
  water: {
    early: [0.060, 0.055, 0.048, 0.034, 0.024, 0.014, 0.008, 0.005],
    late: [0.060, 0.055, 0.046, 0.032, 0.022, 0.013, 0.007, 0.004],
  },
} satisfies Record<string, Seasonal>;

/** What is left of each band in a cast shadow: diffuse skylight, bluer than direct sun. */
export const shadowTransmission: Spectrum = [0.46, 0.42, 0.34, 0.31, 0.29, 0.27, 0.25, 0.25];
