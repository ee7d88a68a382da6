/**
 * Steps for placing a mask centre, as the PA has steps for turning: the centre's offsets from the galaxy centre in the
 * sky frame (gnomonic about the galaxy centre, xi East and eta North, arcsec) are rounded to multiples of the step, so
 * masks typed or dragged land on a regular grid about the galaxy (step 0: exactly where given).
 */
import { skyToTangentArcsec, tangentCentre, tangentToSkyDeg } from '../../core/sky/tangentPlane';

/** The centre steps offered, arcsec (0: exact). */
export const CENTRE_SNAP_STEPS_ARCSEC = [0, 0.1, 1, 5, 10] as const;

/** A sky position (degrees) moved to the nearest point whose xi and eta about the galaxy centre are multiples of `stepArcsec`. */
export function snapCentreDeg(galaxy: { raDeg: number; decDeg: number }, raDeg: number, decDeg: number, stepArcsec: number): { raDeg: number; decDeg: number } {
  if (!(stepArcsec > 0)) return { raDeg, decDeg };
  const c = tangentCentre(galaxy.raDeg, galaxy.decDeg);
  const t = skyToTangentArcsec(c, raDeg, decDeg);
  if (!t) return { raDeg, decDeg };
  const snap = (v: number) => Math.round(v / stepArcsec) * stepArcsec;
  const s = tangentToSkyDeg(c, snap(t.xiArcsec), snap(t.etaArcsec));
  return { raDeg: s.raDeg, decDeg: s.decDeg };
}
