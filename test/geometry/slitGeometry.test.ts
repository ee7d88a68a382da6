import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { pointInPolygon, quadInPolygon, rectInPolygon, stripFreeYRange, type Corner } from '../../src/core/geometry/polygon';
import { slitCornersArcsec, slitYSpanArcsec } from '../../src/core/geometry/slitGeometry';
import { quadInside, rowCorners } from '../../src/core/check/geometry';

// A U-shaped outline: a slot from y = -50 up to the top edge between x = -10 and x = 10.
const U: Corner[] = [[-100, -100], [100, -100], [100, 100], [10, 100], [10, -50], [-10, -50], [-10, 100], [-100, 100]];

/** Dense sampling of a rectangle: every sample inside the polygon (the slow, obvious route). */
function rectInsideBySampling(x0: number, x1: number, y0: number, y1: number, poly: Corner[]): boolean {
  for (let i = 0; i <= 40; i++) for (let j = 0; j <= 40; j++) {
    if (!pointInPolygon(x0 + ((x1 - x0) * i) / 40, y0 + ((y1 - y0) * j) / 40, poly)) return false;
  }
  return true;
}

describe('footprint containment', () => {
  it('rejects a rectangle spanning the slot of a non-convex outline though all its corners are inside', () => {
    // Corners (-20, 0), (20, 0), (20, 10), (-20, 10) are all in the arms; the slot cuts the middle.
    expect([[-20, 0], [20, 0], [20, 10], [-20, 10]].every(([x, y]) => pointInPolygon(x, y, U))).toBe(true);
    expect(quadInPolygon([[-20, 0], [20, 0], [20, 10], [-20, 10]], U)).toBe(false);
    expect(quadInside([[-20, 0], [20, 0], [20, 10], [-20, 10]], U, 1e-6)).toBe(false);
    expect(stripFreeYRange(-20, 20, 5, U)).toBeNull();
    // Below the slot the same width fits, up to the slot's bottom at y = -50.
    expect(stripFreeYRange(-20, 20, -70, U)).toEqual({ lo: -100, hi: -50 });
    expect(stripFreeYRange(20, 30, 0, U)).toEqual({ lo: -100, hi: 100 });
  });

  it('strip free range agrees with dense sampling on random strips of a random outline (property)', () => {
    const ring: Corner[] = Array.from({ length: 12 }, (_, i) => {
      const a = (i / 12) * 2 * Math.PI, r = i % 2 ? 60 : 100;
      return [r * Math.cos(a), r * Math.sin(a)] as Corner;
    });
    fc.assert(fc.property(fc.double({ min: -95, max: 95, noNaN: true }), fc.double({ min: 0.2, max: 8, noNaN: true }), fc.double({ min: -95, max: 95, noNaN: true }), (x, w, y) => {
      const r = stripFreeYRange(x - w / 2, x + w / 2, y, ring);
      if (r === null) return !rectInPolygon(x - w / 2, x + w / 2, y - 1e-3, y + 1e-3, ring);
      // The free range is inside, and a little more on either side is not.
      const inside = rectInsideBySampling(x - w / 2, x + w / 2, r.lo + 1e-7, r.hi - 1e-7, ring);
      const tooFar = !rectInPolygon(x - w / 2, x + w / 2, r.lo - 0.05, r.hi, ring) && !rectInPolygon(x - w / 2, x + w / 2, r.lo, r.hi + 0.05, ring);
      return inside && tooFar;
    }), { numRuns: 300 });
  });

  it('solver and checker corner conventions agree, tilt included (tilt turns +y towards +x)', () => {
    fc.assert(fc.property(fc.double({ min: -50, max: 50, noNaN: true }), fc.double({ min: -50, max: 50, noNaN: true }), fc.double({ min: 1, max: 10, noNaN: true }), fc.double({ min: 1, max: 10, noNaN: true }), fc.double({ min: 0.3, max: 2, noNaN: true }), fc.double({ min: -45, max: 45, noNaN: true }), (x, y, lb, la, w, t) => {
      const s = { xArcsec: x, yArcsec: y, lenBelowArcsec: lb, lenAboveArcsec: la, widthArcsec: w, tiltDeg: t };
      const a = slitCornersArcsec(s), b = rowCorners(s);
      return a.every((c, i) => Math.abs(c[0] - b[i][0]) < 1e-9 && Math.abs(c[1] - b[i][1]) < 1e-9);
    }));
    // A slit tilted by +90 deg would point along +x: its upper end moves to +x.
    const c = slitCornersArcsec({ xArcsec: 0, yArcsec: 0, lenBelowArcsec: 0, lenAboveArcsec: 10, widthArcsec: 0, tiltDeg: 90 });
    expect(c[2][0]).toBeCloseTo(10, 12);
    expect(c[2][1]).toBeCloseTo(0, 12);
    expect(slitYSpanArcsec({ xArcsec: 0, yArcsec: 0, lenBelowArcsec: 3, lenAboveArcsec: 5, widthArcsec: 1, tiltDeg: 0 })).toEqual({ lo: -3, hi: 5 });
  });

  it('checker containment and solver containment agree on random tilted slits in the U outline (property)', () => {
    fc.assert(fc.property(fc.double({ min: -110, max: 110, noNaN: true }), fc.double({ min: -110, max: 110, noNaN: true }), fc.double({ min: 1, max: 30, noNaN: true }), fc.double({ min: -40, max: 40, noNaN: true }), (x, y, len, t) => {
      const q = slitCornersArcsec({ xArcsec: x, yArcsec: y, lenBelowArcsec: len / 2, lenAboveArcsec: len / 2, widthArcsec: 1, tiltDeg: t });
      return quadInPolygon(q, U) === quadInside(q, U, 1e-9);
    }), { numRuns: 2000 });
  });
});
