/**
 * Where a sky position lies about a galaxy: circularised elliptical radius R = sqrt(q u^2 + v^2/q) in units of Re
 * (galaxy frame, u along the major axis) and azimuth phi = atan2(v, u) from the major axis, degrees in [0, 360).
 */
import { circularisedRadiusArcsec, galaxyAzimuthDeg, galaxyTurn, skyToGalaxyTurned, type GalaxyTurn } from './frames';
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
export function tangentRadiusAndAzimuth(galaxy: GalaxyPlacement, xiArcsec: number, etaArcsec: number, turn: GalaxyTurn = galaxyTurn(galaxy.paDeg)): { rRe: number; phiDeg: number } {
  return { rRe: tangentRadiusRe(galaxy, xiArcsec, etaArcsec, turn), phiDeg: tangentAzimuthDeg(xiArcsec, etaArcsec, turn) };
}

/** The R/Re of tangentRadiusAndAzimuth alone, with the galaxy's turn made once. */
export function tangentRadiusRe(galaxy: GalaxyPlacement, xiArcsec: number, etaArcsec: number, turn: GalaxyTurn): number {
  const g = skyToGalaxyTurned(xiArcsec, etaArcsec, turn);
  return circularisedRadiusArcsec(g.uArcsec, g.vArcsec, galaxy.axisRatio) / galaxy.reArcsec;
}

/** The azimuth of tangentRadiusAndAzimuth alone (degrees from the major axis towards +v, [0, 360)). */
export function tangentAzimuthDeg(xiArcsec: number, etaArcsec: number, turn: GalaxyTurn): number {
  const g = skyToGalaxyTurned(xiArcsec, etaArcsec, turn);
  return wrap360Deg(galaxyAzimuthDeg(g.uArcsec, g.vArcsec));
}
