/** Mean place of date: ICRS/J2000 RA/Dec (degrees) precessed to the epoch of a JD (Meeus ch. 21, astronomia precess). */
import { Equatorial } from 'astronomia/coord';
import { position } from 'astronomia/precess';
import { DEG_PER_RAD, RAD_PER_DEG, wrap360Deg } from '../sky/angles';
import { julianEpochFromJd } from './time';

/**
 * Precess J2000 RA/Dec (degrees) to the mean equator and equinox of the date jd (UT is close enough).
 * Nutation and aberration (under 40 arcsec) are left out: they move transit by a few seconds and airmass not at all.
 */
export function meanPlaceOfDateDeg(raJ2000Deg: number, decJ2000Deg: number, jd: number): { raDeg: number; decDeg: number } {
  const eq = position(new Equatorial(raJ2000Deg * RAD_PER_DEG, decJ2000Deg * RAD_PER_DEG), 2000, julianEpochFromJd(jd), 0, 0);
  return { raDeg: wrap360Deg(eq.ra * DEG_PER_RAD), decDeg: eq.dec * DEG_PER_RAD };
}
