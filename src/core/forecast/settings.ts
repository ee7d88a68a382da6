/**
 * Forecast settings with their defaults (docs/forecast.md lists and justifies each). The plan's `forecast`
 * section (plan/forecastSection.ts) overrides any of them. Units as in the section: km/s, Re, degrees East of
 * North, magnitudes in the catalog's band, Mpc, hours.
 */
import type { ForecastSection } from '../plan/forecastSection';
import type { GalaxyModel } from '../plan/schema';

export interface KinematicModel {
  sigmaKms: number;
  sigmaSlope: number;
  rotationKms: number;
  kinematicPaDeg: number;
  starlightRotationKms: number;
  tracerDensitySlope: number;
}

export interface VelocityErrorSettings {
  minSnPerA: number;
  noiseFactor: number;
  floorKms: number;
  intrinsicLineSigmaA: number;
  equivalentWidthsA: number[];
}

export interface ContaminationSettings {
  fractionAtPivot: number;
  pivotRe: number;
  turnoverAbsMag: number;
  luminositySigmaMag: number;
  countSlope: number;
  colourMean: number | null;
  colourSigma: number | null;
}

export interface ForecastSettings {
  kinematics: KinematicModel;
  velocityErrors: VelocityErrorSettings;
  contamination: ContaminationSettings;
  mass: { potentialSlope: number; anisotropy: number };
  distanceMpc: number;
  distanceErrorMpc: number;
  radialBinsRe: number[];
  minPerBin: number;
  starlightBinsRe: number[];
  starlightSectors: number;
  completeness: number;
  overheadHoursPerMask: number;
  semesterFrom: string | null;
  semesterTo: string | null;
}

/** Equivalent widths (Angstrom) of the three calcium-triplet lines used by the photon-noise check in references. */
export const CALCIUM_TRIPLET_EW_A = [1.2, 3.5, 2.8];

/** Defaults (docs/forecast.md "Assumptions"): a massive early-type halo seen in the calcium triplet. */
export const FORECAST_DEFAULTS = {
  sigmaKms: 200,
  sigmaSlope: -0.1,
  rotationKms: 50,
  starlightRotationKms: 60,
  tracerDensitySlope: 3.5,
  minSnPerA: 5,
  noiseFactor: 1,
  floorKms: 5,
  intrinsicLineSigmaA: 1.5,
  fractionAtPivot: 0.2,
  pivotRe: 5,
  turnoverAbsMag: -8.4,
  luminositySigmaMag: 1.3,
  countSlope: 0.3,
  potentialSlope: 0,
  anisotropy: 0,
  radialBinsRe: [0, 1, 2, 3, 5, 7, 10, 15, 20, 30, 50],
  minPerBin: 10,
  starlightBinsRe: [0, 0.5, 1, 2, 3],
  starlightSectors: 8,
  completeness: 0.75,
  overheadHoursPerMask: 0.5,
};

/** The settings of a plan: its `forecast` section over the defaults; the kinematic PA defaults to the galaxy's PA. */
export function resolveForecastSettings(section: ForecastSection | undefined, galaxy: GalaxyModel, linesA: readonly number[]): ForecastSettings {
  const s = section ?? {};
  const k = s.kinematics ?? {}, e = s.velocityErrors ?? {}, c = s.contamination ?? {}, m = s.mass ?? {};
  const d = FORECAST_DEFAULTS;
  const ews = e.equivalentWidthsA ?? (linesA.length === 3 ? CALCIUM_TRIPLET_EW_A : linesA.map(() => 2.5));
  return {
    kinematics: {
      sigmaKms: k.sigmaKms ?? d.sigmaKms, sigmaSlope: k.sigmaSlope ?? d.sigmaSlope, rotationKms: k.rotationKms ?? d.rotationKms,
      kinematicPaDeg: (((k.kinematicPaDeg ?? galaxy.paDeg) % 360) + 360) % 360,
      starlightRotationKms: k.starlightRotationKms ?? d.starlightRotationKms, tracerDensitySlope: k.tracerDensitySlope ?? d.tracerDensitySlope,
    },
    velocityErrors: {
      minSnPerA: e.minSnPerA ?? d.minSnPerA, noiseFactor: e.noiseFactor ?? d.noiseFactor, floorKms: e.floorKms ?? d.floorKms,
      intrinsicLineSigmaA: e.intrinsicLineSigmaA ?? d.intrinsicLineSigmaA, equivalentWidthsA: ews,
    },
    contamination: {
      fractionAtPivot: c.fractionAtPivot ?? d.fractionAtPivot, pivotRe: c.pivotRe ?? d.pivotRe, turnoverAbsMag: c.turnoverAbsMag ?? d.turnoverAbsMag,
      luminositySigmaMag: c.luminositySigmaMag ?? d.luminositySigmaMag, countSlope: c.countSlope ?? d.countSlope,
      colourMean: c.colourMean ?? null, colourSigma: c.colourSigma ?? null,
    },
    mass: { potentialSlope: m.potentialSlope ?? d.potentialSlope, anisotropy: m.anisotropy ?? d.anisotropy },
    distanceMpc: s.distanceMpc ?? galaxy.distanceMpc,
    distanceErrorMpc: s.distanceErrorMpc ?? 0,
    radialBinsRe: s.radialBinsRe ?? d.radialBinsRe,
    minPerBin: s.minPerBin ?? d.minPerBin,
    starlightBinsRe: s.starlightBinsRe ?? d.starlightBinsRe,
    starlightSectors: s.starlightSectors ?? d.starlightSectors,
    completeness: s.completeness ?? d.completeness,
    overheadHoursPerMask: s.overheadHoursPerMask ?? d.overheadHoursPerMask,
    semesterFrom: s.semesterFrom ?? null,
    semesterTo: s.semesterTo ?? null,
  };
}
