/**
 * The fast choice of a mask's design hour angle (observe/designHourAngle.ts: cached image positions, offset limits
 * instead of the loss function, interpolated bisection) against the exhaustive one: the full report
 * (maskRefractionReport) at every design hour angle of a fine grid (0.05 h), keeping the longest window that holds
 * the design hour angle. Generated masks: sites north and south, |Dec| up to 85, wide and narrow science ranges,
 * several loss limits, and a mask that never rises. Tolerance: the fast choice's window is at most 0.02 h shorter
 * than the exhaustive best (the fast candidates are 0.25 h apart, refined to 1/32 h; the fine grid is 0.05 h apart),
 * and the exposure fits in both or in neither.
 */
import { describe, expect, it } from 'vitest';
import { contextForDesignHourAngle, maskRefractionContext, maskRefractionReport, maskRefractionReportOf, type MaskRefractionInput, type RefractionSettings } from '../../src/core/observe/maskRefraction';
import { chooseDesignHourAngle, designHourAngleCandidatesH, designWindowScorer, windowLengthH } from '../../src/core/observe/designHourAngle';
import { maskToSkyArcsec } from '../../src/core/sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import { makeRng } from '../../src/core/numeric/random';
import type { MaskPointing, Slit } from '../../src/core/geometry/maskSolution';

const AIR = { pressureHPa: 700, temperatureC: 5, relativeHumidity: 0.3 };

interface Case { name: string; latDeg: number; decDeg: number; scienceRangeA: [number, number]; maxLossFraction: number; exposureS: number }

const CASES: Case[] = [
  { name: 'north site, Dec +5, wide range', latDeg: 28.7, decDeg: 5, scienceRangeA: [4000, 9000], maxLossFraction: 0.05, exposureS: 3600 },
  { name: 'north site, Dec +85 (circumpolar)', latDeg: 28.7, decDeg: 85, scienceRangeA: [4000, 9000], maxLossFraction: 0.05, exposureS: 7200 },
  { name: 'south site, Dec -85 (circumpolar)', latDeg: -30.2, decDeg: -85, scienceRangeA: [4500, 8000], maxLossFraction: 0.08, exposureS: 7200 },
  { name: 'south site, Dec +20 (low, high airmass)', latDeg: -30.2, decDeg: 20, scienceRangeA: [4000, 9000], maxLossFraction: 0.1, exposureS: 5400 },
  { name: 'north site, Dec -40 (low)', latDeg: 19.8, decDeg: -40, scienceRangeA: [5000, 9000], maxLossFraction: 0.1, exposureS: 3600 },
  { name: 'north site, Dec +40, narrow range', latDeg: 31.9, decDeg: 40, scienceRangeA: [8450, 8750], maxLossFraction: 0.03, exposureS: 10800 },
  { name: 'never rising: Dec -70 from latitude +35', latDeg: 35, decDeg: -70, scienceRangeA: [4000, 9000], maxLossFraction: 0.05, exposureS: 3600 },
];

/** A generated mask: centre at RA 200, the case's Dec, a seeded PA and 40 tracer slits spread over 10' x 6'. */
function maskCase(c: Case, seed: number): Omit<MaskRefractionInput, 'designHourAngleH'> {
  const rng = makeRng(seed);
  const mask: MaskPointing = { id: 'm', raDeg: 200, decDeg: c.decDeg, paDeg: rng.uniform(0, 360), locked: true };
  const centre = tangentCentre(mask.raDeg, mask.decDeg);
  const slits: Slit[] = Array.from({ length: 40 }, (_, k) => {
    const x = rng.uniform(-300, 300), y = rng.uniform(-180, 180);
    const s = maskToSkyArcsec(x, y, mask.paDeg);
    const p = tangentToSkyDeg(centre, s.xiArcsec, s.etaArcsec);
    return { maskId: 'm', slitId: `s${k}`, objectId: `o${k}`, role: 'tracer', raDeg: p.raDeg, decDeg: p.decDeg, xArcsec: x, yArcsec: y, lenBelowArcsec: 3, lenAboveArcsec: 3, widthArcsec: k % 3 ? 1 : 0.8, tiltDeg: 0, priority: 1, mag: 21 };
  });
  const settings: RefractionSettings = {
    seeingFwhmArcsec: 0.8, maxLossFraction: c.maxLossFraction, guideWavelengthA: 6500, scienceRangeA: c.scienceRangeA,
    hourAngleRangeH: [-5, 5], hourAngleStepH: 0.25, maxAirmass: 2.5,
  };
  return { mask, slits, latDeg: c.latDeg, air: AIR, settings };
}

/** The exhaustive choice: the full report at every 0.05 h; the longest window holding the design (fitting the exposure first). */
function exhaustive(input: Omit<MaskRefractionInput, 'designHourAngleH'>, exposureS: number): { h: number; len: number } {
  let best = { h: 0, len: -1, fits: false };
  for (let i = -100; i <= 100; i++) {
    const h = i * 0.05;
    const r = maskRefractionReport({ ...input, designHourAngleH: h });
    const len = r.windowContainsDesign ? windowLengthH(r.hourAngleWindowH) : 0;
    const fits = len * 3600 >= exposureS;
    if ((fits && !best.fits) || (fits === best.fits && (len > best.len + 1e-6 || (Math.abs(len - best.len) <= 1e-6 && Math.abs(h) < Math.abs(best.h))))) best = { h, len, fits };
  }
  return best;
}

describe('fast choice of the design hour angle against the exhaustive fine grid', () => {
  it.each(CASES.map((c, i) => [c.name, i] as const))('%s', (_name, i) => {
    const c = CASES[i];
    const input = maskCase(c, 100 + i);
    const fast = chooseDesignHourAngle(input, designHourAngleCandidatesH([-5, 5], 0.25), c.exposureS);
    const full = exhaustive(input, c.exposureS);
    const fastLen = fast.windowContainsDesign ? windowLengthH(fast.hourAngleWindowH) : 0;
    expect(fastLen).toBeGreaterThanOrEqual(full.len - 0.02);
    expect(fastLen * 3600 >= c.exposureS).toBe(full.len * 3600 >= c.exposureS);
    // The returned report is the full report at the chosen hour angle (not a cheaper stand-in).
    expect(fast).toEqual(maskRefractionReport({ ...input, designHourAngleH: fast.designHourAngleH }));
    if (full.len === 0) {
      // Nothing passes: transit is kept, and the report says why there is no window.
      expect(fast.designHourAngleH).toBe(0);
      if (c.name.startsWith('never rising')) {
        expect(fast.hourAngleWindowH).toBeNull();
        expect(fast.windowNote).toMatch(/below the horizon/);
      }
    }
  });

  it('the scorer gives the report\'s window length (within 0.01 h) at every 0.25 h; max and RMS difference printed', () => {
    const diffs: number[] = [];
    for (let i = 0; i < CASES.length; i++) {
      const input = maskCase(CASES[i], 100 + i);
      const score = designWindowScorer(input);
      for (let h = -5; h <= 5; h += 0.25) {
        const r = maskRefractionReport({ ...input, designHourAngleH: h });
        diffs.push(score(h) - (r.windowContainsDesign ? windowLengthH(r.hourAngleWindowH) : 0));
      }
    }
    const max = Math.max(...diffs.map(Math.abs)), rms = Math.sqrt(diffs.reduce((a, d) => a + d * d, 0) / diffs.length);
    console.log(`design hour angle scorer vs full report: ${diffs.length} windows, max |difference| ${max.toFixed(5)} h, RMS ${rms.toFixed(5)} h`);
    expect(max).toBeLessThanOrEqual(0.01);
    // Some windows exist and some do not: the comparison covers both.
    expect(diffs.length).toBe(CASES.length * 41);
  });
});

/** chooseDesignHourAngle's ranking with every candidate scored (no candidate skipped once the best cannot be beaten). */
function everyCandidate(input: Omit<MaskRefractionInput, 'designHourAngleH'>, candidatesH: readonly number[], exposureS: number): number {
  const score = designWindowScorer(input);
  let best: { h: number; s: number } | null = null;
  const consider = (h: number) => {
    const s = score(h);
    if (!best) { best = { h, s }; return; }
    const fits = s * 3600 >= exposureS, bestFits = best.s * 3600 >= exposureS;
    if ((fits && !bestFits) || (fits === bestFits && (s > best.s + 1e-6 || (Math.abs(s - best.s) <= 1e-6 && Math.abs(h) < Math.abs(best.h))))) best = { h, s };
  };
  for (const h of candidatesH) consider(h);
  const lo = candidatesH[0], hi = candidatesH[candidatesH.length - 1];
  for (let step = (candidatesH[1] - candidatesH[0]) / 2, k = 0; k < 3; k++, step /= 2) {
    const b = (best as unknown as { h: number }).h;
    for (const h of [b - step, b + step]) if (h >= lo && h <= hi) consider(h);
  }
  return (best as unknown as { h: number }).h;
}

describe('candidates that cannot beat a window as long as the searched range are not scored', () => {
  // A narrow science range and a loose loss limit: every hour angle of the range passes, the case the skip is for;
  // the CASES above cover windows shorter than the range. An exposure longer than the range covers "nothing fits".
  const open: Case[] = [
    ...CASES,
    { name: 'north site, Dec +60, narrow range, loose limit', latDeg: 28.7, decDeg: 60, scienceRangeA: [8600, 8650], maxLossFraction: 0.5, exposureS: 3600 },
    { name: 'same, exposure longer than the range', latDeg: 28.7, decDeg: 60, scienceRangeA: [8600, 8650], maxLossFraction: 0.5, exposureS: 40000 },
  ];
  it.each(open.map((c, i) => [c.name, i] as const))('%s: the same design hour angle as scoring every candidate', (_name, i) => {
    const c = open[i];
    const input = maskCase(c, 300 + i);
    const candidates = designHourAngleCandidatesH([-5, 5], 0.25);
    const fast = chooseDesignHourAngle(input, candidates, c.exposureS);
    expect(fast.designHourAngleH).toBe(everyCandidate(input, candidates, c.exposureS));
    if (i >= CASES.length) expect(fast.hourAngleWindowH).toEqual([-5, 5]);
  });

  // The candidate nearest transit is scored first; candidates on one side of transit (nearest at an end) and with
  // transit (nearest in the middle) give the same choice as scoring every candidate, window as long as the range or not.
  it.each(open.map((c, i) => [c.name, i] as const))('%s: candidates after, before and around transit, the same choice as scoring every candidate', (_name, i) => {
    const c = open[i];
    const input = maskCase(c, 300 + i);
    for (const range of [[0.5, 5], [-5, -0.5], [-2.5, 5]] as [number, number][]) {
      const candidates = designHourAngleCandidatesH(range, 0.25);
      expect(chooseDesignHourAngle(input, candidates, c.exposureS).designHourAngleH).toBe(everyCandidate(input, candidates, c.exposureS));
    }
  });
});

describe('a context moved to another design hour angle', () => {
  it('equals the context made for that design hour angle (the slit geometry reused)', () => {
    const input = maskCase(CASES[5], 7);
    const at0 = maskRefractionContext({ ...input, designHourAngleH: 0 });
    for (const d of [-2.25, 0, 1.5]) {
      const moved = contextForDesignHourAngle(at0, d);
      // The images per hour angle are shared between the two (filled by the reports before): compared apart.
      expect({ ...moved, imagesByHour: null }).toEqual({ ...maskRefractionContext({ ...input, designHourAngleH: d }), imagesByHour: null });
      expect(moved.imagesByHour).toBe(at0.imagesByHour);
      expect(maskRefractionReportOf(moved)).toEqual(maskRefractionReport({ ...input, designHourAngleH: d }));
    }
  });
});
