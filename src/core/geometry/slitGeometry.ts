/**
 * Slit rectangles in the mask frame (x along dispersion, y along slits, arcsec). A slit at (x, y) spans
 * y - lenBelow .. y + lenAbove and x - width/2 .. x + width/2 before tilt; tilt rotates that rectangle about
 * (x, y) by tiltDeg, positive turning the slit's upward (+y) direction towards +x.
 */
import { RAD_PER_DEG } from '../sky/angles';
import type { Corner } from './polygon';
import { PMath } from '../numeric/portableMath';

/** The mask-frame shape of a slit or box: centre (x, y), half-lengths below and above along y, width along x, tilt (arcsec, degrees). */
export interface SlitShape {
  xArcsec: number;
  yArcsec: number;
  lenBelowArcsec: number;
  lenAboveArcsec: number;
  widthArcsec: number;
  tiltDeg: number;
}

/** The four corners (mask frame, arcsec) of a slit, in order: lower-left, lower-right, upper-right, upper-left before tilt. */
export function slitCornersArcsec(s: SlitShape): Corner[] {
  const h = s.widthArcsec / 2;
  const local: [number, number][] = [[-h, -s.lenBelowArcsec], [h, -s.lenBelowArcsec], [h, s.lenAboveArcsec], [-h, s.lenAboveArcsec]];
  const t = s.tiltDeg * RAD_PER_DEG, c = PMath.cos(t), sn = PMath.sin(t);
  // Rotation taking +y towards +x by tilt: (dx, dy) -> (dx c + dy s, -dx s + dy c).
  return local.map(([dx, dy]) => [s.xArcsec + dx * c + dy * sn, s.yArcsec - dx * sn + dy * c] as Corner);
}

/** The y extent (arcsec) of a slit's corners, tilt included. */
export function slitYSpanArcsec(s: SlitShape): { lo: number; hi: number } {
  let lo = Infinity, hi = -Infinity;
  for (const [, y] of slitCornersArcsec(s)) {
    if (y < lo) lo = y;
    if (y > hi) hi = y;
  }
  return { lo, hi };
}
