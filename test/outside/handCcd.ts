/**
 * The hand-worked spectroscopic set-up of the outside S/N checks, with its own arithmetic (no project code):
 * AB photons from 3631 Jy (Oke & Gunn 1983) and Howell's (2006) CCD equation with the sky-estimate term.
 * Set-up (invented, typical of the class): 6.5 m unobstructed, throughput 0.20, 0.5 A/pixel, 0.2"/pixel along the
 * slit, read noise 4 e-, dark 0.002 e-/pixel/s, 8500 A, 3600 s, dark I-band sky 20.15 AB mag/arcsec^2 (Patat 2003).
 */
import type { SpectroSetup } from '../../src/core/spectro/signalToNoise';

/** A spectroscopic set-up for the hand calculation (units in the names; skyAb in AB mag/arcsec^2). */
export interface HandSetup {
  wavelengthA: number; areaCm2: number; throughput: number; dispersionAPerPixel: number; yArcsecPerPixel: number;
  readNoiseE: number; darkEPerPixelPerS: number; exposureS: number; skyAb: number;
}

/** Planck constant, erg s (SI 2019 exact). */
export const PLANCK_ERG_S = 6.62607015e-27;

export const HAND: HandSetup = {
  wavelengthA: 8500, areaCm2: Math.PI * 325 * 325, throughput: 0.2,
  dispersionAPerPixel: 0.5, yArcsecPerPixel: 0.2, readNoiseE: 4, darkEPerPixelPerS: 0.002, exposureS: 3600, skyAb: 20.15,
};

/** The same set-up in the project's terms (the object under test receives it; the hand side never reads it). */
export const HAND_SETUP: SpectroSetup = {
  apertureM: 6.5, obstructedFraction: 0, throughput: HAND.throughput, dispersionAPerPixel: HAND.dispersionAPerPixel,
  yArcsecPerPixel: HAND.yArcsecPerPixel, readNoiseE: HAND.readNoiseE, darkEPerPixelPerS: HAND.darkEPerPixelPerS, wavelengthA: HAND.wavelengthA,
};

/** Photons s^-1 cm^-2 A^-1 of AB = 0 at the set-up's wavelength: 3631e-23 / (h lambda) * 1e-8 = 644.69 at 8500 A. */
export function handPhotonsAbZero(h: HandSetup = HAND): number {
  return (3631e-23 / (PLANCK_ERG_S * h.wavelengthA * 1e-8)) * 1e-8;
}

/** Detected electrons s^-1 A^-1 from AB magnitude m (or per arcsec^2 from a surface brightness). */
export function handElectronsPerSPerA(magAb: number, h: HandSetup = HAND): number {
  return handPhotonsAbZero(h) * Math.pow(10, -0.4 * magAb) * h.areaCm2 * h.throughput;
}

/**
 * Howell's CCD equation per A: N* / sqrt(N* + n_pix (1 + n_pix/n_B)(N_S + N_G + N_D + N_R^2)), for an extraction of
 * extractionArcsec along a slit of widthArcsec, the sky estimated from skyLengthArcsec of slit (null: known exactly),
 * and an optional galaxy background (AB mag/arcsec^2) under the source.
 */
export function handCcdSn(nStarE: number, extractionArcsec: number, widthArcsec: number, skyLengthArcsec: number | null, galaxyMuAb: number | null = null, h: HandSetup = HAND): number {
  const perPixel = (mu: number) => handElectronsPerSPerA(mu, h) * widthArcsec * h.yArcsecPerPixel * h.dispersionAPerPixel * h.exposureS;
  const nPix = extractionArcsec / h.yArcsecPerPixel / h.dispersionAPerPixel;
  const k = skyLengthArcsec === null ? 1 : 1 + nPix / (skyLengthArcsec / h.yArcsecPerPixel / h.dispersionAPerPixel);
  const background = perPixel(h.skyAb) + (galaxyMuAb === null ? 0 : perPixel(galaxyMuAb));
  return nStarE / Math.sqrt(nStarE + nPix * k * (background + h.darkEPerPixelPerS * h.exposureS + h.readNoiseE * h.readNoiseE));
}
