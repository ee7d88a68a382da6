/** Interpolation helpers for quantities sampled at the start, middle and end of an interval (u = 0, 0.5, 1). */

/** Lagrange quadratic through (0, y0), (0.5, y1), (1, y2), evaluated at u (dimensionless). */
export function quadraticThrough(y0: number, y1: number, y2: number, u: number): number {
  return y0 * (2 * u - 1) * (u - 1) + y1 * 4 * u * (1 - u) + y2 * u * (2 * u - 1);
}

/** Add whole turns (360 deg) to v so it lies within 180 deg of ref: for interpolating angles across 0/360. */
export function unwrapNearDeg(ref: number, v: number): number {
  return v + 360 * Math.round((ref - v) / 360);
}
