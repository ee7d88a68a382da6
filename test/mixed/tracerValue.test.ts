/**
 * What a tracer is worth on each telescope in a mixed plan (solver/instrumentContexts.ts): the chance of a usable
 * velocity from the CCD-equation S/N of the exposure model, so faint tracers go to the larger aperture.
 */
import { describe, expect, it } from 'vitest';
import { tracerExposureModel, velocityChance, velocityChanceOfMag } from '../../src/core/solver/instrumentContexts';
import { tracerExposure } from '../../src/core/solver/exposure';
import { parsePlan } from '../../src/core/plan/validate';
import { shippedProfile, solveMixed } from './mixedCase';

const planBase = parsePlan({
  format: 'haloweave.plan/1', instruments: [{ profile: 'a', masks: 1 }, { profile: 'b', masks: 1 }], catalog: 'c.csv',
  galaxy: { id: 'g', ra: 150, dec: -20, reArcsec: 40, axisRatio: 0.8, paDeg: 30, distanceMpc: 15, vsysKms: 1200, sersicN: 4, muE: 21 },
  goals: { masks: 2, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498, 8542.1, 8662.1] },
});

describe('tracer value per telescope', () => {
  it('velocityChance is s^2/(1+s^2): one half at the target S/N, rising with S/N', () => {
    expect(velocityChance(5, 5)).toBeCloseTo(0.5, 12);
    expect(velocityChance(10, 5)).toBeCloseTo(0.8, 12);
    expect(velocityChance(0, 5)).toBe(0);
    expect(velocityChance(6, 5)).toBeGreaterThan(velocityChance(5.9, 5));
  });

  it('a bright source-limited tracer: S/N scales as the aperture diameter (CCD equation, Howell 2006 sect. 4.4)', () => {
    // Source-noise dominated, S/N = sqrt(N*) and N* is proportional to the collecting area (D^2): S/N ratio = D ratio.
    // Common practice consequence of the CCD equation; worked here from the closed form, not the code's own numbers.
    const p = shippedProfile('quad8-square');
    const big = tracerExposureModel(planBase, { ...p, telescope: { ...p.telescope, apertureM: 10 } });
    const small = tracerExposureModel(planBase, { ...p, telescope: { ...p.telescope, apertureM: 5 } });
    const sn = (m: typeof big) => tracerExposure({ slitId: '', objectId: '', widthArcsec: 1 }, 8, m).snPerA;
    expect(sn(big) / sn(small)).toBeCloseTo(2, 2);
  });

  it('faint tracers are worth relatively more on the larger aperture; bright ones about the same', () => {
    const p10 = shippedProfile('ridge10-narrow'), p65 = shippedProfile('broad65-wide');
    const f10 = velocityChanceOfMag(p10, tracerExposureModel(planBase, p10)), f65 = velocityChanceOfMag(p65, tracerExposureModel(planBase, p65));
    expect(f10(18) / f65(18)).toBeLessThan(1.05);
    expect(f10(23) / f65(23)).toBeGreaterThan(1.5);
    expect(f10(23) / f65(23)).toBeGreaterThan(f10(21) / f65(21));
  });

  it('two masks on one field, 10 m and 3 m otherwise alike: the fainter tracers go to the 10 m', () => {
    const p = shippedProfile('quad8-square');
    const big = { ...p, id: 'alike-10m', telescope: { ...p.telescope, apertureM: 10 } };
    const small = { ...p, id: 'alike-3m', telescope: { ...p.telescope, apertureM: 3 } };
    const c = solveMixed({ seed: 'alike', candidates: 6000, galaxy: { reArcsec: 30 }, maxRadiusRe: 6, fieldHalfSizeRe: 8, alignmentStars: 300 }, [{ profile: big, masks: 1 }, { profile: small, masks: 1 }], {
      search: { enabled: false }, observing: { targetSnPerA: 20 },
      masks: [{ id: 'a', raDeg: 161.8125, decDeg: -21.405, paDeg: 0, locked: true, instrument: 'alike-10m' }, { id: 'b', raDeg: 161.8125, decDeg: -21.405, paDeg: 0, locked: true, instrument: 'alike-3m' }],
      goals: { masks: 2, tracerReachRe: 6, starlightReachRe: 0, linesA: [8498, 8542.1, 8662.1] },
    });
    const rows = (id: string) => c.solution.masks.find((m) => m.mask.id === id)!.slits.filter((s) => s.role === 'tracer');
    const onBig = rows('a'), onSmall = rows('b');
    const mean = (v: number[]) => v.reduce((x, y) => x + y, 0) / v.length;
    console.log(`mean tracer mag on the 10 m ${mean(onBig.map((s) => s.mag!)).toFixed(3)} (${onBig.length}), on the 3 m ${mean(onSmall.map((s) => s.mag!)).toFixed(3)} (${onSmall.length})`);
    expect(onBig.length).toBeGreaterThan(20);
    expect(onSmall.length).toBeGreaterThan(20);
    // The mean magnitudes on the two masks depend on which slots conflict as well as on the value of each tracer, so
    // they are printed, not asserted; the value trade below is the exact statement of "worth most where it goes".
    // Same pointing, footprint and slit rules: the two masks' selections could be swapped. The allocation's value
    // (weight x chance of a velocity on each telescope) must beat the swap, which puts its faint tracers on the 3 m.
    const plan = parsePlan({ ...c.plan, observing: { targetSnPerA: 20 } });
    const fBig = velocityChanceOfMag(big, tracerExposureModel(plan, big)), fSmall = velocityChanceOfMag(small, tracerExposureModel(plan, small));
    const value = (list: typeof onBig, f: (m: number) => number) => list.reduce((t, s) => t + s.priority * f(s.mag!), 0);
    const kept = value(onBig, fBig) + value(onSmall, fSmall), swapped = value(onBig, fSmall) + value(onSmall, fBig);
    expect(kept).toBeGreaterThan(swapped * 1.001);
  });
});
