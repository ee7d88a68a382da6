/**
 * Planar frames on the tangent plane, exactly as the interface contract defines them.
 * Sky frame: xi East, eta North (arcsec). Mask frame at position angle PA (degrees East of North):
 * x along the dispersion, y along the slits; at PA = 0, y points North and x points East.
 * Galaxy frame at major-axis PA theta: u along the major axis, v along the minor axis.
 */
import { DEG_PER_RAD, RAD_PER_DEG } from './angles';
import { PMath } from '../numeric/portableMath';

export interface MaskPointArcsec {
  xArcsec: number;
  yArcsec: number;
}

export interface GalaxyPointArcsec {
  uArcsec: number;
  vArcsec: number;
}

/** Sky (xi East, eta North) to mask frame at paDeg: y = xi sinPA + eta cosPA, x = xi cosPA - eta sinPA (arcsec). */
export function skyToMaskArcsec(xiArcsec: number, etaArcsec: number, paDeg: number): MaskPointArcsec {
  return skyToMaskTurned(xiArcsec, etaArcsec, maskTurn(paDeg));
}

/** Sine and cosine of a position angle (degrees East of North), made once for many turned projections (mask or galaxy). */
export interface PaTurn { sinPa: number; cosPa: number }

/** The turn of skyToMaskArcsec (mask PA) or skyToGalaxyArcsec (major-axis PA) for paDeg. */
export function paTurn(paDeg: number): PaTurn {
  return { sinPa: PMath.sin(paDeg * RAD_PER_DEG), cosPa: PMath.cos(paDeg * RAD_PER_DEG) };
}

/** A mask PA's turn (skyToMaskTurned). */
export type MaskTurn = PaTurn;
export const maskTurn = paTurn;

/** skyToMaskArcsec with the PA's sine and cosine made once (the same bits). */
export function skyToMaskTurned(xiArcsec: number, etaArcsec: number, turn: MaskTurn): MaskPointArcsec {
  const s = turn.sinPa, c = turn.cosPa;
  return { xArcsec: xiArcsec * c - etaArcsec * s, yArcsec: xiArcsec * s + etaArcsec * c };
}

/** Mask frame at paDeg back to sky (xi East, eta North), arcsec; the inverse of skyToMaskArcsec. */
export function maskToSkyArcsec(xArcsec: number, yArcsec: number, paDeg: number): { xiArcsec: number; etaArcsec: number } {
  const s = PMath.sin(paDeg * RAD_PER_DEG), c = PMath.cos(paDeg * RAD_PER_DEG);
  return { xiArcsec: xArcsec * c + yArcsec * s, etaArcsec: -xArcsec * s + yArcsec * c };
}

/** Sky (xi East, eta North) to galaxy frame at major-axis PA thetaDeg: u = xi sin + eta cos, v = xi cos - eta sin (arcsec). */
export function skyToGalaxyArcsec(xiArcsec: number, etaArcsec: number, thetaDeg: number): GalaxyPointArcsec {
  return skyToGalaxyTurned(xiArcsec, etaArcsec, galaxyTurn(thetaDeg));
}

/** A galaxy's major-axis PA turn (skyToGalaxyTurned). */
export type GalaxyTurn = PaTurn;
export const galaxyTurn = paTurn;

/** skyToGalaxyArcsec with the PA's sine and cosine made once (the same bits). */
export function skyToGalaxyTurned(xiArcsec: number, etaArcsec: number, turn: GalaxyTurn): GalaxyPointArcsec {
  const s = turn.sinPa, c = turn.cosPa;
  return { uArcsec: xiArcsec * s + etaArcsec * c, vArcsec: xiArcsec * c - etaArcsec * s };
}

/** Galaxy frame (u major, v minor) back to sky (xi East, eta North), arcsec. */
export function galaxyToSkyArcsec(uArcsec: number, vArcsec: number, thetaDeg: number): { xiArcsec: number; etaArcsec: number } {
  const m = maskToSkyArcsec(vArcsec, uArcsec, thetaDeg);
  return m;
}

/** Circularised elliptical radius in arcsec: R = sqrt(q u^2 + v^2 / q), q = b/a. */
export function circularisedRadiusArcsec(uArcsec: number, vArcsec: number, axisRatio: number): number {
  return Math.sqrt(axisRatio * uArcsec * uArcsec + (vArcsec * vArcsec) / axisRatio);
}

/** Semi-major-axis elliptical radius in arcsec: a = sqrt(u^2 + (v / q)^2), q = b/a. */
export function semiMajorRadiusArcsec(uArcsec: number, vArcsec: number, axisRatio: number): number {
  const w = vArcsec / axisRatio;
  return Math.sqrt(uArcsec * uArcsec + w * w);
}

/** Azimuth in degrees from the major axis, phi = atan2(v, u), in (-180, 180]. */
export function galaxyAzimuthDeg(uArcsec: number, vArcsec: number): number {
  // `+ 0` turns a negative zero v into +0, so a point on the negative major axis gives +180, not -180.
  return PMath.atan2(vArcsec + 0, uArcsec) * DEG_PER_RAD;
}
