/**
 * Airmass from the true zenith distance z (degrees). Hardie (1962), in Astronomical Techniques:
 * X = sec z - 0.0018167 (sec z - 1) - 0.002875 (sec z - 1)^2 - 0.0008083 (sec z - 1)^3, good to z of about 85 deg
 * (the polynomial turns over near z = 87 deg); the plane-parallel sec z is given alongside.
 */
import { RAD_PER_DEG } from '../sky/angles';
import { PMath } from '../numeric/portableMath';

/** Largest zenith distance (degrees) at which airmass is reported; beyond it the functions return null. */
export const MAX_AIRMASS_ZENITH_DEG = 87;

/** Plane-parallel airmass sec z for zenith distance zDeg; null at or below the horizon limit. */
export function secZAirmass(zenithDeg: number): number | null {
  if (!(zenithDeg < MAX_AIRMASS_ZENITH_DEG)) return null;
  return 1 / PMath.cos(zenithDeg * RAD_PER_DEG);
}

/** Hardie (1962) airmass for zenith distance zDeg; null beyond MAX_AIRMASS_ZENITH_DEG (object near or below the horizon). */
export function hardieAirmass(zenithDeg: number): number | null {
  const s = secZAirmass(zenithDeg);
  if (s === null) return null;
  const u = s - 1;
  return s - 0.0018167 * u - 0.002875 * u * u - 0.0008083 * u * u * u;
}

/** Zenith distance (degrees) at which the Hardie airmass equals X (X >= 1); bisection on the monotonic branch. */
export function zenithForHardieAirmassDeg(airmass: number): number {
  if (!(airmass >= 1)) throw new RangeError(`airmass must be at least 1, got ${airmass}`);
  let lo = 0, hi = MAX_AIRMASS_ZENITH_DEG - 1e-9;
  if ((hardieAirmass(hi) ?? Infinity) <= airmass) return hi;
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2;
    if ((hardieAirmass(mid) as number) < airmass) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

/** Altitude (degrees) above which the Hardie airmass is below X. */
export function altitudeForAirmassDeg(airmass: number): number {
  return 90 - zenithForHardieAirmassDeg(airmass);
}

/** Convert an altitude (degrees) to zenith distance (degrees). */
export function zenithFromAltitudeDeg(altitudeDeg: number): number {
  return 90 - altitudeDeg;
}

