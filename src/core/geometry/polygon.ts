/** Planar polygons in the mask frame (x, y in arcsec); corners in order, either orientation, may be non-convex. */

export type Corner = readonly [number, number];

/** True when point (x, y) lies inside or on the boundary of the polygon (even-odd rule, boundary inclusive). */
export function pointInPolygon(xArcsec: number, yArcsec: number, polygon: readonly Corner[]): boolean {
  let inside = false;
  const n = polygon.length;
  for (let i = 0, j = n - 1; i < n; j = i++) {
    const [xi, yi] = polygon[i];
    const [xj, yj] = polygon[j];
    if (onSegment(xArcsec, yArcsec, xi, yi, xj, yj)) return true;
    if (yi > yArcsec !== yj > yArcsec && xArcsec < ((xj - xi) * (yArcsec - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

function onSegment(px: number, py: number, ax: number, ay: number, bx: number, by: number): boolean {
  const cross = (bx - ax) * (py - ay) - (by - ay) * (px - ax);
  const len = Math.hypot(bx - ax, by - ay);
  if (Math.abs(cross) > 1e-9 * Math.max(1, len)) return false;
  return px >= Math.min(ax, bx) - 1e-9 && px <= Math.max(ax, bx) + 1e-9 && py >= Math.min(ay, by) - 1e-9 && py <= Math.max(ay, by) + 1e-9;
}

/** Proper crossing of segments ab and cd (touching at shared corners does not count). */
function segmentsCross(a: Corner, b: Corner, c: Corner, d: Corner): boolean {
  const o = (p: Corner, q: Corner, r: Corner) => Math.sign((q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0]));
  const o1 = o(a, b, c), o2 = o(a, b, d), o3 = o(c, d, a), o4 = o(c, d, b);
  return o1 * o2 < 0 && o3 * o4 < 0;
}

/** True when two non-adjacent edges of the polygon cross. */
export function polygonSelfIntersects(polygon: readonly Corner[]): boolean {
  const n = polygon.length;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      if (j === i || (j + 1) % n === i || (i + 1) % n === j) continue;
      if (segmentsCross(polygon[i], polygon[(i + 1) % n], polygon[j], polygon[(j + 1) % n])) return true;
    }
  }
  return false;
}

/** Axis-aligned bounds of a polygon in arcsec. */
export function polygonBounds(polygon: readonly Corner[]): { minX: number; maxX: number; minY: number; maxY: number } {
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  for (const [x, y] of polygon) {
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  return { minX, maxX, minY, maxY };
}

/** True when every corner of the rectangle [x0,x1] x [y0,y1] is inside the polygon and no polygon edge cuts into it. */
export function rectInPolygon(x0: number, x1: number, y0: number, y1: number, polygon: readonly Corner[]): boolean {
  if (!pointInPolygon(x0, y0, polygon) || !pointInPolygon(x1, y0, polygon) || !pointInPolygon(x0, y1, polygon) || !pointInPolygon(x1, y1, polygon)) return false;
  // A non-convex outline may have a notch poking into the rectangle between its corners.
  for (const [px, py] of polygon) {
    if (px > x0 + 1e-9 && px < x1 - 1e-9 && py > y0 + 1e-9 && py < y1 - 1e-9) return false;
  }
  return true;
}
