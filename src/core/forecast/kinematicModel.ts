/**
 * The kinematic model the mocks are drawn from: line-of-sight velocity v = vsys + A cos(PA - PAkin) + a Gaussian of
 * dispersion sigma(R) = sigmaKms (R/Re)^sigmaSlope. PA is the tracer's position angle about the galaxy centre
 * (degrees East of North), PAkin the receding side of the rotation; R the circularised radius (interface contract).
 */
import { PMath } from '../numeric/portableMath';
import type { KinematicModel } from './settings';

/** Radii below this (Re) take the dispersion at this radius (keeps a falling profile finite at the centre). */
export const MIN_PROFILE_RADIUS_RE = 0.1;

/** Model dispersion (km/s) at circularised radius radiusRe (in Re). */
export function modelSigmaKms(radiusRe: number, k: KinematicModel): number {
  return k.sigmaKms * PMath.pow(Math.max(radiusRe, MIN_PROFILE_RADIUS_RE), k.sigmaSlope);
}

/** Model rotation velocity (km/s, relative to vsys) of amplitude amplitudeKms at position angle paDeg (East of North). */
export function rotationVelocityKms(paDeg: number, amplitudeKms: number, kinematicPaDeg: number): number {
  return amplitudeKms * PMath.cos(((paDeg - kinematicPaDeg) * Math.PI) / 180);
}
