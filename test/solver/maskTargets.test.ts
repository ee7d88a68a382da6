import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { maskPointToSkyDeg, projectIndicesToMaskArcsec, projectToMaskArcsec, unitVectors } from '../../src/core/solver/maskTargets';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';

describe('targets in the mask frame', () => {
  it('the dot-product projection equals the gnomonic projection + contract rotation (RA across 0/360, Dec to +-85)', () => {
    fc.assert(fc.property(
      fc.double({ min: 0, max: 360, noNaN: true, maxExcluded: true }), fc.double({ min: -85, max: 85, noNaN: true }), fc.double({ min: 0, max: 360, noNaN: true, maxExcluded: true }),
      fc.array(fc.tuple(fc.double({ min: -1200, max: 1200, noNaN: true }), fc.double({ min: -1200, max: 1200, noNaN: true })), { minLength: 1, maxLength: 20 }),
      (ra0, dec0, pa, offsets) => {
        const c = tangentCentre(ra0, dec0);
        const pts = offsets.map(([xi, eta]) => tangentToSkyDeg(c, xi, eta));
        const ra = pts.map((p) => p.raDeg), dec = pts.map((p) => p.decDeg);
        const mask = { raDeg: ra0, decDeg: dec0, paDeg: pa };
        const a = projectToMaskArcsec(mask, ra, dec);
        const b = projectIndicesToMaskArcsec(mask, unitVectors(ra, dec), ra.map((_, i) => i));
        for (let i = 0; i < ra.length; i++) {
          if (Math.abs(a.xArcsec[i] - b.xArcsec[i]) > 1e-7 || Math.abs(a.yArcsec[i] - b.yArcsec[i]) > 1e-7) return false;
          // And back to the sky: the mask point is the catalog position (to 1e-9 deg).
          const back = maskPointToSkyDeg(mask, b.xArcsec[i], b.yArcsec[i]);
          const dra = Math.abs(((back.raDeg - ra[i] + 540) % 360) - 180);
          if (dra * Math.cos((dec[i] * Math.PI) / 180) > 1e-9 || Math.abs(back.decDeg - dec[i]) > 1e-9) return false;
        }
        return true;
      }), { numRuns: 500 });
  });

  it('at PA 0 x is East (xi) and y is North (eta); at PA 90 y is East', () => {
    const c = tangentCentre(10, 20);
    const p = tangentToSkyDeg(c, 30, 40);
    const m0 = projectToMaskArcsec({ raDeg: 10, decDeg: 20, paDeg: 0 }, [p.raDeg], [p.decDeg]);
    expect(m0.xArcsec[0]).toBeCloseTo(30, 8);
    expect(m0.yArcsec[0]).toBeCloseTo(40, 8);
    const m90 = projectToMaskArcsec({ raDeg: 10, decDeg: 20, paDeg: 90 }, [p.raDeg], [p.decDeg]);
    expect(m90.yArcsec[0]).toBeCloseTo(30, 8);
    expect(m90.xArcsec[0]).toBeCloseTo(-40, 8);
  });

  it('leaves points beyond the radius cut unprojected', () => {
    const c = tangentCentre(0, 0);
    const far = tangentToSkyDeg(c, 2000, 0), near = tangentToSkyDeg(c, 100, 0);
    const r = projectIndicesToMaskArcsec({ raDeg: 0, decDeg: 0, paDeg: 0 }, unitVectors([far.raDeg, near.raDeg], [far.decDeg, near.decDeg]), [0, 1], 500);
    expect(Number.isNaN(r.xArcsec[0])).toBe(true);
    expect(r.xArcsec[1]).toBeCloseTo(100, 8);
  });
});
