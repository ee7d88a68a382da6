import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { nightRow } from '../../src/core/observe/night';
import { maskRefractionContext, slitsAtHourAngle } from '../../src/core/observe/maskRefraction';
import { edlenRefractivity } from '../../src/core/observe/refractiveIndex';
import { maskToSkyArcsec } from '../../src/core/sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import { ARCSEC_PER_RAD, RAD_PER_DEG } from '../../src/core/sky/angles';

const ms = (iso: string | null) => (iso === null ? null : Date.parse(iso));

describe('night rows hold their invariants anywhere on Earth (fast-check)', () => {
  it('ordering of events, dark hours within the night, airmass >= 1, fractions in range', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -89.5, max: 89.5, noNaN: true }),
        fc.double({ min: -180, max: 180, noNaN: true }),
        fc.integer({ min: 0, max: 364 }),
        fc.double({ min: 0, max: 359.99, noNaN: true }),
        fc.double({ min: -89, max: 89, noNaN: true }),
        fc.constantFrom(1.2, 2, 3),
        (latDeg, lonDeg, day, raDeg, decDeg, maxAirmass) => {
          const date = new Date(Date.UTC(2026, 0, 1 + day)).toISOString().slice(0, 10);
          const r = nightRow(date, { raDeg, decDeg }, { latDeg, lonDeg, elevationM: 1000 }, { maxAirmass });
          expect(r.darkHours).toBeGreaterThanOrEqual(0);
          expect(r.darkHours).toBeLessThanOrEqual(r.darkTotalHours + 1e-9);
          expect(r.darkTotalHours).toBeLessThanOrEqual(24 + 1e-9);
          if (r.sunsetUtc && r.sunriseUtc) expect(ms(r.sunsetUtc)!).toBeLessThan(ms(r.sunriseUtc)!);
          if (r.astroDuskUtc && r.astroDawnUtc) expect(ms(r.astroDuskUtc)!).toBeLessThan(ms(r.astroDawnUtc)!);
          if (r.sunsetUtc && r.astroDuskUtc) expect(ms(r.sunsetUtc)!).toBeLessThan(ms(r.astroDuskUtc)!);
          if (r.minAirmass !== null) {
            expect(r.minAirmass).toBeGreaterThanOrEqual(1);
            expect(r.minAirmassSecZ!).toBeGreaterThanOrEqual(r.minAirmass - 1e-12);
          }
          if (r.darkHours > 0) expect(r.minAirmass!).toBeLessThanOrEqual(maxAirmass + 1e-6);
          expect(r.observable).toBe(r.darkHours > 0);
          expect(r.moonIllumination).toBeGreaterThanOrEqual(0);
          expect(r.moonIllumination).toBeLessThanOrEqual(1);
          expect(r.moonSeparationDeg).toBeGreaterThanOrEqual(0);
          expect(r.moonSeparationDeg).toBeLessThanOrEqual(180);
        },
      ),
      { numRuns: 300, seed: 20261201 },
    );
  });
});

describe('mask refraction agrees with the vector route for random masks, sites and hour angles (fast-check)', () => {
  it('image offsets (a)+(b) to 2e-4 arcsec', () => {
    const air = { pressureHPa: 750, temperatureC: 8, relativeHumidity: 0.3 };
    const settings = { seeingFwhmArcsec: 0.8, maxLossFraction: 0.1, guideWavelengthA: 6000, scienceRangeA: [4500, 9500] as [number, number], hourAngleRangeH: [-4, 4] as [number, number], hourAngleStepH: 0.5, maxAirmass: 3 };
    const unit = (raDeg: number, decDeg: number) => {
      const a = raDeg * RAD_PER_DEG, d = decDeg * RAD_PER_DEG;
      return [Math.cos(d) * Math.cos(a), Math.cos(d) * Math.sin(a), Math.sin(d)];
    };
    const dot = (u: number[], v: number[]) => u[0] * v[0] + u[1] * v[1] + u[2] * v[2];
    fc.assert(
      fc.property(
        fc.double({ min: -60, max: 60, noNaN: true }), fc.double({ min: 0, max: 359.9, noNaN: true }), fc.double({ min: -70, max: 70, noNaN: true }),
        fc.double({ min: 0, max: 359.9, noNaN: true }), fc.double({ min: -600, max: 600, noNaN: true }), fc.double({ min: -600, max: 600, noNaN: true }),
        fc.double({ min: -3, max: 3, noNaN: true }), fc.double({ min: -3, max: 3, noNaN: true }),
        (latDeg, raDeg, decDeg, paDeg, x, y, designH, haH) => {
          const mask = { id: 'm', raDeg, decDeg, paDeg, locked: true };
          const s = maskToSkyArcsec(x, y, paDeg);
          const p = tangentToSkyDeg(tangentCentre(raDeg, decDeg), s.xiArcsec, s.etaArcsec);
          const slit = { maskId: 'm', slitId: 's', objectId: 'o', role: 'tracer' as const, raDeg: p.raDeg, decDeg: p.decDeg, xArcsec: x, yArcsec: y, lenBelowArcsec: 2, lenAboveArcsec: 2, widthArcsec: 1, tiltDeg: 0, priority: 1, mag: 21 };
          const C = unit(raDeg, decDeg);
          const E = [-Math.sin(raDeg * RAD_PER_DEG), Math.cos(raDeg * RAD_PER_DEG), 0];
          const N = [C[1] * E[2] - C[2] * E[1], C[2] * E[0] - C[0] * E[2], C[0] * E[1] - C[1] * E[0]];
          const image = (ra: number, dec: number, h: number, l: number) => {
            const Z = unit(raDeg + h * 15, latDeg), T = unit(ra, dec);
            const cz = dot(T, Z);
            if (cz <= 0.2) return null; // keep to z < 78 deg, where the plane-parallel model is used
            const r = edlenRefractivity(l, air) * Math.tan(Math.acos(cz));
            const perp = Z.map((z, k) => z - cz * T[k]);
            const pn = Math.hypot(...perp) || 1;
            const A = T.map((t, k) => t * Math.cos(r) + (perp[k] / pn) * Math.sin(r));
            return [(dot(A, E) / dot(A, C)) * ARCSEC_PER_RAD, (dot(A, N) / dot(A, C)) * ARCSEC_PER_RAD];
          };
          const rel = (h: number, l: number) => {
            const t = image(p.raDeg, p.decDeg, h, l), c = image(raDeg, decDeg, h, 6000);
            return t && c ? [t[0] - c[0], t[1] - c[1]] : null;
          };
          const now = rel(haH, 9500), then = rel(designH, 6000);
          fc.pre(now !== null && then !== null);
          const ctx = maskRefractionContext({ mask, slits: [slit], designHourAngleH: designH, latDeg, air, settings });
          const [got] = slitsAtHourAngle(ctx, haH);
          const dxi = now![0] - then![0], deta = now![1] - then![1];
          const pa = paDeg * RAD_PER_DEG;
          expect(Math.abs(got.totalAcrossArcsec[1] - (dxi * Math.cos(pa) - deta * Math.sin(pa)))).toBeLessThan(2e-4);
        },
      ),
      { numRuns: 300, seed: 7 },
    );
  });
});
