import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { pointInPolygon, polygonSelfIntersects, rectInPolygon, type Corner } from '../../src/core/geometry/polygon';

// Footprint outlines (mask frame, arcsec) as the profile loader and the slit checks see them.
const square: Corner[] = [[-100, -100], [100, -100], [100, 100], [-100, 100]];
// A square with a thin slot cut from the top edge down to y = -50 between x = -1 and x = 1.
const slotted: Corner[] = [[-100, -100], [100, -100], [100, 100], [1, 100], [1, -50], [-1, -50], [-1, 100], [-100, 100]];

describe('rectInPolygon', () => {
  it('a slit fully inside, touching the outline, or outside', () => {
    expect(rectInPolygon(-10, 10, -5, 5, square)).toBe(true);
    expect(rectInPolygon(90, 100, -5, 5, square)).toBe(true); // touching the right edge from inside
    expect(rectInPolygon(95, 105, -5, 5, square)).toBe(false);
  });

  it('rejects a slit straddling a slot that has no corner inside the slit', () => {
    // Defect found by this suite and fixed in polygon.ts: only polygon corners inside the rectangle
    // were looked for, so a slot crossing the slit with its corners outside it went unseen.
    expect(pointInPolygon(0, 2.5, slotted)).toBe(false); // the slit centre is in the slot
    expect(rectInPolygon(-10, 10, 0, 5, slotted)).toBe(false);
    // Beside the slot, or sharing the slot's edge as its side, it is fine; below the slot's end too.
    expect(rectInPolygon(1, 10, 0, 5, slotted)).toBe(true);
    expect(rectInPolygon(-10, -1, 0, 5, slotted)).toBe(true);
    expect(rectInPolygon(-10, 10, -60, -55, slotted)).toBe(true);
    // Just reaching the slot's end from below: touching, not entering.
    expect(rectInPolygon(-10, 10, -60, -50, slotted)).toBe(true);
    expect(rectInPolygon(-10, 10, -60, -49, slotted)).toBe(false);
  });

  it('agrees with dense sampling of the rectangle on random rectangles in a non-convex outline (fast-check)', () => {
    const comb: Corner[] = [[-100, -100], [100, -100], [100, 100], [60, 100], [60, -20], [40, -20], [40, 100], [-20, 100], [-20, 30], [-40, 30], [-40, 100], [-100, 100]];
    fc.assert(
      fc.property(
        fc.integer({ min: -110, max: 110 }),
        fc.integer({ min: 1, max: 80 }),
        fc.integer({ min: -110, max: 110 }),
        fc.integer({ min: 1, max: 40 }),
        (x0, w, y0, h) => {
          const x1 = x0 + w, y1 = y0 + h;
          // Reference: every point of a fine grid (including the boundary) inside or on the outline,
          // and no interior grid point strictly outside (grid step 0.5 is finer than any feature here).
          let allIn = true;
          for (let x = x0; x <= x1 + 1e-9 && allIn; x += 0.5) for (let y = y0; y <= y1 + 1e-9 && allIn; y += 0.5) allIn = pointInPolygon(x, y, comb);
          expect(rectInPolygon(x0, x1, y0, y1, comb)).toBe(allIn);
        },
      ),
      { numRuns: 1500, seed: 11 },
    );
  });
});

describe('polygonSelfIntersects', () => {
  it('simple outlines, convex or not, do not', () => {
    expect(polygonSelfIntersects(square)).toBe(false);
    expect(polygonSelfIntersects(slotted)).toBe(false);
    // A corner on a straight edge (collinear neighbours going the same way) is still simple.
    expect(polygonSelfIntersects([[0, 0], [5, 0], [10, 0], [10, 10], [0, 10]])).toBe(false);
    // A repeated corner is ignored.
    expect(polygonSelfIntersects([[0, 0], [10, 0], [10, 0], [10, 10], [0, 10]])).toBe(false);
  });

  it('crossing edges do', () => {
    expect(polygonSelfIntersects([[0, 0], [10, 10], [10, 0], [0, 10]])).toBe(true);
  });

  it('touching and folding outlines do (defect found and fixed: only proper crossings were seen)', () => {
    // A corner lying on a non-adjacent edge.
    expect(polygonSelfIntersects([[-100, 0], [100, 0], [100, 100], [0, 0], [-100, 100]])).toBe(true);
    // An edge that doubles back over the previous one (a spike).
    expect(polygonSelfIntersects([[0, 0], [10, 0], [5, 0], [5, 10]])).toBe(true);
    // All corners on one line.
    expect(polygonSelfIntersects([[0, 0], [1, 0], [2, 0]])).toBe(true);
    // Two non-adjacent edges overlapping along a line.
    expect(polygonSelfIntersects([[0, 0], [10, 0], [10, 5], [2, 5], [2, 0], [8, 0], [8, -5], [0, -5]])).toBe(true);
  });
});
