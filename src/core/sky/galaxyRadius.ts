/**
 * Where a sky position lies about a galaxy: circularised elliptical radius R = sqrt(q u^2 + v^2/q) in units of Re
 * (galaxy frame, u along the major axis) and azimuth phi = atan2(v, u) from the major axis, degrees in [0, 360).
 */
import { circularisedRadiusArcsec, galaxyAzimuthDeg, skyToGalaxyArcsec } from './frames';
import { skyToTangentArcsec, tangentCentre } from './tangentPlane';
import { wrap360Deg } from './angles';

/** A galaxy's centre (ICRS degrees), major-axis PA (degrees East of North), axis ratio b/a and Re (arcsec, circularised). */
export interface GalaxyPlacement { raDeg: number; decDeg: number; paDeg: number; axisRatio: number; reArcsec: number }

/** Circularised R/Re and azimuth (degrees from the major axis, [0, 360)) of a sky position (degrees) about the galaxy. */
export function galaxyRadiusAndAzimuth(galaxy: GalaxyPlacement, raDeg: number, decDeg: number): { rRe: number; phiDeg: number } {
  const t = skyToTangentArcsec(tangentCentre(galaxy.raDeg, galaxy.decDeg), raDeg, decDeg);
  return t ? tangentRadiusAndAzimuth(galaxy, t.xiArcsec, t.etaArcsec) : { rRe: Infinity, phiDeg: 0 };
}

/** galaxyRadiusAndAzimuth of a point given by its offset (xi East, eta North, arcsec) on the galaxy's tangent plane. */
export function tangentRadiusAndAzimuth(galaxy: GalaxyPlacement, xiArcsec: number, etaArcsec: number): { rRe: number; phiDeg: number } {
  const g = skyToGalaxyArcsec(xiArcsec, etaArcsec, galaxy.paDeg);
  return {
    rRe: circularisedRadiusArcsec(g.uArcsec, g.vArcsec, galaxy.axisRatio) / galaxy.reArcsec,
    phiDeg: wrap360Deg(galaxyAzimuthDeg(g.uArcsec, g.vArcsec)),
  };
}
