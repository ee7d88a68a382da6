/**
 * Gnomonic (TAN) projection about a centre (ra0, dec0), all positions in degrees (ICRS).
 * Sky frame: xi towards East, eta towards North, both in arcseconds on the tangent plane
 * (Calabretta & Greisen 2002, A&A 395, 1077: R = (180/pi) cot(theta)).
 */
import { ARCSEC_PER_RAD, DEG_PER_RAD, RAD_PER_DEG, wrap360Deg } from './angles';
import { PMath } from '../numeric/portableMath';

export interface TangentPointArcsec {
  xiArcsec: number;
  etaArcsec: number;
}

export interface SkyPointDeg {
  raDeg: number;
  decDeg: number;
}

/** A precomputed projection centre, for projecting many points about one centre quickly. */
export interface TangentCentre {
  ra0Deg: number;
  dec0Deg: number;
  sinDec0: number;
  cosDec0: number;
}

/** Make a projection centre from (ra0, dec0) in degrees. */
export function tangentCentre(ra0Deg: number, dec0Deg: number): TangentCentre {
  const d0 = dec0Deg * RAD_PER_DEG;
  return { ra0Deg, dec0Deg, sinDec0: PMath.sin(d0), cosDec0: PMath.cos(d0) };
}

/**
 * Project (ra, dec) in degrees onto the tangent plane at `centre`; xi East, eta North, arcsec.
 * Points 90 degrees or more from the centre have no gnomonic image: returns null.
 */
export function skyToTangentArcsec(centre: TangentCentre, raDeg: number, decDeg: number): TangentPointArcsec | null {
  const d = decDeg * RAD_PER_DEG;
  const dra = (raDeg - centre.ra0Deg) * RAD_PER_DEG;
  const sd = PMath.sin(d), cd = PMath.cos(d);
  const cdra = PMath.cos(dra);
  const cosC = centre.sinDec0 * sd + centre.cosDec0 * cd * cdra;
  if (!(cosC > 1e-12)) return null;
  const xi = (cd * PMath.sin(dra)) / cosC;
  const eta = (centre.cosDec0 * sd - centre.sinDec0 * cd * cdra) / cosC;
  return { xiArcsec: xi * ARCSEC_PER_RAD, etaArcsec: eta * ARCSEC_PER_RAD };
}

/** Inverse gnomonic projection: (xi East, eta North) in arcsec about `centre` to (ra, dec) in degrees, ra in [0, 360). */
export function tangentToSkyDeg(centre: TangentCentre, xiArcsec: number, etaArcsec: number): SkyPointDeg {
  const xi = xiArcsec / ARCSEC_PER_RAD;
  const eta = etaArcsec / ARCSEC_PER_RAD;
  const den = centre.cosDec0 - eta * centre.sinDec0;
  const raDeg = wrap360Deg(centre.ra0Deg + PMath.atan2(xi, den) * DEG_PER_RAD);
  const decDeg = PMath.atan2(centre.sinDec0 + eta * centre.cosDec0, PMath.hypot(xi, den)) * DEG_PER_RAD;
  return { raDeg, decDeg };
}
