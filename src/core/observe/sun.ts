/**
 * The Sun's apparent geocentric position, equinox and equator of date (Meeus ch. 25, low accuracy,
 * about 0.01 degree; astronomia solar). RA/Dec in degrees, distance in km.
 */
import { apparentEquatorial, radius } from 'astronomia/solar';
import { J2000Century } from 'astronomia/base';
import { DEG_PER_RAD, wrap360Deg } from '../sky/angles';

/** Astronomical unit in km (IAU 2012, 149597870.7 km). */
export const KM_PER_AU = 149_597_870.7;

export interface EquatorialOfDate {
  /** Right ascension of date, degrees [0, 360). */
  raDeg: number;
  /** Declination of date, degrees. */
  decDeg: number;
  /** Geocentric distance in km. */
  distanceKm: number;
}

/** Apparent geocentric RA/Dec of date of the Sun (degrees) and its distance (km) at a Julian ephemeris day. */
export function sunEquatorialOfDate(jde: number): EquatorialOfDate {
  const c = apparentEquatorial(jde);
  return {
    raDeg: wrap360Deg(c.ra * DEG_PER_RAD),
    decDeg: c.dec * DEG_PER_RAD,
    distanceKm: radius(J2000Century(jde)) * KM_PER_AU,
  };
}
