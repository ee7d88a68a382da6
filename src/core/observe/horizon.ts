/**
 * Equatorial to horizontal coordinates for an observer at latitude latDeg (North positive).
 * Hour angle H = LST - RA, degrees, positive West of the meridian. Altitude above the geometric
 * horizon (no refraction); azimuth from North through East, [0, 360).
 */
import { DEG_PER_RAD, RAD_PER_DEG, wrap180Deg, wrap360Deg } from '../sky/angles';
import { PMath } from '../numeric/portableMath';

/** Hour angle in degrees [-180, 180) from local sidereal time and RA (both degrees); positive West. */
export function hourAngleDeg(localSiderealDeg: number, raDeg: number): number {
  return wrap180Deg(localSiderealDeg - raDeg);
}

/** Geometric altitude in degrees for hour angle, declination and latitude (degrees), Meeus (13.6). */
export function altitudeDeg(haDeg: number, decDeg: number, latDeg: number): number {
  const h = haDeg * RAD_PER_DEG, d = decDeg * RAD_PER_DEG, p = latDeg * RAD_PER_DEG;
  const s = PMath.sin(p) * PMath.sin(d) + PMath.cos(p) * PMath.cos(d) * PMath.cos(h);
  return PMath.asin(Math.max(-1, Math.min(1, s))) * DEG_PER_RAD;
}

/** Azimuth in degrees from North through East [0, 360), Meeus (13.5) converted from his South-westward count. */
export function azimuthDeg(haDeg: number, decDeg: number, latDeg: number): number {
  const h = haDeg * RAD_PER_DEG, d = decDeg * RAD_PER_DEG, p = latDeg * RAD_PER_DEG;
  const azSouthWest = PMath.atan2(PMath.sin(h), PMath.cos(h) * PMath.sin(p) - PMath.tan(d) * PMath.cos(p));
  return wrap360Deg(azSouthWest * DEG_PER_RAD + 180);
}

/** Highest altitude (degrees) a fixed object reaches, at upper transit: 90 - |lat - dec|. */
export function transitAltitudeDeg(decDeg: number, latDeg: number): number {
  return 90 - Math.abs(latDeg - decDeg);
}

/**
 * Hour angle (degrees, >= 0) at which an object of declination decDeg crosses altitude altDeg;
 * the object is above altDeg for |H| below it. Returns 0 if it never gets that high, 180 if it never sets below.
 */
export function hourAngleAtAltitudeDeg(altDeg: number, decDeg: number, latDeg: number): number {
  const d = decDeg * RAD_PER_DEG, p = latDeg * RAD_PER_DEG;
  const c = (PMath.sin(altDeg * RAD_PER_DEG) - PMath.sin(p) * PMath.sin(d)) / (PMath.cos(p) * PMath.cos(d));
  if (c >= 1) return 0;
  if (c <= -1) return 180;
  return PMath.acos(c) * DEG_PER_RAD;
}
