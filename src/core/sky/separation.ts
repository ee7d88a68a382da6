/** Great-circle separation and position angle between two sky positions (degrees, ICRS). */
import { DEG_PER_RAD, RAD_PER_DEG, wrap360Deg } from './angles';
import { PMath } from '../numeric/portableMath';

/**
 * Angular separation in degrees between (ra1, dec1) and (ra2, dec2), all in degrees.
 * Vincenty's special case of the great-circle formula: accurate from micro-arcseconds up to
 * antipodal points, where the haversine and cosine forms lose precision.
 */
export function separationDeg(ra1Deg: number, dec1Deg: number, ra2Deg: number, dec2Deg: number): number {
  const d1 = dec1Deg * RAD_PER_DEG;
  const d2 = dec2Deg * RAD_PER_DEG;
  const dra = (ra2Deg - ra1Deg) * RAD_PER_DEG;
  const s1 = PMath.sin(d1), c1 = PMath.cos(d1), s2 = PMath.sin(d2), c2 = PMath.cos(d2);
  const sdra = PMath.sin(dra), cdra = PMath.cos(dra);
  const a = c2 * sdra;
  const b = c1 * s2 - s1 * c2 * cdra;
  const num = PMath.hypot(a, b);
  const den = s1 * s2 + c1 * c2 * cdra;
  return PMath.atan2(num, den) * DEG_PER_RAD;
}

/**
 * Position angle in degrees, East of North in [0, 360), of point 2 as seen from point 1.
 * 0 = point 2 due North of point 1, 90 = due East.
 */
export function positionAngleDeg(ra1Deg: number, dec1Deg: number, ra2Deg: number, dec2Deg: number): number {
  const d1 = dec1Deg * RAD_PER_DEG;
  const d2 = dec2Deg * RAD_PER_DEG;
  const dra = (ra2Deg - ra1Deg) * RAD_PER_DEG;
  const y = PMath.sin(dra) * PMath.cos(d2);
  const x = PMath.cos(d1) * PMath.sin(d2) - PMath.sin(d1) * PMath.cos(d2) * PMath.cos(dra);
  return wrap360Deg(PMath.atan2(y, x) * DEG_PER_RAD);
}
