import { describe, expect, it } from 'vitest';
import { coverageReport } from '../../src/core/coverage/coverage';
import { galaxyRadiusAndAzimuth } from '../../src/core/sky/galaxyRadius';
import type { GalaxyModel } from '../../src/core/plan/schema';
import type { Slit } from '../../src/core/geometry/maskSolution';
import { galaxyToSkyArcsec } from '../../src/core/sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';

const galaxy: GalaxyModel = { id: 'g', raDeg: 359.999, decDeg: 30, reArcsec: 20, axisRatio: 0.5, paDeg: 60, distanceMpc: 10, vsysKms: 1000, sersicN: 4, muE: 21 };

/** A slit row at galaxy-frame (u, v) arcsec. */
function rowAt(role: Slit['role'], u: number, v: number): Slit {
  const s = galaxyToSkyArcsec(u, v, galaxy.paDeg);
  const p = tangentToSkyDeg(tangentCentre(galaxy.raDeg, galaxy.decDeg), s.xiArcsec, s.etaArcsec);
  return { maskId: 'm', slitId: 'x', objectId: `${u},${v}`, role, raDeg: p.raDeg, decDeg: p.decDeg, xArcsec: 0, yArcsec: 0, lenBelowArcsec: 2, lenAboveArcsec: 2, widthArcsec: 1, tiltDeg: 0, priority: 1, mag: 20 };
}

describe('coverage', () => {
  it('uses the circularised radius R = sqrt(q u^2 + v^2/q) and phi = atan2(v, u) from the major axis', () => {
    // u = 40, v = 1: R = sqrt(0.5 * 1600 + 1 / 0.5) = sqrt(802) arcsec, phi = atan2(1, 40).  u = 0, v = 10: R = 10 / sqrt(0.5) = 14.14 = 0.707 Re, phi = 90.
    const a = rowAt('tracer', 40, 1), b = rowAt('tracer', 0, 10);
    expect(galaxyRadiusAndAzimuth(galaxy, a.raDeg, a.decDeg).rRe).toBeCloseTo(Math.sqrt(802) / 20, 6);
    expect(galaxyRadiusAndAzimuth(galaxy, a.raDeg, a.decDeg).phiDeg).toBeCloseTo((Math.atan2(1, 40) * 180) / Math.PI, 4);
    expect(galaxyRadiusAndAzimuth(galaxy, b.raDeg, b.decDeg).rRe).toBeCloseTo(Math.SQRT2 / 2, 6);
    expect(galaxyRadiusAndAzimuth(galaxy, b.raDeg, b.decDeg).phiDeg).toBeCloseTo(90, 4);
    expect(galaxyRadiusAndAzimuth(galaxy, ...([rowAt('tracer', -10, -1)].map((r) => [r.raDeg, r.decDeg])[0] as [number, number])).phiDeg).toBeGreaterThan(180);
  });

  it('counts per 1-Re bin to the goal, per 45-degree sector (not folded), beyond the goal, and the reach', () => {
    const rows = [rowAt('tracer', 40, 1), rowAt('tracer', 0, 10), rowAt('tracer', -100, -5), rowAt('tracer', 400, 1), rowAt('starlight', 10, 1), rowAt('sky', 1000, 0)];
    const c = coverageReport(galaxy, { tracerReachRe: 10, starlightReachRe: 3 }, rows);
    const t = c.roles.tracer;
    expect(t.count).toBe(4);
    expect(t.radialBins).toHaveLength(10);
    // sqrt(802)/20 = 1.416 Re -> bin 1; 0.707 Re -> bin 0; u=-100, v=-5: R = sqrt(5000 + 50) = 71.06 arcsec = 3.55 Re -> bin 3; 400: 14.1 Re -> beyond.
    expect(t.radialBins.map((b) => b.count)).toEqual([1, 1, 0, 1, 0, 0, 0, 0, 0, 0]);
    expect(t.beyondGoal).toBe(1);
    expect(t.maxReachRe).toBeCloseTo(Math.sqrt(0.5 * 400 * 400 + 2) / 20, 6);
    // Sectors: phi just above 0 (u=40 and u=400, v=1) -> sector 0; 90 -> sector 2; atan2(-5, -100) = 182.9 deg -> sector 4.
    expect(t.sectors.map((s) => s.count)).toEqual([2, 0, 1, 0, 1, 0, 0, 0]);
    expect(t.emptyBinsFromRe).toEqual([2, 4, 5, 6, 7, 8, 9]);
    expect(c.roles.starlight.radialBins.map((b) => b.count)).toEqual([1, 0, 0]);
    expect(c.sectorConvention.folded).toBe(false);
    expect(c.roles.alignment.count).toBe(0);
    expect(c.roles.alignment.maxReachRe).toBe(0);
  });

  it('has no bins when a goal is 0 (starlight off) and a partial last bin for a fractional goal', () => {
    const c = coverageReport(galaxy, { tracerReachRe: 2.5, starlightReachRe: 0 }, [rowAt('starlight', 10, 0)]);
    expect(c.roles.starlight.radialBins).toEqual([]);
    expect(c.roles.starlight.beyondGoal).toBe(1);
    expect(c.roles.tracer.radialBins.map((b) => [b.fromRe, b.toRe])).toEqual([[0, 1], [1, 2], [2, 2.5]]);
  });
});
