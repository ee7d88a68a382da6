/**
 * Time scales. Julian date (JD) in days; UT is taken equal to UTC (the leap-second difference, under 1 s,
 * is below what observability needs). TT = UT + Delta T (astronomia deltat). Sidereal times in degrees.
 */
import { apparent as apparentSiderealS, mean as meanSiderealS } from 'astronomia/sidereal';
import { deltaT } from 'astronomia/deltat';
import { meanObliquity, nutation } from 'astronomia/nutation';
import { wrap360Deg } from '../sky/angles';
import { PMath } from '../numeric/portableMath';

/** JD of the Unix epoch 1970-01-01T00:00Z. */
export const JD_UNIX_EPOCH = 2440587.5;
export const MS_PER_DAY = 86_400_000;
/** JD of J2000.0 (2000-01-01 12h TT). */
export const JD_J2000 = 2451545.0;
/** Sidereal degrees per solar (UT) day, mean rate (common practice value 360.98564736629). */
export const SIDEREAL_DEG_PER_DAY = 360.98564736629;

/** JD (UT) of a Unix time in milliseconds (UTC). */
export function jdFromUnixMs(unixMs: number): number {
  return unixMs / MS_PER_DAY + JD_UNIX_EPOCH;
}

/** Unix time in milliseconds (UTC) of a JD (UT). */
export function unixMsFromJd(jd: number): number {
  return (jd - JD_UNIX_EPOCH) * MS_PER_DAY;
}

/** ISO 8601 UTC text of a JD (UT), rounded to the second, e.g. 2026-10-01T02:03:04Z. */
export function isoUtcFromJd(jd: number): string {
  return new Date(Math.round(unixMsFromJd(jd) / 1000) * 1000).toISOString().replace('.000Z', 'Z');
}

/** Julian epoch (years, e.g. 2026.75) of a JD. */
export function julianEpochFromJd(jd: number): number {
  return 2000 + (jd - JD_J2000) / 365.25;
}

/** Delta T = TT - UT in seconds at a JD (UT), from astronomia's tables and polynomials. */
export function deltaTSeconds(jdUt: number): number {
  return deltaT(julianEpochFromJd(jdUt));
}

/** Julian ephemeris day (TT) from a JD (UT). */
export function jdeFromJdUt(jdUt: number): number {
  return jdUt + deltaTSeconds(jdUt) / 86400;
}

/** Greenwich mean sidereal time in degrees [0, 360) at a JD (UT), IAU 1982 (Meeus 12.4). */
export function greenwichMeanSiderealDeg(jdUt: number): number {
  return meanSiderealS(jdUt) / 240;
}

/** Greenwich apparent sidereal time in degrees [0, 360) at a JD (UT): mean plus nutation in RA (Meeus ch. 12). */
export function greenwichApparentSiderealDeg(jdUt: number): number {
  return apparentSiderealS(jdUt) / 240;
}

/** Nutation in longitude and obliquity and the true obliquity, radians, at a Julian ephemeris day (Meeus ch. 22). */
export interface NutationRad {
  dPsi: number;
  dEps: number;
  trueObliquity: number;
}

/** Nutation at jde (astronomia nutation, the full Meeus table). */
export function nutationAt(jde: number): NutationRad {
  const [dPsi, dEps] = nutation(jde);
  return { dPsi, dEps, trueObliquity: meanObliquity(jde) + dEps };
}

/**
 * Greenwich apparent sidereal time in degrees from the mean one plus the equation of the equinoxes dPsi cos(eps)
 * for a nutation computed once (it changes by < 0.01 s of time over a day).
 */
export function greenwichApparentSiderealWithNutationDeg(jdUt: number, nut: NutationRad): number {
  return wrap360Deg(greenwichMeanSiderealDeg(jdUt) + (nut.dPsi * PMath.cos(nut.trueObliquity) * 180) / Math.PI);
}

/** Local sidereal time in degrees [0, 360) from Greenwich sidereal time and longitude (East positive, degrees). */
export function localSiderealDeg(greenwichSiderealDeg: number, lonEastDeg: number): number {
  return wrap360Deg(greenwichSiderealDeg + lonEastDeg);
}
