/**
 * Monte Carlo calibration of velocity errors from S/N (docs/forecast.md, "Velocity errors"): seeded trials synthesise
 * a line spectrum (spectro/lineSpectrum.ts) at a random velocity and pixel phase, sampled at the detector's dispersion
 * with the line-spread sigma of the profile's resolution, add Gaussian noise of a given S/N per Angstrom, and fit the
 * velocity by a chi-square template fit (spectro/velocityFit.ts). The scatter of fitted minus true velocity is the
 * velocity error; its ratio to the photon-noise bound (forecast/velocityError.ts) is what the committed table holds.
 * Velocities km/s, wavelengths and widths Angstrom, S/N per Angstrom of the continuum.
 */
import { makeRng } from '../numeric/random';
import { lineWindowGrid, lineSpectrum, type AbsorptionLine } from '../spectro/lineSpectrum';
import { fitVelocity, fitWork } from '../spectro/velocityFit';
import { C_KMS, photonVelocityErrorKms } from './velocityError';

/** Half-width (Angstrom) of the fitting window about each line: the calcium-triplet line bands of Cenarro et al. (2001, MNRAS 326, 959) are 29-40 A wide, with continuum beside them. */
export const FIT_HALF_WINDOW_A = 15;

/** Half-range (km/s) of the velocity search about the expected velocity; true velocities are drawn within +-TRUE_SPREAD_KMS. */
export const SEARCH_HALF_RANGE_KMS = 300;
const TRUE_SPREAD_KMS = 60;

/** A fitted velocity further than this many robust sigmas from the truth counts as a catastrophic failure. */
export const CATASTROPHIC_SIGMAS = 5;

export interface CalibrationSetup {
  lines: readonly AbsorptionLine[];
  /** Gaussian sigma of the observed lines, Angstrom (line-spread function, intrinsic width, pixel box in quadrature). */
  sigmaA: number;
  dispersionAPerPixel: number;
  halfWindowA?: number;
  searchHalfRangeKms?: number;
}

export interface CalibrationPoint {
  snPerA: number;
  trials: number;
  /** RMS (km/s) of fitted minus true velocity over the trials that are not catastrophic. */
  sigmaKms: number;
  /** Robust sigma, 1.4826 x the median absolute deviation (km/s). */
  robustSigmaKms: number;
  /** Share of trials further than CATASTROPHIC_SIGMAS robust sigmas from the truth (a wrong minimum). */
  catastrophicFraction: number;
  /** Photon-noise bound of the same lines (km/s) and the ratio sigmaKms / boundKms. */
  boundKms: number;
  ratio: number;
}

/** Total line sigma (Angstrom) on the detector: instrumental, intrinsic and the pixel box (variance dx^2/12), in quadrature. */
export function observedLineSigmaA(instrumentalA: number, intrinsicA: number, dispersionAPerPixel: number): number {
  return Math.sqrt(instrumentalA * instrumentalA + intrinsicA * intrinsicA + (dispersionAPerPixel * dispersionAPerPixel) / 12);
}

/** Photon-noise bound (km/s) of the setup's lines at S/N per Angstrom snPerA (Bouchy et al. 2001 framework). */
export function setupBoundKms(setup: CalibrationSetup, snPerA: number): number {
  return photonVelocityErrorKms(snPerA, setup.sigmaA, setup.lines.map((l) => l.restA), setup.lines.map((l) => l.ewA));
}

/** Line sigma of the setup in km/s at the mean line wavelength. */
export function setupSigmaKms(setup: CalibrationSetup): number {
  const meanA = setup.lines.reduce((s, l) => s + l.restA, 0) / setup.lines.length;
  return (setup.sigmaA / meanA) * C_KMS;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Scatter of fitted minus true velocity over `trials` seeded mock spectra at snPerA (the same seed gives the same result). */
export function calibrateVelocityError(setup: CalibrationSetup, snPerA: number, trials: number, seed: number | string): CalibrationPoint {
  const rng = makeRng(seed);
  const halfWindowA = setup.halfWindowA ?? FIT_HALF_WINDOW_A;
  const range = setup.searchHalfRangeKms ?? SEARCH_HALF_RANGE_KMS;
  // Noise per pixel of a continuum with S/N per Angstrom s: a pixel of dx Angstrom holds dx of the signal, S/N s sqrt(dx).
  const noise = 1 / (snPerA * Math.sqrt(setup.dispersionAPerPixel));
  const dv: number[] = [];
  for (let t = 0; t < trials; t++) {
    const grid = lineWindowGrid(setup.lines, setup.dispersionAPerPixel, halfWindowA, rng.next() * setup.dispersionAPerPixel);
    const work = fitWork(grid);
    const trueKms = rng.uniform(-TRUE_SPREAD_KMS, TRUE_SPREAD_KMS);
    const flux = new Float64Array(grid.wavelengthA.length);
    lineSpectrum(grid, setup.lines, setup.sigmaA, trueKms, flux);
    for (let p = 0; p < flux.length; p++) flux[p] += rng.normal(0, noise);
    dv.push(fitVelocity(grid, setup.lines, setup.sigmaA, flux, -range, range, work).velocityKms - trueKms);
  }
  const med = median(dv);
  const robust = 1.4826 * median(dv.map((d) => Math.abs(d - med)));
  const kept = dv.filter((d) => Math.abs(d - med) <= CATASTROPHIC_SIGMAS * robust);
  const mean = kept.reduce((s, d) => s + d, 0) / kept.length;
  const sigma = Math.sqrt(kept.reduce((s, d) => s + (d - mean) * (d - mean), 0) / Math.max(1, kept.length - 1));
  const bound = setupBoundKms(setup, snPerA);
  return { snPerA, trials, sigmaKms: sigma, robustSigmaKms: robust, catastrophicFraction: 1 - kept.length / trials, boundKms: bound, ratio: sigma / bound };
}
