/**
 * Targets projected into a mask's frame: gnomonic projection about the mask centre (xi East, eta North, arcsec),
 * then rotated by the mask PA into (x along dispersion, y along slits) exactly as the contract's mask frame.
 */
import { maskToSkyArcsec, maskTurn, skyToMaskTurned } from '../sky/frames';
import { skyToTangentArcsec, tangentCentre, tangentToSkyDeg } from '../sky/tangentPlane';
import type { MaskPointing } from '../geometry/maskSolution';
import { ARCSEC_PER_RAD, RAD_PER_DEG } from '../sky/angles';
import { PMath } from '../numeric/portableMath';

/** Mask-frame positions (arcsec) of many sky positions (degrees); NaN where a point has no gnomonic image. */
export function projectToMaskArcsec(
  mask: Pick<MaskPointing, 'raDeg' | 'decDeg' | 'paDeg'>,
  raDeg: ArrayLike<number>,
  decDeg: ArrayLike<number>,
): { xArcsec: Float64Array; yArcsec: Float64Array } {
  const n = raDeg.length;
  const xArcsec = new Float64Array(n), yArcsec = new Float64Array(n);
  const centre = tangentCentre(mask.raDeg, mask.decDeg), turn = maskTurn(mask.paDeg);
  for (let i = 0; i < n; i++) {
    const t = skyToTangentArcsec(centre, raDeg[i], decDeg[i]);
    if (!t) { xArcsec[i] = NaN; yArcsec[i] = NaN; continue; }
    const m = skyToMaskTurned(t.xiArcsec, t.etaArcsec, turn);
    xArcsec[i] = m.xArcsec;
    yArcsec[i] = m.yArcsec;
  }
  return { xArcsec, yArcsec };
}

/** Sky position (degrees, ICRS) of the mask-frame point (x, y) in arcsec: the inverse of projectToMaskArcsec. */
export function maskPointToSkyDeg(mask: Pick<MaskPointing, 'raDeg' | 'decDeg' | 'paDeg'>, xArcsec: number, yArcsec: number): { raDeg: number; decDeg: number } {
  const s = maskToSkyArcsec(xArcsec, yArcsec, mask.paDeg);
  return tangentToSkyDeg(tangentCentre(mask.raDeg, mask.decDeg), s.xiArcsec, s.etaArcsec);
}

/** Unit vectors (ICRS, x towards RA 0 Dec 0, z towards the North pole) of sky positions in degrees, for fast projection. */
export interface UnitVectors {
  x: Float64Array;
  y: Float64Array;
  z: Float64Array;
}

/** Unit vectors of many (ra, dec) in degrees. */
export function unitVectors(raDeg: ArrayLike<number>, decDeg: ArrayLike<number>): UnitVectors {
  const n = raDeg.length;
  const x = new Float64Array(n), y = new Float64Array(n), z = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const a = raDeg[i] * RAD_PER_DEG, d = decDeg[i] * RAD_PER_DEG;
    const cd = PMath.cos(d);
    x[i] = cd * PMath.cos(a); y[i] = cd * PMath.sin(a); z[i] = PMath.sin(d);
  }
  return { x, y, z };
}

/**
 * A mask's tangent-plane basis as unit vectors: centre c, East e (e_z = 0) and North n at the mask centre, and
 * sin/cos of the mask PA (degrees East of North). With it a unit vector p projects with dot products only.
 */
export interface MaskBasis {
  cx: number; cy: number; cz: number;
  ex: number; ey: number;
  nx: number; ny: number; nz: number;
  sinPa: number; cosPa: number;
}

/** The tangent-plane basis of a mask centred at (raDeg, decDeg) with position angle paDeg (East of North). */
export function maskBasis(mask: Pick<MaskPointing, 'raDeg' | 'decDeg' | 'paDeg'>): MaskBasis {
  const a0 = mask.raDeg * RAD_PER_DEG, d0 = mask.decDeg * RAD_PER_DEG;
  const ca = PMath.cos(a0), sa = PMath.sin(a0), cd = PMath.cos(d0), sd = PMath.sin(d0);
  return {
    cx: cd * ca, cy: cd * sa, cz: sd,
    ex: -sa, ey: ca,
    nx: -sd * ca, ny: -sd * sa, nz: cd,
    sinPa: PMath.sin(mask.paDeg * RAD_PER_DEG), cosPa: PMath.cos(mask.paDeg * RAD_PER_DEG),
  };
}

/** cos of the angular distance of unit vector p from the mask centre (p . c). */
export function maskCosC(b: MaskBasis, px: number, py: number, pz: number): number {
  return px * b.cx + py * b.cy + pz * b.cz;
}

/**
 * Gnomonic projection of unit vector p (with cosC = p . c > 0) into the mask frame, arcsec, written into `out`:
 * xi = (p . e) / cos c, eta = (p . n) / cos c, then the contract's x = xi cos PA - eta sin PA, y = xi sin PA + eta cos PA.
 */
export function unitToMaskArcsec(b: MaskBasis, px: number, py: number, pz: number, cosC: number, out: { xArcsec: number; yArcsec: number }): void {
  const xi = ((px * b.ex + py * b.ey) / cosC) * ARCSEC_PER_RAD;
  const eta = ((px * b.nx + py * b.ny + pz * b.nz) / cosC) * ARCSEC_PER_RAD;
  out.xArcsec = xi * b.cosPa - eta * b.sinPa;
  out.yArcsec = xi * b.sinPa + eta * b.cosPa;
}

/**
 * Mask-frame (x, y) arcsec of the points `indices` of `u`, by the same gnomonic projection as projectToMaskArcsec
 * written with dot products (cos c = p.centre, xi = p.east / cos c, eta = p.north / cos c): no trigonometry per
 * point. Points farther than maxRadiusArcsec from the centre (or with no gnomonic image) get NaN.
 */
export function projectIndicesToMaskArcsec(
  mask: Pick<MaskPointing, 'raDeg' | 'decDeg' | 'paDeg'>, u: UnitVectors, indices: ArrayLike<number>, maxRadiusArcsec = Infinity,
): { xArcsec: Float64Array; yArcsec: Float64Array } {
  const b = maskBasis(mask);
  const at = { xArcsec: 0, yArcsec: 0 };
  const r = maxRadiusArcsec / ARCSEC_PER_RAD;
  // cos c below which a point is farther than maxRadius on the sky (tan c > r on the plane).
  const minCos = Number.isFinite(r) ? 1 / Math.sqrt(1 + r * r) : 1e-12;
  const n = indices.length;
  const xArcsec = new Float64Array(n), yArcsec = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const i = indices[k];
    const px = u.x[i], py = u.y[i], pz = u.z[i];
    const cosC = maskCosC(b, px, py, pz);
    if (!(cosC > minCos) || !(cosC > 1e-12)) { xArcsec[k] = NaN; yArcsec[k] = NaN; continue; }
    unitToMaskArcsec(b, px, py, pz, cosC, at);
    xArcsec[k] = at.xArcsec;
    yArcsec[k] = at.yArcsec;
  }
  return { xArcsec, yArcsec };
}
