import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import proj4 from 'proj4';
import { AngleBetween, Spherical, VectorFromSphere } from 'astronomy-engine';
import { positionAngleDeg, separationDeg } from '../../src/core/sky/separation';

const D2R = Math.PI / 180;

/** Haversine separation in degrees, written out here as an independent route (accurate except near 180 deg). */
function haversineDeg(ra1: number, dec1: number, ra2: number, dec2: number): number {
  const h = Math.sin(((dec2 - dec1) * D2R) / 2) ** 2 + Math.cos(dec1 * D2R) * Math.cos(dec2 * D2R) * Math.sin(((ra2 - ra1) * D2R) / 2) ** 2;
  return (2 * Math.asin(Math.min(1, Math.sqrt(h)))) / D2R;
}

/** astronomy-engine (npm, general-purpose) as a second route: angle between two unit vectors, degrees. */
function astronomyEngineSepDeg(ra1: number, dec1: number, ra2: number, dec2: number): number {
  const t = new Date(Date.UTC(2000, 0, 1, 12));
  return AngleBetween(VectorFromSphere(new Spherical(dec1, ra1, 1), t), VectorFromSphere(new Spherical(dec2, ra2, 1), t));
}

describe('separationDeg', () => {
  it('Meeus, Astronomical Algorithms 2nd ed., Example 17.a: 32.7930 deg', () => {
    // Value from memory (references.md); confirmed below by two second routes: a haversine written in
    // this test and astronomy-engine's AngleBetween. Both give 32.793027 deg, matching Meeus's 32.7930 to 4 decimals.
    const ra1 = 213.9154, dec1 = 19.1825, ra2 = 201.2983, dec2 = -11.1614;
    const d = separationDeg(ra1, dec1, ra2, dec2);
    expect(d).toBeCloseTo(32.793, 4); // |d - 32.7930| < 5e-5
    expect(Math.abs(d - haversineDeg(ra1, dec1, ra2, dec2))).toBeLessThan(1e-12);
    expect(Math.abs(d - astronomyEngineSepDeg(ra1, dec1, ra2, dec2))).toBeLessThan(1e-9);
    expect(Math.abs(haversineDeg(ra1, dec1, ra2, dec2) - 32.793)).toBeLessThan(5e-5);
    // Symmetric in its two points.
    expect(separationDeg(ra2, dec2, ra1, dec1)).toBe(d);
  });

  it('agrees with the haversine and astronomy-engine over random pairs (fast-check)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 360, noNaN: true }),
        fc.double({ min: -90, max: 90, noNaN: true }),
        fc.double({ min: 0, max: 360, noNaN: true }),
        fc.double({ min: -90, max: 90, noNaN: true }),
        (ra1, dec1, ra2, dec2) => {
          const d = separationDeg(ra1, dec1, ra2, dec2);
          expect(d).toBeGreaterThanOrEqual(0);
          expect(d).toBeLessThanOrEqual(180);
          // Haversine loses precision near 180 deg (asin near 1): compare there to astronomy-engine only.
          if (d < 170) expect(Math.abs(d - haversineDeg(ra1, dec1, ra2, dec2))).toBeLessThan(1e-9);
          expect(Math.abs(d - astronomyEngineSepDeg(ra1, dec1, ra2, dec2))).toBeLessThan(1e-6);
        },
      ),
      { numRuns: 3000, seed: 17 },
    );
  });

  it('1 mas separations agree with the small-angle flat formula', () => {
    // Flat formula: sqrt((dRA cos dec)^2 + dDec^2), exact to second order in the separation
    // (the error is of order theta^2 relative, ~1e-17 at 1 mas).
    const oneMasDeg = 1e-3 / 3600;
    for (const [ra, dec, angleDeg] of [
      [10, 0, 0],
      [10, 0, 90],
      [123.4, 30, 37],
      [359.9999, -45, 200],
      [0.00001, 60, 300],
      [200, 89, 45],
      [5, -89.5, 135],
    ]) {
      const dDec = oneMasDeg * Math.cos(angleDeg * D2R);
      const dRa = (oneMasDeg * Math.sin(angleDeg * D2R)) / Math.cos(dec * D2R);
      const ra2 = ra + dRa, dec2 = dec + dDec;
      // Use the differences as actually stored in floating point, so the reference sees the same points.
      const flatDeg = Math.hypot((ra2 - ra) * Math.cos(((dec + dec2) / 2) * D2R), dec2 - dec);
      const d = separationDeg(ra, dec, ra2, dec2);
      expect(Math.abs(d - flatDeg) / flatDeg).toBeLessThan(1e-6);
      expect(d * 3600e3).toBeCloseTo(1, 5); // 1 mas to 1e-5 mas
    }
  });

  it('a separation of 1 mas is not lost to the cos-form cancellation (the naive acos formula gives 0 here)', () => {
    const ra = 150, dec = 20, dDec = 1e-3 / 3600;
    const naive = Math.acos(Math.sin(dec * D2R) * Math.sin((dec + dDec) * D2R) + Math.cos(dec * D2R) * Math.cos((dec + dDec) * D2R)) / D2R;
    const d = separationDeg(ra, dec, ra, dec + dDec);
    expect(Math.abs(d - dDec) / dDec).toBeLessThan(1e-6);
    // The naive route is off by far more than 1e-6 relative: this is what the test protects against.
    expect(Math.abs(naive - dDec) / dDec).toBeGreaterThan(1e-3);
  });

  it('antipodal points are 180 deg apart', () => {
    expect(separationDeg(10, 20, 190, -20)).toBe(180);
    expect(separationDeg(0, 90, 0, -90)).toBe(180);
    expect(separationDeg(0, 90, 123, -90)).toBe(180);
    expect(separationDeg(359.5, 0, 179.5, 0)).toBe(180);
  });

  it('near-antipodal points: 180 - 1e-6 deg is resolved', () => {
    // Moving one point of an antipodal pair by 1e-6 deg towards the other along a meridian.
    expect(Math.abs(180 - separationDeg(10, 20, 190, -20 + 1e-6) - 1e-6)).toBeLessThan(1e-12);
    // Along the equator.
    expect(Math.abs(180 - separationDeg(0, 0, 180 - 1e-6, 0) - 1e-6)).toBeLessThan(1e-12);
    // 1 mas short of antipodal.
    const masDeg = 1e-3 / 3600;
    expect(Math.abs(180 - separationDeg(45, -30, 225, 30 - masDeg) - masDeg) / masDeg).toBeLessThan(1e-5);
  });

  it('handles RA across 0/360', () => {
    expect(separationDeg(359.99, 0, 0.01, 0)).toBeCloseTo(0.02, 12);
    expect(separationDeg(-0.01, 10, 0.01, 10)).toBeCloseTo(separationDeg(359.99, 10, 0.01, 10), 12);
  });
});

describe('positionAngleDeg (East of North, [0, 360))', () => {
  it('cardinal directions', () => {
    expect(positionAngleDeg(100, 10, 100, 11)).toBe(0); // due North
    expect(positionAngleDeg(100, 10, 100, 9)).toBe(180); // due South
    expect(positionAngleDeg(100, 0, 101, 0)).toBeCloseTo(90, 12); // due East on the equator
    expect(positionAngleDeg(100, 0, 99, 0)).toBeCloseTo(270, 12); // due West
    // Off the equator a point at larger RA and equal Dec lies slightly North of East (great circle).
    const pa = positionAngleDeg(100, 40, 100.001, 40);
    expect(pa).toBeLessThan(90);
    expect(pa).toBeGreaterThan(89.999);
    // From the North pole every direction is South: the PA is 180 measured from the meridian ra1.
    expect(positionAngleDeg(0, 90, 0, 80)).toBeCloseTo(180, 12);
    // From the South pole, North along the meridian ra1 + 0.
    expect(positionAngleDeg(0, -90, 0, -80)).toBeCloseTo(0, 12);
  });

  it('across RA 0/360: East is toward larger RA through 0', () => {
    expect(positionAngleDeg(359.999, 0, 0.001, 0)).toBeCloseTo(90, 9);
    expect(positionAngleDeg(0.001, 0, 359.999, 0)).toBeCloseTo(270, 9);
  });

  it('agrees with a second route: the azimuth in proj4 gnom (an azimuthal projection keeps directions from its centre)', () => {
    // proj4 (npm, general-purpose) `gnom` about point 1: x East, y North; atan2(x, y) is the PA of point 2.
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 360, noNaN: true }),
        fc.double({ min: -89, max: 89, noNaN: true }),
        fc.double({ min: 0, max: 360, maxExcluded: true, noNaN: true }),
        fc.double({ min: 1e-4, max: 60, noNaN: true }),
        (ra1, dec1, paTrueDeg, distDeg) => {
          // Point 2 from point 1 by the direct spherical formula (destination point at a bearing).
          const d1 = dec1 * D2R, dist = distDeg * D2R, pa = paTrueDeg * D2R;
          const dec2 = Math.asin(Math.sin(d1) * Math.cos(dist) + Math.cos(d1) * Math.sin(dist) * Math.cos(pa)) / D2R;
          const ra2 = ra1 + Math.atan2(Math.sin(pa) * Math.sin(dist) * Math.cos(d1), Math.cos(dist) - Math.sin(d1) * Math.sin(dec2 * D2R)) / D2R;
          const gnom = proj4(`+proj=gnom +lat_0=${dec1} +lon_0=${ra1} +R=1 +x_0=0 +y_0=0 +no_defs`);
          const [x, y] = gnom.forward([((ra2 % 360) + 360) % 360, dec2]);
          const paProj = ((Math.atan2(x, y) / D2R) % 360 + 360) % 360;
          const ours = positionAngleDeg(ra1, dec1, ((ra2 % 360) + 360) % 360, dec2);
          const diff = (a: number, b: number) => Math.abs(((a - b + 540) % 360) - 180);
          expect(diff(ours, paProj)).toBeLessThan(1e-6);
          expect(diff(ours, paTrueDeg)).toBeLessThan(1e-6);
          expect(ours).toBeGreaterThanOrEqual(0);
          expect(ours).toBeLessThan(360);
        },
      ),
      { numRuns: 2000, seed: 99 },
    );
  });
});
