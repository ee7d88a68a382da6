/**
 * Atmospheric refraction and its dispersion. Plane-parallel form R = 206265" (n - 1) tan z (Filippenko 1982),
 * z the true zenith distance in degrees; the image is lifted toward the zenith by R (arcsec).
 */
import { ARCSEC_PER_RAD, RAD_PER_DEG } from '../sky/angles';
import { edlenRefractivity, type AirConditions } from './refractiveIndex';
import { PMath } from '../numeric/portableMath';

/** Refraction in arcsec toward the zenith for refractivity n - 1 at true zenith distance zDeg (plane-parallel). */
export function refractionArcsec(zenithDeg: number, refractivity: number): number {
  return ARCSEC_PER_RAD * refractivity * PMath.tan(zenithDeg * RAD_PER_DEG);
}

/** Refraction in arcsec toward the zenith of light at airWavelengthA (Edlén index for `air`) at zenith distance zDeg. */
export function refractionAtWavelengthArcsec(zenithDeg: number, airWavelengthA: number, air: AirConditions): number {
  return refractionArcsec(zenithDeg, edlenRefractivity(airWavelengthA, air));
}

/**
 * Differential refraction R(lambda1) - R(lambda2) in arcsec at zenith distance zDeg: positive when light at
 * wavelength1A is lifted further toward the zenith than at wavelength2A (blue above red).
 */
export function differentialRefractionArcsec(zenithDeg: number, wavelength1A: number, wavelength2A: number, air: AirConditions): number {
  return refractionArcsec(zenithDeg, edlenRefractivity(wavelength1A, air) - edlenRefractivity(wavelength2A, air));
}
