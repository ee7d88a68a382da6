/** Slits cut for a design wavelength apart from the guider's, the default science range, the design hour angle and the exposure fit. */
import { describe, expect, it } from 'vitest';
import { maskRefractionContext, slitsAtHourAngle, type RefractionSettings } from '../../src/core/observe/maskRefraction';
import { edlenRefractivity } from '../../src/core/observe/refractiveIndex';
import { parallacticAngleDeg } from '../../src/core/observe/parallactic';
import { altitudeDeg } from '../../src/core/observe/horizon';
import { ARCSEC_PER_RAD, RAD_PER_DEG } from '../../src/core/sky/angles';
import { chooseDesignHourAngle, designHourAngleCandidatesH, exposureFit } from '../../src/core/observe/designHourAngle';
import { observingReportForPlan } from '../../src/core/pipeline/refractionReport';
import { parseProfileText } from '../../src/core/profile/load';
import { parsePlan, galaxyModel } from '../../src/core/plan/validate';
import { readFileSync } from 'node:fs';
import type { MaskPointing, Slit } from '../../src/core/geometry/maskSolution';

const AIR = { pressureHPa: 690, temperatureC: 2, relativeHumidity: 0.2 };
const LAT = 28.1;
const SETTINGS: RefractionSettings = {
  seeingFwhmArcsec: 0.8, maxLossFraction: 0.1, guideWavelengthA: 6500, designWavelengthA: 8600, scienceRangeA: [8500, 8700],
  hourAngleRangeH: [-5, 5], hourAngleStepH: 0.25, maxAirmass: 2.5,
};
const mask: MaskPointing = { id: 'm', raDeg: 150, decDeg: 5, paDeg: 130, locked: true }; // q = 40.3 deg at HA 1.5 h: the spread lies across the slits
const centreSlit: Slit = { maskId: 'm', slitId: 'c', objectId: 'c', role: 'tracer', raDeg: 150, decDeg: 5, xArcsec: 0, yArcsec: 0, lenBelowArcsec: 3, lenAboveArcsec: 3, widthArcsec: 1, tiltDeg: 0, priority: 1, mag: 21 };

describe('design wavelength apart from the guide wavelength (plane-parallel refraction, Filippenko 1982)', () => {
  it('at the design hour angle a centre slit sees its guide-light image offset by (R(guide) - R(design)) sin(q - PA) across the slit, and the design light centred', () => {
    const designH = 1.5;
    const ctx = maskRefractionContext({ mask, slits: [centreSlit], designHourAngleH: designH, latDeg: LAT, air: AIR, settings: SETTINGS });
    const [s] = slitsAtHourAngle(ctx, designH);
    // Closed form: R = 206265 (n - 1) tan z; the image moves toward the zenith, along the parallactic angle q; its
    // component along mask x is sin(q - PA) (contract: x = xi cos PA - eta sin PA).
    const z = 90 - altitudeDeg(designH * 15, 5, LAT);
    const q = parallacticAngleDeg(designH * 15, 5, LAT);
    const dR = ARCSEC_PER_RAD * (edlenRefractivity(6500, AIR) - edlenRefractivity(8600, AIR)) * Math.tan(z * RAD_PER_DEG);
    expect(s.fieldShiftAcrossArcsec).toBeCloseTo(dR * Math.sin((q - 130) * RAD_PER_DEG), 3);
    expect(Math.abs(s.fieldShiftAcrossArcsec)).toBeGreaterThan(0.01);
    // Cut for the guide wavelength instead, the guide image sits in the slit.
    const old = maskRefractionContext({ mask, slits: [centreSlit], designHourAngleH: designH, latDeg: LAT, air: AIR, settings: { ...SETTINGS, designWavelengthA: undefined } });
    expect(Math.abs(slitsAtHourAngle(old, designH)[0].fieldShiftAcrossArcsec)).toBeLessThan(1e-9);
  });
});

describe('hour-angle window against the exposure time', () => {
  it('says whether the exposure fits', () => {
    expect(exposureFit([-1, 1], 7200)).toMatchObject({ fits: true });
    expect(exposureFit([-1, 1], 3 * 3600).fits).toBe(false);
    expect(exposureFit([-1, 1], 3 * 3600).text).toMatch(/window 2\.00 h is shorter than the 3\.00 h exposure/);
    expect(exposureFit(null, 3600).text).toMatch(/no window/);
  });
  it('chooses the design hour angle with the longest window that holds it', () => {
    const slits = [centreSlit, { ...centreSlit, slitId: 'e', objectId: 'e', raDeg: 150.1, xArcsec: 300 }];
    const wide = { ...SETTINGS, scienceRangeA: [4000, 9000] as [number, number], maxLossFraction: 0.05 };
    const input = { mask, slits, latDeg: LAT, air: AIR, settings: wide };
    const cands = designHourAngleCandidatesH([-5, 5], 0.25);
    expect(cands).toContain(0);
    expect(cands[1] - cands[0]).toBe(0.25);
    const best = chooseDesignHourAngle(input, cands, 3600);
    expect(best.windowContainsDesign).toBe(true);
    const len = (w: [number, number] | null) => (w ? w[1] - w[0] : 0);
    const ofZero = chooseDesignHourAngle(input, [0], 3600);
    expect(len(best.hourAngleWindowH)).toBeGreaterThanOrEqual(len(ofZero.hourAngleWindowH));
  });
});

describe('default science range: the required lines over the velocity range', () => {
  it('spans the windows of 8498.0 and 8662.1 A at v_sys 1250 +- 500 km/s, +- 10 A: 8509.26 to 8722.66 A (by hand from the contract)', () => {
    const profile = parseProfileText(readFileSync('instrument-profiles/ridge10-narrow.json', 'utf8'));
    const plan = parsePlan({
      format: 'haloweave.plan/1',
      galaxy: { id: 'g', ra: 30, dec: 10, reArcsec: 45, axisRatio: 0.8, paDeg: 30, distanceMpc: 18, vsysKms: 1250, sersicN: 4, muE: 21.5 },
      instrument: 'ridge10-narrow', catalog: 'c.csv',
      goals: { masks: 1, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498, 8542.1, 8662.1] },
    });
    const r = observingReportForPlan(plan, profile, galaxyModel(plan), [{ mask: { id: 'm', raDeg: 30, decDeg: 10, paDeg: 0, locked: true }, slits: [] }]);
    expect(r.settings.scienceRangeA[0]).toBeCloseTo(8509.26, 2);
    expect(r.settings.scienceRangeA[1]).toBeCloseTo(8722.66, 2);
    expect(r.settings.designWavelengthA).toBeCloseTo((8509.26 + 8722.66) / 2, 1);
  });
});
