/**
 * The checker's own geometry, written from the contract alone (it shares no code with the solver's geometry):
 * slit corners with tilt, point-in-polygon with a boundary tolerance, and containment of a convex quadrilateral
 * in a possibly non-convex polygon. Mask frame, arcsec; tilt turns the slit's +y direction towards +x.
 */
import { PMath } from '../numeric/portableMath';

export type Pt = readonly [number, number];

/** Corners of a row: y from y - lenBelow to y + lenAbove, x +- width/2 about (x, y), then rotated by tiltDeg about (x, y). */
export function rowCorners(r: { xArcsec: number; yArcsec: number; lenBelowArcsec: number; lenAboveArcsec: number; widthArcsec: number; tiltDeg: number }): Pt[] {
  const a = (r.tiltDeg * Math.PI) / 180;
  // Unit vectors of the tilted slit: along (sin a, cos a), across (cos a, -sin a).
  const ax = PMath.sin(a), ay = PMath.cos(a), cx = PMath.cos(a), cy = -PMath.sin(a);
  const h = r.widthArcsec / 2;
  const at = (across: number, along: number): Pt => [r.xArcsec + across * cx + along * ax, r.yArcsec + across * cy + along * ay];
  return [at(-h, -r.lenBelowArcsec), at(h, -r.lenBelowArcsec), at(h, r.lenAboveArcsec), at(-h, r.lenAboveArcsec)];
}

function distToSegment(p: Pt, a: Pt, b: Pt): number {
  const dx = b[0] - a[0], dy = b[1] - a[1];
  const l2 = dx * dx + dy * dy;
  const t = l2 === 0 ? 0 : Math.max(0, Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / l2));
  return PMath.hypot(p[0] - a[0] - t * dx, p[1] - a[1] - t * dy);
}

/** Inside or within tolArcsec of the outline (winding number, so either orientation works). */
export function insidePolygon(p: Pt, poly: readonly Pt[], tolArcsec: number): boolean {
  let wn = 0;
  for (let i = 0; i < poly.length; i++) {
    const a = poly[i], b = poly[(i + 1) % poly.length];
    if (distToSegment(p, a, b) <= tolArcsec) return true;
    const side = (b[0] - a[0]) * (p[1] - a[1]) - (p[0] - a[0]) * (b[1] - a[1]);
    if (a[1] <= p[1]) { if (b[1] > p[1] && side > 0) wn++; }
    else if (b[1] <= p[1] && side < 0) wn--;
  }
  return wn !== 0;
}

/**
 * True when the convex quad lies inside the polygon: every corner inside (tolerance tolArcsec), and no polygon edge
 * reaches more than tolArcsec into the quad (each edge is clipped to the quad, Cyrus-Beck, and the depth of the
 * clipped piece below the quad's sides measured).
 */
export function quadInside(quad: readonly Pt[], poly: readonly Pt[], tolArcsec: number): boolean {
  if (!quad.every((c) => insidePolygon(c, poly, tolArcsec))) return false;
  // Orientation of the quad, for inward normals.
  let area = 0;
  for (let i = 0; i < quad.length; i++) area += quad[i][0] * quad[(i + 1) % quad.length][1] - quad[(i + 1) % quad.length][0] * quad[i][1];
  const s = area >= 0 ? 1 : -1;
  const sides = quad.map((a, i) => {
    const b = quad[(i + 1) % quad.length];
    const len = PMath.hypot(b[0] - a[0], b[1] - a[1]) || 1;
    // Inward unit normal and offset: depth(p) = n . (p - a) >= 0 inside.
    return { nx: (-s * (b[1] - a[1])) / len, ny: (s * (b[0] - a[0])) / len, a };
  });
  const depth = (p: Pt) => Math.min(...sides.map((e) => e.nx * (p[0] - e.a[0]) + e.ny * (p[1] - e.a[1])));
  for (let i = 0; i < poly.length; i++) {
    const p = poly[i], q = poly[(i + 1) % poly.length];
    let t0 = 0, t1 = 1;
    let inside = true;
    for (const e of sides) {
      const d0 = e.nx * (p[0] - e.a[0]) + e.ny * (p[1] - e.a[1]);
      const d1 = e.nx * (q[0] - e.a[0]) + e.ny * (q[1] - e.a[1]);
      if (d0 < 0 && d1 < 0) { inside = false; break; }
      if (d0 < 0) t0 = Math.max(t0, d0 / (d0 - d1));
      else if (d1 < 0) t1 = Math.min(t1, d0 / (d0 - d1));
      if (t0 > t1) { inside = false; break; }
    }
    if (!inside) continue;
    // Depth along the clipped piece is the minimum of linear functions of t (concave): its maximum lies at an end
    // or where two of those lines cross, so evaluate exactly there.
    const lines = sides.map((e) => {
      const d0 = e.nx * (p[0] - e.a[0]) + e.ny * (p[1] - e.a[1]);
      const d1 = e.nx * (q[0] - e.a[0]) + e.ny * (q[1] - e.a[1]);
      return { c: d0, m: d1 - d0 };
    });
    const ts = [t0, t1];
    for (let a = 0; a < lines.length; a++) for (let b = a + 1; b < lines.length; b++) {
      const dm = lines[a].m - lines[b].m;
      if (dm !== 0) { const t = (lines[b].c - lines[a].c) / dm; if (t > t0 && t < t1) ts.push(t); }
    }
    for (const t of ts) if (depth([p[0] + t * (q[0] - p[0]), p[1] + t * (q[1] - p[1])]) > tolArcsec) return false;
  }
  return true;
}
