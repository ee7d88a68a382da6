/** Moon-lit sky of Krisciunas & Schaefer 1991, PASP 103, 1033. */
import { describe, expect, it } from 'vitest';
import { moonlitSkyMagPerArcsec2, moonScattering, moonSkyNanoLambert, nanoLambertToVMag, scatteringAirmass } from '../../src/core/observe/moonSky';

describe('Krisciunas & Schaefer 1991 moonlit sky', () => {
  const g = { phaseAngleDeg: 45, separationDeg: 50, moonZenithDeg: 70, targetZenithDeg: 20, extinctionV: 0.15 };
  it('reproduces the check values derived from the published equations: B_moon = 389.5 nL, V = 19.855 mag/arcsec^2', () => {
    // Derived (not copied from the paper) from K&S eqs. 3, 15, 20, 21 for Z = 20, Z_moon = 70, rho = 50, alpha = 45 deg,
    // k = 0.15; also recomputed by hand: m = -12.73 + 1.17 + 0.0164 = -11.5436, I* = 10^(-0.4*5.0264) = 9.78e-3,
    // f(50) = 229086.8 (1.06 + 0.41318) + 10^4.9 = 337614 + 79433 = 417047, so B = 417047 * 9.78e-3 * 0.8005 * 0.1193.
    expect(moonSkyNanoLambert(g)).toBeCloseTo(389.5, 0);
    expect(nanoLambertToVMag(moonSkyNanoLambert(g))).toBeCloseTo(19.855, 2);
  });
  it('pieces: X(0) = 1, X(90 deg) = 5 (1/sqrt(0.04)); f below 10 deg is 6.2e7/rho^2', () => {
    expect(scatteringAirmass(0)).toBe(1);
    expect(scatteringAirmass(90)).toBeCloseTo(5, 10);
    expect(moonScattering(5)).toBeCloseTo(6.2e7 / 25, 6);
  });
  it('the magnitude conversion inverts the published brightness formula B = 34.08 exp(20.7233 - 0.92104 V) nL', () => {
    const v = 21.587;
    expect(nanoLambertToVMag(34.08 * Math.exp(20.7233 - 0.92104 * v))).toBeCloseTo(v, 10);
  });
  it('no moonlight below the horizon; more light nearer the Moon and at full Moon', () => {
    expect(moonSkyNanoLambert({ ...g, moonZenithDeg: 95 })).toBe(0);
    expect(moonlitSkyMagPerArcsec2(20.15, { ...g, moonZenithDeg: 95 }, 0.45)).toBe(20.15);
    expect(moonSkyNanoLambert({ ...g, separationDeg: 20 })).toBeGreaterThan(moonSkyNanoLambert(g));
    expect(moonSkyNanoLambert({ ...g, phaseAngleDeg: 0 })).toBeGreaterThan(moonSkyNanoLambert(g));
    const lit = moonlitSkyMagPerArcsec2(20.15, g, 0.45);
    expect(lit).toBeLessThan(20.15);
    // V_moon 19.855 -> I (Vega) 19.155 -> AB 19.605; summed in flux with a 20.15 AB dark sky (by hand): 19.08
    expect(lit).toBeCloseTo(-2.5 * Math.log10(10 ** (-0.4 * 20.15) + 10 ** (-0.4 * (19.855 - 0.7 + 0.45))), 2);
  });
});

describe('the plan\'s observing.moon brightens the sky of the exposure estimates', () => {
  it('with the Moon up the sky is brighter; below the horizon it is the dark sky', async () => {
    const { skyWithMoon } = await import('../../src/core/pipeline/refractionReport');
    const { parsePlan, galaxyModel } = await import('../../src/core/plan/validate');
    const { parseProfileText } = await import('../../src/core/profile/load');
    const { readFileSync } = await import('node:fs');
    const profile = parseProfileText(readFileSync('instrument-profiles/ridge10-narrow.json', 'utf8'));
    const base = {
      format: 'haloweave.plan/1', instrument: 'ridge10-narrow', catalog: 'c.csv',
      galaxy: { id: 'g', ra: 30, dec: 10, reArcsec: 45, axisRatio: 0.8, paDeg: 30, distanceMpc: 18, vsysKms: 1250, sersicN: 4, muE: 21.5 },
      goals: { masks: 1, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498, 8542.1, 8662.1] },
      photometry: { band: 'I', system: 'Vega' },
    };
    const up = parsePlan({ ...base, observing: { moon: { phaseAngleDeg: 30, separationDeg: 40, altitudeDeg: 50 } } });
    const down = parsePlan({ ...base, observing: { moon: { phaseAngleDeg: 30, separationDeg: 40, altitudeDeg: -5 } } });
    expect(skyWithMoon(up, profile, galaxyModel(up), 20.15)).toBeLessThan(19.5);
    expect(skyWithMoon(down, profile, galaxyModel(down), 20.15)).toBe(20.15);
    expect(skyWithMoon(parsePlan(base), profile, galaxyModel(parsePlan(base)), 20.15)).toBe(20.15);
  });
});
