/** Planar polygons in the mask frame (x, y in arcsec); corners in order, either orientation, may be non-convex. */
import { PMath } from '../numeric/portableMath';

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
  const len = PMath.hypot(bx - ax, by - ay);
  if (Math.abs(cross) > 1e-9 * Math.max(1, len)) return false;
  return px >= Math.min(ax, bx) - 1e-9 && px <= Math.max(ax, bx) + 1e-9 && py >= Math.min(ay, by) - 1e-9 && py <= Math.max(ay, by) + 1e-9;
}

type Orientation = -1 | 0 | 1;
const orient = (p: Corner, q: Corner, r: Corner): Orientation =>
  Math.sign((q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0])) as Orientation;

/** True when r, known to be collinear with p and q, lies within the bounding box of segment pq. */
function withinSpan(p: Corner, q: Corner, r: Corner): boolean {
  return r[0] >= Math.min(p[0], q[0]) && r[0] <= Math.max(p[0], q[0]) && r[1] >= Math.min(p[1], q[1]) && r[1] <= Math.max(p[1], q[1]);
}

/** True when closed segments ab and cd share at least one point (crossing, touching or overlapping). */
function segmentsMeet(a: Corner, b: Corner, c: Corner, d: Corner): boolean {
  const o1 = orient(a, b, c), o2 = orient(a, b, d), o3 = orient(c, d, a), o4 = orient(c, d, b);
  if (o1 * o2 < 0 && o3 * o4 < 0) return true;
  return (o1 === 0 && withinSpan(a, b, c)) || (o2 === 0 && withinSpan(a, b, d)) || (o3 === 0 && withinSpan(c, d, a)) || (o4 === 0 && withinSpan(c, d, b));
}

/**
 * True when the outline is not a simple polygon: two non-adjacent edges cross or touch, or two
 * adjacent edges fold back onto each other. Repeated consecutive corners are ignored.
 */
export function polygonSelfIntersects(polygon: readonly Corner[]): boolean {
  const pts = polygon.filter((p, i) => {
    const q = polygon[(i + 1) % polygon.length];
    return polygon.length < 2 || p[0] !== q[0] || p[1] !== q[1];
  });
  const n = pts.length;
  if (n < 3) return false;
  for (let i = 0; i < n; i++) {
    const a = pts[i], b = pts[(i + 1) % n], c = pts[(i + 2) % n];
    // Adjacent edges ab, bc fold back when c lies on ab's line on b's near side (a spike).
    if (orient(a, b, c) === 0 && (c[0] - b[0]) * (a[0] - b[0]) + (c[1] - b[1]) * (a[1] - b[1]) > 0) return true;
    for (let j = i + 2; j < n; j++) {
      if ((j + 1) % n === i) continue; // adjacent through the closing edge
      if (segmentsMeet(a, b, pts[j], pts[(j + 1) % n])) return true;
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

/**
 * True when the rectangle [x0,x1] x [y0,y1] (mask frame, arcsec) lies inside the polygon: every corner
 * inside or on the outline, and no polygon edge passing through the rectangle's interior.
 */
export function rectInPolygon(x0: number, x1: number, y0: number, y1: number, polygon: readonly Corner[]): boolean {
  if (!pointInPolygon(x0, y0, polygon) || !pointInPolygon(x1, y0, polygon) || !pointInPolygon(x0, y1, polygon) || !pointInPolygon(x1, y1, polygon)) return false;
  // A non-convex outline may have a notch or slot cutting into the rectangle between its corners,
  // with or without a polygon corner inside the rectangle.
  const n = polygon.length;
  for (let i = 0, j = n - 1; i < n; j = i++) {
    if (segmentEntersRectInterior(polygon[j], polygon[i], x0, x1, y0, y1)) return false;
  }
  return true;
}

/** True when segment pq passes through the open interior of [x0,x1] x [y0,y1] (touching its sides does not count). */
function segmentEntersRectInterior(p: Corner, q: Corner, x0: number, x1: number, y0: number, y1: number): boolean {
  // Liang-Barsky clip of p + t (q - p), t in [0, 1], to the closed rectangle.
  const dx = q[0] - p[0], dy = q[1] - p[1];
  let t0 = 0, t1 = 1;
  const clip = (den: number, num: number): boolean => {
    // Keep the part where den * t <= num.
    if (den === 0) return num >= 0;
    const t = num / den;
    if (den > 0) t1 = Math.min(t1, t);
    else t0 = Math.max(t0, t);
    return t0 <= t1;
  };
  if (!clip(-dx, p[0] - x0) || !clip(dx, x1 - p[0]) || !clip(-dy, p[1] - y0) || !clip(dy, y1 - p[1])) return false;
  if (t1 - t0 <= 0) return false;
  // The clipped piece is convex inside the closed rectangle: it reaches the interior exactly when its midpoint does.
  const tm = 0.5 * (t0 + t1);
  const mx = p[0] + tm * dx, my = p[1] + tm * dy;
  const eps = 1e-9;
  return mx > x0 + eps && mx < x1 - eps && my > y0 + eps && my < y1 - eps;
}

/**
 * True when a convex quadrilateral (corners in order, mask frame arcsec) lies inside the polygon, boundary inclusive:
 * every corner inside, no polygon corner strictly inside the quad, and no polygon edge properly crossing a quad edge
 * (used for tilted slits, whose sides are not axis-aligned).
 */
export function quadInPolygon(quad: readonly Corner[], polygon: readonly Corner[]): boolean {
  for (const [x, y] of quad) if (!pointInPolygon(x, y, polygon)) return false;
  for (const [px, py] of polygon) if (strictlyInsideConvex(px, py, quad)) return false;
  const n = polygon.length, m = quad.length;
  for (let i = 0; i < n; i++) {
    const a = polygon[i], b = polygon[(i + 1) % n];
    for (let j = 0; j < m; j++) if (orient(a, b, quad[j]) * orient(a, b, quad[(j + 1) % m]) < 0 && orient(quad[j], quad[(j + 1) % m], a) * orient(quad[j], quad[(j + 1) % m], b) < 0) return false;
  }
  return true;
}

/** True when (x, y) is strictly inside a convex polygon given in either orientation (margin 1e-9 arcsec). */
function strictlyInsideConvex(x: number, y: number, quad: readonly Corner[]): boolean {
  let sign = 0;
  for (let i = 0; i < quad.length; i++) {
    const [ax, ay] = quad[i];
    const [bx, by] = quad[(i + 1) % quad.length];
    const len = PMath.hypot(bx - ax, by - ay) || 1;
    const c = ((bx - ax) * (y - ay) - (by - ay) * (x - ax)) / len;
    if (Math.abs(c) <= 1e-9) return false;
    const s = Math.sign(c);
    if (sign === 0) sign = s;
    else if (s !== sign) return false;
  }
  return true;
}

/**
 * The free y-range (arcsec, mask frame) of the vertical strip x in [x0, x1] around height yRef: the largest
 * [lo, hi] containing yRef such that the rectangle [x0, x1] x [lo, hi] lies inside the polygon. Null when the
 * horizontal segment at yRef across the strip is not inside the polygon.
 */
export function stripFreeYRange(x0: number, x1: number, yRef: number, polygon: readonly Corner[]): { lo: number; hi: number } | null {
  if (!pointInPolygon((x0 + x1) / 2, yRef, polygon)) return null;
  let lo = -Infinity, hi = Infinity;
  const n = polygon.length;
  for (let i = 0; i < n; i++) {
    let [ax, ay] = polygon[i];
    let [bx, by] = polygon[(i + 1) % n];
    if (ax > bx) { [ax, bx] = [bx, ax]; [ay, by] = [by, ay]; }
    if (bx < x0 || ax > x1) continue; // edge entirely beside the strip
    // An edge lying along a side of the strip only touches it (boundary inclusive).
    if (bx === ax && (ax === x0 || ax === x1)) continue;
    // Clip the edge to the strip and take its y extent there.
    let ya: number, yb: number;
    if (bx === ax) { ya = ay; yb = by; }
    else {
      const t0 = Math.max(0, (x0 - ax) / (bx - ax)), t1 = Math.min(1, (x1 - ax) / (bx - ax));
      ya = ay + (by - ay) * t0;
      yb = ay + (by - ay) * t1;
    }
    const eMin = Math.min(ya, yb), eMax = Math.max(ya, yb);
    if (eMin >= yRef) hi = Math.min(hi, eMin);
    else if (eMax <= yRef) lo = Math.max(lo, eMax);
    else return null; // the edge cuts the strip at height yRef
  }
  return { lo, hi };
}
