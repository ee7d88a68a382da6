/**
 * Velocity errors from S/N per Angstrom. Photon-noise floor of a Gaussian absorption line (Bouchy, Pepe & Queloz
 * 2001, A&A 374, 733, framework; the closed form below is derived in docs/forecast.md): a line of Gaussian sigma
 * sigmaLineA and equivalent width W in a spectrum of S/N per Angstrom s has a centroid error
 * sigmaLambda = 2 pi^(1/4) sigmaLineA^(3/2) / (s W). The lines are combined by inverse variance, converted to km/s
 * at each line's observed wavelength. The expected error of a real fit is the bound times a ratio calibrated by Monte
 * Carlo chi-square fits of mock spectra (forecast/velocityCalibration.ts), with a template-mismatch floor in quadrature.
 */
import { PMath } from '../numeric/portableMath';
import { FWHM_PER_SIGMA } from '../observe/slitLoss';
import type { VelocityErrorSettings } from './settings';
import { calibrationRatio } from './velocityCalibrationTable';

/** Speed of light, km/s (SI definition). */
export const C_KMS = 299792.458;

/** Photon-noise centroid error (Angstrom) of one Gaussian line: sigma sigmaLineA, equivalent width ewA, S/N per Angstrom snPerA. */
export function lineCentroidErrorA(snPerA: number, sigmaLineA: number, ewA: number): number {
  return (2 * PMath.pow(Math.PI, 0.25) * PMath.pow(sigmaLineA, 1.5)) / (snPerA * ewA);
}

/** Photon-noise velocity error (km/s) of several lines (rest wavelengths linesA at vsysKms) combined by inverse variance. */
export function photonVelocityErrorKms(snPerA: number, sigmaLineA: number, linesA: readonly number[], ewsA: readonly number[], vsysKms = 0): number {
  if (!(snPerA > 0)) return Infinity;
  let invVar = 0;
  for (let i = 0; i < linesA.length; i++) {
    const observedA = linesA[i] * (1 + vsysKms / C_KMS);
    const errKms = (lineCentroidErrorA(snPerA, sigmaLineA, ewsA[i] ?? ewsA[ewsA.length - 1]) / observedA) * C_KMS;
    invVar += 1 / (errKms * errKms);
  }
  return 1 / Math.sqrt(invVar);
}

/** Instrumental Gaussian sigma (Angstrom) of a slit of widthArcsec: its image width in pixels times the dispersion. */
export function instrumentalSigmaA(widthArcsec: number, xArcsecPerPixel: number, dispersionAPerPixel: number): number {
  return ((widthArcsec / xArcsecPerPixel) * dispersionAPerPixel) / FWHM_PER_SIGMA;
}

/** Observed line sigma (Angstrom): instrumental, intrinsic and a velocity broadening sigmaKms at wavelengthA, in quadrature. */
export function lineSigmaA(instrumentalA: number, intrinsicA: number, sigmaKms: number, wavelengthA: number): number {
  const broadA = (sigmaKms / C_KMS) * wavelengthA;
  return Math.sqrt(instrumentalA * instrumentalA + intrinsicA * intrinsicA + broadA * broadA);
}

/** How a spectrograph records a line: its Gaussian sigma (Angstrom; instrumental, intrinsic, broadening) and the dispersion (A/pixel). */
export interface LineSampling {
  sigmaLineA: number;
  dispersionAPerPixel: number;
}

/**
 * Velocity error (km/s) as a function of S/N per Angstrom, from the Monte Carlo calibration
 * (forecast/velocityCalibrationTable.ts): the photon bound of the lines (line sigma with the pixel box, variance
 * dx^2/12, in quadrature) times the calibrated ratio of a chi-square fit's scatter to the bound at that bound-to-width
 * ratio and sampling, times noiseFactor, with floorKms (template mismatch) in quadrature. Infinity below minSnPerA or
 * where wrong minima dominate (bound beyond MAX_BOUND_TO_WIDTH line sigmas).
 */
export function velocityErrorModel(sampling: LineSampling, linesA: readonly number[], vsysKms: number, s: VelocityErrorSettings): (snPerA: number) => number {
  const sigmaA = Math.sqrt(sampling.sigmaLineA * sampling.sigmaLineA + (sampling.dispersionAPerPixel * sampling.dispersionAPerPixel) / 12);
  const atUnitSn = photonVelocityErrorKms(1, sigmaA, linesA, s.equivalentWidthsA, vsysKms);
  const meanA = (linesA.reduce((a, b) => a + b, 0) / linesA.length) * (1 + vsysKms / C_KMS);
  const sigmaKms = (sigmaA / meanA) * C_KMS;
  const pixelsPerSigma = sigmaA / sampling.dispersionAPerPixel;
  return (snPerA) => {
    if (!(snPerA >= s.minSnPerA)) return Infinity;
    const bound = atUnitSn / snPerA;
    const photon = s.noiseFactor * calibrationRatio(bound / sigmaKms, pixelsPerSigma) * bound;
    return Number.isFinite(photon) ? Math.sqrt(photon * photon + s.floorKms * s.floorKms) : Infinity;
  };
}

/** Expected velocity error (km/s) at one S/N per Angstrom: velocityErrorModel evaluated once. */
export function velocityErrorKms(snPerA: number, sampling: LineSampling, linesA: readonly number[], vsysKms: number, s: VelocityErrorSettings): number {
  return velocityErrorModel(sampling, linesA, vsysKms, s)(snPerA);
}

/**
 * Error (km/s) of a Gaussian velocity dispersion sigmaKms measured from lines of total sigma sigmaLineKms with centroid
 * error velocityErrKms: for a Gaussian line the width is known to 1/sqrt(2) of the centroid error (Fisher information
 * of a normal sample), and sigma = sqrt(sigmaLine^2 - sigmaOther^2) scales it by sigmaLine/sigma.
 */
export function dispersionErrorKms(velocityErrKms: number, sigmaLineKms: number, sigmaKms: number): number {
  return (velocityErrKms * sigmaLineKms) / (Math.SQRT2 * Math.max(sigmaKms, 1e-9));
}
