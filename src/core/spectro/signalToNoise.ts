/**
 * Signal-to-noise model of a slit spectrum (docs/signal-to-noise.md).
 * CCD equation (Howell, Handbook of CCD Astronomy, 2nd ed. 2006, sec. 4.4; Howell 1989, PASP 101, 616):
 *   S/N = N* / sqrt(N* + n_pix (1 + n_pix/n_B) (N_S + N_D + N_R^2))
 * with N* the source electrons, n_pix the pixels summed, n_B the pixels the sky is estimated from, N_S background
 * (sky, plus the galaxy's own light under a tracer) electrons per pixel, N_D dark electrons per pixel, N_R read noise
 * in electrons per pixel. Without n_B (sky known perfectly) the factor (1 + n_pix/n_B) is 1. Here everything is taken "per Angstrom" of spectrum:
 * N* is the source electrons in a 1 A wide slice summed along the slit, and n_pix the pixels of that slice
 * (extraction length / yArcsecPerPixel along the slit times 1 / dispersionAPerPixel along the dispersion).
 * Magnitudes are AB: a source of m_AB has f_nu = 3631 Jy * 10^(-0.4 m), i.e. a photon flux density
 * f_nu / (h lambda) per unit wavelength (Oke & Gunn 1983 definition of AB; closed form, no table).
 * All functions are pure; units are in the names (S = seconds, A = Angstrom, cm2 = square centimetres).
 */
import { PMath } from '../numeric/portableMath';

/** Planck constant in erg s (SI 2019 exact value 6.62607015e-34 J s). */
export const PLANCK_ERG_S = 6.62607015e-27;
/** AB zero point: 3631 Jy in erg s^-1 cm^-2 Hz^-1. */
export const AB_ZERO_FNU_CGS = 3631e-23;

/** Photons s^-1 cm^-2 A^-1 of a source of AB magnitude `mag` at `wavelengthA` (air ~ vacuum here): f_nu/(h lambda) * 1e-8. */
export function abPhotonFluxPerSCm2A(mag: number, wavelengthA: number): number {
  const lambdaCm = wavelengthA * 1e-8;
  return ((AB_ZERO_FNU_CGS * PMath.pow(10, -0.4 * mag)) / (PLANCK_ERG_S * lambdaCm)) * 1e-8;
}

/** Collecting area in cm^2 of a circular aperture of diameter `apertureM`, less a central obstruction given as a fraction of the area. */
export function collectingAreaCm2(apertureM: number, obstructedFraction = 0): number {
  const rCm = (apertureM * 100) / 2;
  return Math.PI * rCm * rCm * (1 - obstructedFraction);
}

/** The instrument side of the model: everything that turns photons into detected electrons per pixel. */
export interface SpectroSetup {
  /** Telescope aperture diameter (m) and the obstructed fraction of its area. */
  apertureM: number;
  obstructedFraction?: number;
  /** Fraction of photons at the top of the atmosphere that become electrons (atmosphere, telescope, spectrograph, CCD). */
  throughput: number;
  /** Detector scales: A per pixel along the dispersion, arcsec per pixel along the slit. */
  dispersionAPerPixel: number;
  yArcsecPerPixel: number;
  /** Read noise (electrons rms per pixel) and dark current (electrons per pixel per second). */
  readNoiseE: number;
  darkEPerPixelPerS: number;
  /** Wavelength where the S/N is wanted (A). */
  wavelengthA: number;
}

/** Electrons per A detected from a source of AB magnitude `mag` in `exposureS`, times the fraction of its light entering the slit. */
export function electronsPerAFromMag(mag: number, s: SpectroSetup, exposureS: number, slitFraction = 1): number {
  return abPhotonFluxPerSCm2A(mag, s.wavelengthA) * collectingAreaCm2(s.apertureM, s.obstructedFraction) * s.throughput * exposureS * slitFraction;
}

/** Electrons per A from a surface brightness `muMagPerArcsec2` (AB) over a slit area `areaArcsec2` (width x extraction length). */
export function electronsPerAFromSurfaceBrightness(muMagPerArcsec2: number, areaArcsec2: number, s: SpectroSetup, exposureS: number): number {
  return electronsPerAFromMag(muMagPerArcsec2, s, exposureS) * areaArcsec2;
}

/** Sky electrons per detector pixel: sky mu (AB mag/arcsec^2) over one pixel's footprint (slit width x yArcsecPerPixel) and one pixel's A. */
export function skyElectronsPerPixel(skyMagPerArcsec2: number, slitWidthArcsec: number, s: SpectroSetup, exposureS: number): number {
  return electronsPerAFromSurfaceBrightness(skyMagPerArcsec2, slitWidthArcsec * s.yArcsecPerPixel, s, exposureS) * s.dispersionAPerPixel;
}

/** Pixels in a 1 A slice of a spectrum extracted over `extractionArcsec` along the slit. */
export function pixelsPerA(extractionArcsec: number, s: SpectroSetup): number {
  return (extractionArcsec / s.yArcsecPerPixel) / s.dispersionAPerPixel;
}

/** The terms of the CCD equation, all in electrons (per pixel where stated). */
export interface CcdTerms {
  sourceE: number;
  nPix: number;
  skyEPerPixel: number;
  darkEPerPixel: number;
  readNoiseE: number;
  /** Pixels the sky is estimated from (n_B); absent: the sky is known without error. */
  skyPixels?: number;
  /** Light of the galaxy under the source, electrons per pixel (a background like the sky; absent: 0). */
  galaxyEPerPixel?: number;
}

/** Noise factor of the sky estimate, 1 + n_pix/n_B (Howell 2006, sec. 4.4); 1 without n_B, Infinity with n_B <= 0. */
export function skyEstimateFactor(nPix: number, skyPixels: number | undefined): number {
  if (skyPixels === undefined) return 1;
  return skyPixels > 0 ? 1 + nPix / skyPixels : Infinity;
}

/** Variance (electrons^2) of Howell's CCD equation: N* + n_pix (1 + n_pix/n_B) (N_S + N_G + N_D + N_R^2); Infinity without a sky estimate. */
export function ccdVarianceE2(t: CcdTerms): number {
  const k = skyEstimateFactor(t.nPix, t.skyPixels);
  if (!Number.isFinite(k)) return Infinity;
  return t.sourceE + t.nPix * k * (t.skyEPerPixel + (t.galaxyEPerPixel ?? 0) + t.darkEPerPixel + t.readNoiseE * t.readNoiseE);
}

/** Howell's CCD equation: S/N = N* / sqrt(ccdVarianceE2); 0 without a sky estimate. */
export function ccdSignalToNoise(t: CcdTerms): number {
  const variance = ccdVarianceE2(t);
  return Number.isFinite(variance) && variance > 0 ? t.sourceE / Math.sqrt(variance) : 0;
}

/** What is observed through one slit: the source per second and the sky, dark and read terms per second/pixel. */
export interface SlitObservation {
  /** Source electrons per A per second (from electronsPerAFrom... with exposureS = 1). */
  sourceEPerAPerS: number;
  /** Extraction length along the slit (arcsec) and slit width (arcsec). */
  extractionArcsec: number;
  slitWidthArcsec: number;
  skyMagPerArcsec2: number;
  /** Length along the slit(s) the sky is estimated from (arcsec, same width); absent: the sky is known without error. */
  skyLengthArcsec?: number;
  /** Surface brightness of the galaxy under the source (AB mag/arcsec^2), a background like the sky; absent: none. */
  galaxyMagPerArcsec2?: number;
}

/** CCD terms per A of spectrum for a slit observation exposed `exposureS` seconds. */
export function ccdTermsPerA(o: SlitObservation, s: SpectroSetup, exposureS: number): CcdTerms {
  return {
    sourceE: o.sourceEPerAPerS * exposureS,
    nPix: pixelsPerA(o.extractionArcsec, s),
    skyEPerPixel: skyElectronsPerPixel(o.skyMagPerArcsec2, o.slitWidthArcsec, s, exposureS),
    darkEPerPixel: s.darkEPerPixelPerS * exposureS,
    readNoiseE: s.readNoiseE,
    skyPixels: o.skyLengthArcsec === undefined ? undefined : pixelsPerA(o.skyLengthArcsec, s),
    galaxyEPerPixel: o.galaxyMagPerArcsec2 === undefined ? 0 : skyElectronsPerPixel(o.galaxyMagPerArcsec2, o.slitWidthArcsec, s, exposureS),
  };
}

/** S/N per A reached in `exposureS` (CCD equation, per-A terms). */
export function signalToNoisePerA(o: SlitObservation, s: SpectroSetup, exposureS: number): number {
  return ccdSignalToNoise(ccdTermsPerA(o, s, exposureS));
}

/**
 * Exposure (s) that reaches `targetSn` per A. With N* = a t and noise per pixel (b + d) t + R^2, and n standing for
 * n_pix (1 + n_pix/n_B), the CCD equation gives a^2 t^2 - S^2 (a + n (b + d)) t - S^2 n R^2 = 0; the positive root.
 * Infinity when there is no signal or no sky estimate.
 */
export function exposureForSignalToNoiseS(o: SlitObservation, s: SpectroSetup, targetSn: number): number {
  const a = o.sourceEPerAPerS;
  if (!(a > 0)) return Infinity;
  const nPix = pixelsPerA(o.extractionArcsec, s);
  const n = nPix * skyEstimateFactor(nPix, o.skyLengthArcsec === undefined ? undefined : pixelsPerA(o.skyLengthArcsec, s));
  if (!Number.isFinite(n)) return Infinity;
  const galaxy = o.galaxyMagPerArcsec2 === undefined ? 0 : skyElectronsPerPixel(o.galaxyMagPerArcsec2, o.slitWidthArcsec, s, 1);
  const bd = skyElectronsPerPixel(o.skyMagPerArcsec2, o.slitWidthArcsec, s, 1) + galaxy + s.darkEPerPixelPerS;
  const S2 = targetSn * targetSn;
  const B = S2 * (a + n * bd);
  const C = S2 * n * s.readNoiseE * s.readNoiseE;
  return (B + Math.sqrt(B * B + 4 * a * a * C)) / (2 * a * a);
}

/**
 * Source electrons per A needed for `targetSn` given the noise per pixel: N*^2 = S^2 (N* + n B) solved for N*,
 * N* = (S^2 + sqrt(S^4 + 4 S^2 n B)) / 2, B = N_S + N_D + N_R^2 per pixel.
 */
export function requiredSourceElectrons(targetSn: number, nPix: number, noisePerPixelE: number): number {
  const S2 = targetSn * targetSn;
  return (S2 + Math.sqrt(S2 * S2 + 4 * S2 * nPix * noisePerPixelE)) / 2;
}

/**
 * Faintest mean surface brightness (AB mag/arcsec^2) over a slit of width x extraction length that still reaches
 * `targetSn` per A in `exposureS`: the inverse of the CCD equation for the source term.
 */
export function limitingSurfaceBrightness(targetSn: number, extractionArcsec: number, slitWidthArcsec: number, skyMagPerArcsec2: number, s: SpectroSetup, exposureS: number): number {
  const nPix = pixelsPerA(extractionArcsec, s);
  const noise = skyElectronsPerPixel(skyMagPerArcsec2, slitWidthArcsec, s, exposureS) + s.darkEPerPixelPerS * exposureS + s.readNoiseE * s.readNoiseE;
  const need = requiredSourceElectrons(targetSn, nPix, noise);
  const zeroMagPerArcsec2 = electronsPerAFromSurfaceBrightness(0, slitWidthArcsec * extractionArcsec, s, exposureS);
  return -2.5 * PMath.log10(need / zeroMagPerArcsec2);
}

/** Mean surface brightness (mag/arcsec^2) of a set of samples, averaged in flux: -2.5 log10(mean 10^(-0.4 mu)). */
export function fluxMeanSurfaceBrightness(muSamples: readonly number[]): number {
  if (!muSamples.length) return Infinity;
  let f = 0;
  for (const mu of muSamples) f += PMath.pow(10, -0.4 * mu);
  return -2.5 * PMath.log10(f / muSamples.length);
}
