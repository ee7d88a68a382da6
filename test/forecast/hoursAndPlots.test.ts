/** Hours per mask and nights (docs/forecast.md "Hours and nights"), the plan's forecast section, and the SVG plots. */
import { describe, expect, it } from 'vitest';
import { maskHours, nightsNeeded } from '../../src/core/forecast/hours';
import { forecastPlan } from '../../src/core/forecast/forecast';
import { planMaskHours } from '../../src/core/forecast/planExposures';
import { dispersionProfileSvg, rotationSvg, starlightMapSvg } from '../../src/core/forecast/plots';
import { parsePlan, galaxyModel } from '../../src/core/plan/validate';
import { InputError } from '../../src/core/result';
import { demoPlanJson, planWith, profile, ring, tracerLayout } from './layout';

describe('hours and nights', () => {
  it('a mask needs the time of its completeness quantile tracer, plus the overhead', () => {
    const h = maskHours('m1', [3600, 7200, 10800, null], 0.75, 1800, 0.5);
    expect(h.exposureHours).toBe(3); // 3 of 4 slits reach the target by 3 h
    expect(h.hours).toBe(3.5);
    // When the quantile tracer can never reach it, the planned exposure is used.
    expect(maskHours('m2', [3600, null, null, null], 0.75, 1800, 0.5)).toMatchObject({ exposureHours: null, hours: 1 });
    expect(maskHours('m3', [], 0.75, 1800, 0)).toMatchObject({ exposureHours: null, hours: 0.5 });
  });

  it('nights are taken best first until they cover the hours; null when the semester falls short', () => {
    const nights = [2, 6, 0, 5, 3].map((h, i) => ({ date: `2027-03-0${i + 1}`, darkHours: h }));
    expect(nightsNeeded(10, nights, 'a', 'b')).toMatchObject({ nightsNeeded: 2, nightsUsable: 4, hoursAvailable: 16 });
    expect(nightsNeeded(11.5, nights, 'a', 'b').nightsNeeded).toBe(3);
    expect(nightsNeeded(17, nights, 'a', 'b').nightsNeeded).toBeNull();
  });

  it('planMaskHours gives the forecast its hours', () => {
    const plan = planWith({ completeness: 0.5, overheadHoursPerMask: 0.25 });
    const masks = tracerLayout(plan, ring(20, 2, 21));
    const f = forecastPlan({ plan, profile, galaxy: galaxyModel(plan), masks, trials: 20, seed: 1 });
    expect(planMaskHours(plan, profile, galaxyModel(plan), masks)).toEqual(f.hours.masks);
    expect(f.hours.masks[0].hours).toBeGreaterThan(0.25);
  });

  it("take the tracers' S/N target from goals.tracerSnPerA, else observing.targetSnPerA, else the default 20 (with a note)", () => {
    const base = planWith({ completeness: 0.5, overheadHoursPerMask: 0 });
    const goals = { ...base.goals };
    const at = (extra: Record<string, unknown>) => {
      const plan = planWith({ completeness: 0.5, overheadHoursPerMask: 0 }, extra);
      return forecastPlan({ plan, profile, galaxy: galaxyModel(plan), masks: tracerLayout(plan, ring(20, 2, 22)), trials: 10, seed: 1 });
    };
    const byDefault = at({});
    expect(byDefault.hours.targetSnSource).toBe('default');
    expect(byDefault.hours.targetSnPerA).toBe(20);
    expect(byDefault.notes.join('\n')).toMatch(/goals\.tracerSnPerA/);
    const observing = at({ observing: { targetSnPerA: 20 } });
    expect(observing.hours.targetSnSource).toBe('observing.targetSnPerA');
    const goal = at({ goals: { ...goals, tracerSnPerA: 10 }, observing: { targetSnPerA: 20 } });
    expect(goal.hours.targetSnSource).toBe('goals.tracerSnPerA');
    expect(goal.hours.targetSnPerA).toBe(10);
    // CCD equation (Howell 2006, section 4.4): S/N grows as sqrt(t) when photon or sky noise dominates and as t when
    // read noise does, so half the S/N takes between a quarter and a half of the time.
    const ratio = goal.hours.masks[0].exposureHours! / observing.hours.masks[0].exposureHours!;
    console.log(`exposure to S/N 10 over exposure to S/N 20: ${ratio.toFixed(3)}`);
    expect(ratio).toBeGreaterThanOrEqual(0.25 - 1e-9);
    expect(ratio).toBeLessThanOrEqual(0.5);
  });

  it('goals.tracerSnPerA is validated', () => {
    expect(() => parsePlan({ ...demoPlanJson, goals: { ...demoPlanJson.goals, tracerSnPerA: -3 } }, 'p.plan.json')).toThrow(/tracerSnPerA/);
  });
});

describe("the plan's forecast section", () => {
  it('is validated with the path of a wrong key', () => {
    expect(() => parsePlan({ ...demoPlanJson, forecast: { contamination: { fractionAtPivot: 1.5 }, radialBinsRe: [0, 3, 2] } }, 'p.plan.json')).toThrow(InputError);
    try {
      parsePlan({ ...demoPlanJson, forecast: { contamination: { fractionAtPivot: 1.5 }, radialBinsRe: [0, 3, 2] } }, 'p.plan.json');
    } catch (e) {
      const text = (e as InputError).problems.map((p) => `${p.where}: ${p.what}`).join('\n');
      expect(text).toMatch(/forecast\.contamination\.fractionAtPivot/);
      expect(text).toMatch(/forecast\.radialBinsRe/);
      expect(text).toMatch(/must increase/);
    }
  });
});

describe('plots', () => {
  const plan = planWith({});
  const masks = tracerLayout(plan, [...ring(60, 2, 21), ...ring(40, 6, 22), ...ring(8, 0.8, 0).map((p) => ({ ...p, role: 'starlight' as const }))]);
  const f = forecastPlan({ plan, profile, galaxy: galaxyModel(plan), masks, trials: 30, seed: 1 });
  const parse = (svg: string) => new DOMParserLite(svg);

  it('draw one band per dispersion bin, one sector per starlight bin, the rotation band and curve', () => {
    const d = dispersionProfileSvg(f);
    expect(parse(d).count('rect')).toBe(1 + f.dispersionProfile.filter((b) => b.sigmaErrorKms !== null).length); // frame + bands
    const withOther = dispersionProfileSvg(f, f);
    expect(parse(withOther).count('rect')).toBe(1 + 2 * f.dispersionProfile.length);
    expect(withOther).toMatch(/stroke-dasharray/);
    const s = starlightMapSvg(f);
    expect(parse(s).count('path')).toBe(f.starlightBins.length);
    const r = rotationSvg(f);
    expect(parse(r).count('polygon')).toBe(1);
    expect(parse(r).count('polyline')).toBe(1);
    for (const svg of [d, s, r]) expect(parse(svg).balanced).toBe(true);
  });
});

/** Just enough XML reading for the checks: element counts and balanced open/close tags. */
class DOMParserLite {
  readonly tags: string[] = [];
  readonly balanced: boolean;
  constructor(text: string) {
    const stack: string[] = [];
    let ok = true;
    for (const m of text.matchAll(/<(\/?)([a-zA-Z]+)[^>]*?(\/?)>/g)) {
      const [, close, name, self] = m;
      if (close) ok = ok && stack.pop() === name;
      else {
        this.tags.push(name);
        if (!self) stack.push(name);
      }
    }
    this.balanced = ok && stack.length === 0;
  }
  count(name: string): number {
    return this.tags.filter((t) => t === name).length;
  }
}

describe('starlight bins', () => {
  it('co-add their slits in quadrature (independent spectra): four equal slits give twice the S/N of one', () => {
    const plan = planWith({});
    const at = { radiusRe: 1.5, paDeg: 80, mag: 0, role: 'starlight' as const };
    // A sky slit far out on the same mask: starlight spectra are sky-subtracted with the mask's own sky slits.
    const sky = { radiusRe: 9, paDeg: 260, mag: 0, role: 'sky' as const };
    const one = forecastPlan({ plan, profile, galaxy: galaxyModel(plan), masks: tracerLayout(plan, [at, sky]), trials: 20, seed: 1 });
    const four = forecastPlan({ plan, profile, galaxy: galaxyModel(plan), masks: tracerLayout(plan, [at, at, at, at, sky]), trials: 20, seed: 1 });
    expect(one.starlightBins).toHaveLength(1);
    expect(one.starlightBins[0].snPerA).toBeGreaterThan(0);
    expect(four.starlightBins[0].slits).toBe(4);
    expect(four.starlightBins[0].snPerA).toBeCloseTo(2 * one.starlightBins[0].snPerA, 9);
    // Photon-limited: the velocity error halves (before the floor in quadrature) when the S/N doubles; the calibrated
    // ratio of a fit's scatter to the bound moves by under 1 % between these S/N (forecast/velocityCalibrationTable.ts).
    const v1 = one.starlightBins[0].velocityErrorKms!, v4 = four.starlightBins[0].velocityErrorKms!;
    const floor = one.settings.velocityErrors.floorKms;
    expect(Math.sqrt(v4 * v4 - floor * floor) / Math.sqrt(v1 * v1 - floor * floor)).toBeCloseTo(0.5, 2);
    // The bin sits in the sector of its azimuth from the major axis, counter-clockwise from +u to +v.
    const b = four.starlightBins[0];
    expect(b.fromRe).toBe(1);
    expect(b.toRe).toBe(2);
    expect(b.sectorWidthDeg).toBe(45);
  });
});
