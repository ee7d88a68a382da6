/**
 * Screen geometry of masks for the browser tests: the mask frame to screen pixels as the sky view draws it, its
 * inverse, and point-in-polygon for footprints.
 */
import type { Anchor } from './harness';

export interface Pt { x: number; y: number }
export type Poly = [number, number][];

/**
 * Mask frame (x along dispersion, y along slits; arcsec) of the mask at `a` to screen px, as the sky view draws it
 * (North up, East left, PA East of North): screen = centre + s * (-x cos PA - y sin PA, x sin PA - y cos PA).
 */
export function maskToScreen(a: Anchor, s: number, x: number, y: number): Pt {
  const c = Math.cos((a.pa * Math.PI) / 180), n = Math.sin((a.pa * Math.PI) / 180);
  return { x: a.x + s * (-x * c - y * n), y: a.y + s * (x * n - y * c) };
}

/** The inverse of maskToScreen. */
export function screenToMask(a: Anchor, s: number, p: Pt): Pt {
  const c = Math.cos((a.pa * Math.PI) / 180), n = Math.sin((a.pa * Math.PI) / 180);
  const dx = (p.x - a.x) / s, dy = (p.y - a.y) / s;
  return { x: -(c * dx - n * dy), y: -(n * dx + c * dy) };
}

/** Even-odd point-in-polygon test (mask frame, arcsec). */
export function inPolygon(poly: Poly, x: number, y: number): boolean {
  let inside = false;
  for (let i = 0, j = poly.length - 1; i < poly.length; j = i++) {
    const [xi, yi] = poly[i], [xj, yj] = poly[j];
    if ((yi > y) !== (yj > y) && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}
