/**
 * Resolving power of a slit spectrum, R = lambda / delta-lambda, from the instrument profile: the slit's image along the
 * dispersion spans widthArcsec / xArcsecPerPixel detector pixels (the contract's wavelength rule maps mask x to pixels
 * by xArcsecPerPixel), each dispersionAPerPixel Angstrom wide. A slit image narrower than two pixels is undersampled:
 * the resolution element is then two pixels (the Nyquist limit, common practice).
 */
import type { InstrumentProfile } from '../profile/schema';

/** The smallest resolution element, in pixels (Nyquist sampling). */
export const MIN_RESOLUTION_ELEMENT_PIXELS = 2;

export interface SlitResolution {
  /** Width of the slit's image on the detector along the dispersion, pixels. */
  slitWidthPixels: number;
  /** Resolution element, Angstrom (FWHM of an unresolved line through a uniformly filled slit). */
  resolutionElementA: number;
  /** R = wavelengthA / resolutionElementA (dimensionless). */
  resolvingPower: number;
}

/** Resolution of a slit of `widthArcsec` at `wavelengthA` (default the profile's central wavelength), Angstrom and R. */
export function slitResolution(detector: InstrumentProfile['detector'], widthArcsec: number, wavelengthA = detector.centralWavelengthA): SlitResolution {
  const slitWidthPixels = widthArcsec / detector.xArcsecPerPixel;
  const resolutionElementA = Math.max(slitWidthPixels, MIN_RESOLUTION_ELEMENT_PIXELS) * detector.dispersionAPerPixel;
  return { slitWidthPixels, resolutionElementA, resolvingPower: wavelengthA / resolutionElementA };
}
