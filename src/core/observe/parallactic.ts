/**
 * Parallactic angle q: the position angle (degrees East of North, in (-180, 180]) of the direction from an
 * object toward the zenith. Meeus (14.1): tan q = sin H / (tan phi cos delta - sin delta cos H), H the hour
 * angle (positive West), phi the latitude, delta the declination. q = 0 or 180 at transit, q > 0 West of the meridian.
 */
import { DEG_PER_RAD, RAD_PER_DEG } from '../sky/angles';
import { PMath } from '../numeric/portableMath';

/** Parallactic angle in degrees (-180, 180] for hour angle, declination and latitude in degrees (Meeus 14.1). */
export function parallacticAngleDeg(haDeg: number, decDeg: number, latDeg: number): number {
  const h = haDeg * RAD_PER_DEG, d = decDeg * RAD_PER_DEG, p = latDeg * RAD_PER_DEG;
  // Multiplied through by cos(phi) so that the poles do not divide by zero.
  const y = PMath.sin(h) * PMath.cos(p);
  const x = PMath.sin(p) * PMath.cos(d) - PMath.cos(p) * PMath.sin(d) * PMath.cos(h);
  return PMath.atan2(y, x) * DEG_PER_RAD;
}
