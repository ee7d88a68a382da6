/**
 * Spectral resolution of a slit spectrograph from its slit width and dispersion (common practice): the slit's image
 * on the detector spans widthArcsec / xArcsecPerPixel pixels along the dispersion (at least 2: a resolution element
 * is never sampled by fewer), so the resolution element is FWHM = max(width / scale, 2) x dispersionAPerPixel (A),
 * the resolving power R = lambda / FWHM, and the instrumental dispersion sigma = c / (R 2 sqrt(2 ln 2)) (Gaussian
 * line spread, FWHM = 2.3548 sigma).
 */
import { SPEED_OF_LIGHT_KMS } from '../profile/wavelength';
import type { InstrumentProfile } from '../profile/schema';
import { FWHM_PER_SIGMA } from '../observe/slitLoss';

/** Fewest pixels a resolution element can span (Nyquist sampling). */
export const MIN_RESOLUTION_PIXELS = 2;

export interface Resolution {
  wavelengthA: number;
  /** Resolution element (FWHM) in Angstrom and in detector pixels along the dispersion. */
  fwhmA: number;
  fwhmPixels: number;
  resolvingPower: number;
  /** Instrumental dispersion (Gaussian sigma) in km/s. */
  sigmaKms: number;
}

/** Resolution at wavelengthA (Angstrom) for a slit of widthArcsec on this detector (dispersion A/pixel, scale arcsec/pixel along x). */
export function slitResolution(detector: Pick<InstrumentProfile['detector'], 'dispersionAPerPixel' | 'xArcsecPerPixel'>, widthArcsec: number, wavelengthA: number): Resolution {
  const fwhmPixels = Math.max(widthArcsec / detector.xArcsecPerPixel, MIN_RESOLUTION_PIXELS);
  const fwhmA = fwhmPixels * detector.dispersionAPerPixel;
  const resolvingPower = wavelengthA / fwhmA;
  return { wavelengthA, fwhmA, fwhmPixels, resolvingPower, sigmaKms: SPEED_OF_LIGHT_KMS / (resolvingPower * FWHM_PER_SIGMA) };
}
