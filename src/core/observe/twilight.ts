/**
 * Sun altitudes that define sunset and twilight (degrees, altitude of the Sun's centre above the geometric
 * horizon), and a fast track of the Sun's altitude over one night.
 * Sunset/sunrise: -0.833 deg = 34' of horizon refraction plus the 16' semi-diameter (common practice; no dip
 * for the site's elevation, no correction for the day's pressure). Twilights (common practice): civil -6,
 * nautical -12, astronomical -18 deg, geometric (no refraction).
 */
import { sunEquatorialOfDate } from './sun';
import { altitudeDeg } from './horizon';
import { DEG_PER_RAD, RAD_PER_DEG } from '../sky/angles';
import { quadraticThrough, unwrapNearDeg } from './interpolate';
import { greenwichApparentSiderealDeg, greenwichApparentSiderealWithNutationDeg, jdeFromJdUt, SIDEREAL_DEG_PER_DAY, type NutationRad } from './time';
import { PMath } from '../numeric/portableMath';

export const SUNSET_ALTITUDE_DEG = -0.833;
export const CIVIL_TWILIGHT_DEG = -6;
export const NAUTICAL_TWILIGHT_DEG = -12;
export const ASTRONOMICAL_TWILIGHT_DEG = -18;

/** Sun altitude in degrees (geometric, centre of the disk) at JD (UT) for latitude/longitude (East positive) in degrees. */
export function sunAltitudeDeg(jdUt: number, latDeg: number, lonEastDeg: number): number {
  const sun = sunEquatorialOfDate(jdeFromJdUt(jdUt));
  const lst = greenwichApparentSiderealDeg(jdUt) + lonEastDeg;
  return altitudeDeg(lst - sun.raDeg, sun.decDeg, latDeg);
}

/**
 * Local sidereal time (degrees, not wrapped) and Sun place over one day from jd0: sidereal time linear in time from
 * its exact value at jd0, Sun RA/Dec quadratic through exact values at jd0, jd0 + span/2, jd0 + span.
 * Agrees with sunAltitudeDeg to well under an arcsecond over a day (test/observe/twilight.test.ts).
 */
export interface NightTrack {
  localSiderealDeg(jdUt: number): number;
  sunRaDecDeg(jdUt: number): { raDeg: number; decDeg: number };
  sunAltitudeDeg(jdUt: number): number;
}

/** Build a NightTrack for [jd0, jd0 + spanDays] at the site (pass a nutation of that day to save recomputing it). */
export function nightTrack(jd0: number, spanDays: number, latDeg: number, lonEastDeg: number, nut?: NutationRad): NightTrack {
  const lst0 = (nut ? greenwichApparentSiderealWithNutationDeg(jd0, nut) : greenwichApparentSiderealDeg(jd0)) + lonEastDeg;
  const s0 = sunEquatorialOfDate(jdeFromJdUt(jd0));
  const s1 = sunEquatorialOfDate(jdeFromJdUt(jd0 + spanDays / 2));
  const s2 = sunEquatorialOfDate(jdeFromJdUt(jd0 + spanDays));
  const r0 = s0.raDeg, r1 = unwrapNearDeg(r0, s1.raDeg), r2 = unwrapNearDeg(r1, s2.raDeg);
  const quad = quadraticThrough;
  const sinLat = PMath.sin(latDeg * RAD_PER_DEG), cosLat = PMath.cos(latDeg * RAD_PER_DEG);
  const track: NightTrack = {
    localSiderealDeg: (jd) => lst0 + SIDEREAL_DEG_PER_DAY * (jd - jd0),
    sunRaDecDeg: (jd) => {
      const u = (jd - jd0) / spanDays;
      return { raDeg: quad(r0, r1, r2, u), decDeg: quad(s0.decDeg, s1.decDeg, s2.decDeg, u) };
    },
    sunAltitudeDeg: (jd) => {
      const u = (jd - jd0) / spanDays;
      const ra = quad(r0, r1, r2, u), dec = quad(s0.decDeg, s1.decDeg, s2.decDeg, u) * RAD_PER_DEG;
      const h = (lst0 + SIDEREAL_DEG_PER_DAY * (jd - jd0) - ra) * RAD_PER_DEG;
      const x = sinLat * PMath.sin(dec) + cosLat * PMath.cos(dec) * PMath.cos(h);
      return PMath.asin(x > 1 ? 1 : x < -1 ? -1 : x) * DEG_PER_RAD;
    },
  };
  return track;
}
