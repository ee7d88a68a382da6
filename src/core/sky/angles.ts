/** Angle helpers. Every function says its unit in its name. */

export const DEG_PER_RAD = 180 / Math.PI;
export const RAD_PER_DEG = Math.PI / 180;
/** Arcseconds in one radian (common practice value 206264.806...). */
export const ARCSEC_PER_RAD = (180 / Math.PI) * 3600;
export const ARCSEC_PER_DEG = 3600;

/** Wrap an angle in degrees into [0, 360). */
export function wrap360Deg(angleDeg: number): number {
  const r = angleDeg % 360;
  const w = r < 0 ? r + 360 : r;
  return w === 360 ? 0 : w;
}

/** Wrap an angle in degrees into [-180, 180). */
export function wrap180Deg(angleDeg: number): number {
  return wrap360Deg(angleDeg + 180) - 180;
}

/** Wrap an hour angle in hours into [-12, 12). */
export function wrap12Hours(hours: number): number {
  return wrap360Deg(hours * 15 + 180) / 15 - 12;
}
