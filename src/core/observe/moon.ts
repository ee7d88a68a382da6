/**
 * The Moon: apparent geocentric place of date (Meeus ch. 47 via astronomia moonposition, plus nutation
 * in longitude and the true obliquity, as in Meeus example 47.a), topocentric place for an observer
 * (Meeus ch. 40, done with vectors) and illuminated fraction (Meeus ch. 48). Degrees and km.
 */
import { position as moonEcliptic } from 'astronomia/moonposition';
import { Ecliptic } from 'astronomia/coord';
import { Coord, illuminated } from 'astronomia/base';
import { phaseAngleEquatorial } from 'astronomia/moonillum';
import { Earth76 } from 'astronomia/globe';
import { DEG_PER_RAD, RAD_PER_DEG, wrap360Deg } from '../sky/angles';
import type { EquatorialOfDate } from './sun';
import { nutationAt, type NutationRad } from './time';
import { quadraticThrough, unwrapNearDeg } from './interpolate';
import { altitudeDeg } from './horizon';
import { PMath } from '../numeric/portableMath';

/** Equatorial radius of the Earth in km used with astronomia's ellipsoid (Meeus's IAU 1976 value). */
export const EARTH_RADIUS_KM = 6378.14;

/**
 * Apparent geocentric RA/Dec of date (degrees) and distance (km) of the Moon at a Julian ephemeris day; a nutation
 * computed for a nearby moment (within a day: < 0.1 arcsec difference) may be passed to save its cost.
 */
export function moonEquatorialOfDate(jde: number, nut: NutationRad = nutationAt(jde)): EquatorialOfDate {
  const p = moonEcliptic(jde);
  const eq = new Ecliptic(p.lon + nut.dPsi, p.lat).toEquatorial(nut.trueObliquity);
  return { raDeg: wrap360Deg(eq.ra * DEG_PER_RAD), decDeg: eq.dec * DEG_PER_RAD, distanceKm: p.range };
}

export interface SiteGeodetic {
  latDeg: number;
  /** East positive, degrees. */
  lonDeg: number;
  elevationM: number;
}

/**
 * Topocentric RA/Dec of date (degrees) of a body at geocentric place `geo` (distance in km), seen from `site`
 * when the local apparent sidereal time is localSiderealDeg: the observer's vector is subtracted from the body's.
 */
export function topocentricEquatorial(geo: EquatorialOfDate, site: SiteGeodetic, localSiderealDeg: number): EquatorialOfDate {
  const [rhoSin, rhoCos] = Earth76.parallaxConstants(site.latDeg * RAD_PER_DEG, site.elevationM);
  const r = geo.distanceKm / EARTH_RADIUS_KM;
  const a = geo.raDeg * RAD_PER_DEG, d = geo.decDeg * RAD_PER_DEG, th = localSiderealDeg * RAD_PER_DEG;
  const x = r * PMath.cos(d) * PMath.cos(a) - rhoCos * PMath.cos(th);
  const y = r * PMath.cos(d) * PMath.sin(a) - rhoCos * PMath.sin(th);
  const z = r * PMath.sin(d) - rhoSin;
  const rho = Math.sqrt(x * x + y * y + z * z);
  return {
    raDeg: wrap360Deg(PMath.atan2(y, x) * DEG_PER_RAD),
    decDeg: PMath.asin(z / rho) * DEG_PER_RAD,
    distanceKm: rho * EARTH_RADIUS_KM,
  };
}

/** Illuminated fraction (0..1) of the Moon's disk from geocentric Moon and Sun places (Meeus 48.1, 48.2). */
export function moonIlluminatedFraction(moon: EquatorialOfDate, sun: EquatorialOfDate): number {
  const i = phaseAngleEquatorial(
    new Coord(moon.raDeg * RAD_PER_DEG, moon.decDeg * RAD_PER_DEG, moon.distanceKm),
    new Coord(sun.raDeg * RAD_PER_DEG, sun.decDeg * RAD_PER_DEG, sun.distanceKm),
  );
  return illuminated(i);
}

/** The Moon over one interval: interpolated geocentric place and topocentric geometric altitude (degrees) at a JD (UT). */
export interface MoonTrack {
  geocentric(jdUt: number): EquatorialOfDate;
  altitudeDeg(jdUt: number): number;
}

/**
 * The Moon over [jd0, jd0 + span]: its geocentric place is the quadratic through exact places at the start, middle
 * and end of the interval, made topocentric at each moment. `geoAt` gives the exact geocentric place at a JD (UT)
 * (callers may cache it across nights). Good to about 10 arcsec over a day (test: < 30 arcsec in altitude).
 */
export function moonTrack(
  jd0: number, spanDays: number, site: SiteGeodetic, localSiderealDeg: (jdUt: number) => number, geoAt: (jdUt: number) => EquatorialOfDate,
): MoonTrack {
  const g0 = geoAt(jd0), g1 = geoAt(jd0 + spanDays / 2), g2 = geoAt(jd0 + spanDays);
  const r0 = g0.raDeg, r1 = unwrapNearDeg(r0, g1.raDeg), r2 = unwrapNearDeg(r1, g2.raDeg);
  const geocentric = (jd: number): EquatorialOfDate => {
    const u = (jd - jd0) / spanDays;
    return {
      raDeg: quadraticThrough(r0, r1, r2, u),
      decDeg: quadraticThrough(g0.decDeg, g1.decDeg, g2.decDeg, u),
      distanceKm: quadraticThrough(g0.distanceKm, g1.distanceKm, g2.distanceKm, u),
    };
  };
  return {
    geocentric,
    altitudeDeg: (jd) => {
      const lst = localSiderealDeg(jd);
      const topo = topocentricEquatorial(geocentric(jd), site, lst);
      return altitudeDeg(lst - topo.raDeg, topo.decDeg, site.latDeg);
    },
  };
}
