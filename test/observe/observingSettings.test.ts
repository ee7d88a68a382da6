import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { resolveObservingSettings, detectorRangeA, designHourAnglesH, OBSERVING_DEFAULTS } from '../../src/core/observe/observingSettings';
import { observingSchema } from '../../src/core/plan/observingSection';
import { parsePlan } from '../../src/core/plan/validate';
import { parseProfileText } from '../../src/core/profile/load';
import { InputError } from '../../src/core/result';

const profile = parseProfileText(readFileSync('instrument-profiles/ridge10-narrow.json', 'utf8'));
const plan = {
  format: 'haloweave.plan/1',
  galaxy: { id: 'g', ra: 30, dec: 10, reArcsec: 45, axisRatio: 0.8, paDeg: 30, distanceMpc: 18, vsysKms: 1250, sersicN: 4, muE: 21.5 },
  instrument: 'ridge10-narrow', catalog: 'c.csv',
  goals: { masks: 2, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498, 8542.1, 8662.1] },
  masks: [{ id: 'm1', designHourAngleH: -1.5 }, { id: 'm2' }],
};

describe('observing settings', () => {
  it('fills the documented defaults; the science range is the detector range and the guide wavelength its middle', () => {
    const s = resolveObservingSettings(undefined, profile);
    const [a, b] = detectorRangeA(profile);
    expect(a).toBeCloseTo(8400 - 4096 * 0.33, 9);
    expect(s.scienceRangeA).toEqual([a, b]);
    expect(s.guideWavelengthA).toBeCloseTo((a + b) / 2, 9);
    expect(s.seeingFwhmArcsec).toBe(OBSERVING_DEFAULTS.seeingFwhmArcsec);
    expect(s.hourAngleRangeH).toEqual([-4, 4]);
    expect(resolveObservingSettings(undefined, profile, { exposureTimeS: 5400 }).exposureTimeS).toBe(5400);
    expect(resolveObservingSettings({ exposureTimeS: 1800 }, profile, { exposureTimeS: 5400 }).exposureTimeS).toBe(1800);
  });

  it('is the plan\'s `observing` schema: good values load and each bad one is reported by its key path', () => {
    const good = parsePlan({ ...plan, observing: { seeingFwhmArcsec: 0.6, scienceRangeA: [7800, 9000], maxLossFraction: 0.05 } });
    expect(resolveObservingSettings(good.observing, profile).scienceRangeA).toEqual([7800, 9000]);
    try {
      parsePlan({ ...plan, observing: { seeingFwhmArcsec: -1, scienceRangeA: [9000, 7800], maxLossFraction: 1.5, hourAngleStepH: 0 } });
      expect.unreachable('bad observing values must be rejected');
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      const where = (e as InputError).problems.map((p) => p.where).join('|');
      for (const key of ['observing.seeingFwhmArcsec', 'observing.scienceRangeA', 'observing.maxLossFraction', 'observing.hourAngleStepH']) expect(where).toContain(key);
    }
    expect(observingSchema.safeParse({ somethingElse: 1 }).success).toBe(true); // unknown keys are kept
  });

  it('design hour angles come from each plan mask, else the observing default', () => {
    const p = parsePlan({ ...plan, observing: { designHourAngleH: 0.5 } });
    const s = resolveObservingSettings(p.observing, profile);
    expect(designHourAnglesH(p, s)).toEqual({ m1: -1.5, m2: 0.5 });
  });
});
