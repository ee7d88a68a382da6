/**
 * Parallactic angle q: the position angle (degrees East of North, in (-180, 180]) of the direction from an
 * object toward the zenith. Meeus (14.1): tan q = sin H / (tan phi cos delta - sin delta cos H), H the hour
 * angle (positive West), phi the latitude, delta the declination. q = 0 or 180 at transit, q > 0 West of the meridian.
 */
import { DEG_PER_RAD, RAD_PER_DEG } from '../sky/angles';

/** Parallactic angle in degrees (-180, 180] for hour angle, declination and latitude in degrees (Meeus 14.1). */
export function parallacticAngleDeg(haDeg: number, decDeg: number, latDeg: number): number {
  const h = haDeg * RAD_PER_DEG, d = decDeg * RAD_PER_DEG, p = latDeg * RAD_PER_DEG;
  // Multiplied through by cos(phi) so that the poles do not divide by zero.
  const y = Math.sin(h) * Math.cos(p);
  const x = Math.sin(p) * Math.cos(d) - Math.cos(p) * Math.sin(d) * Math.cos(h);
  return Math.atan2(y, x) * DEG_PER_RAD;
}
