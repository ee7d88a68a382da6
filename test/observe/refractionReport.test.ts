import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { refractionReport, withObservingReport, withoutSolveOutputs, observingReportForPlan, formatRefractionSummary, compactObservingReport } from '../../src/core/pipeline/refractionReport';
import { resolveObservingSettings } from '../../src/core/observe/observingSettings';
import { parseProfileText } from '../../src/core/profile/load';
import { parsePlan, galaxyModel } from '../../src/core/plan/validate';
import { solvePlan } from '../../src/core/pipeline/pipeline';
import { readCatalog } from '../../src/core/catalog/read';
import { maskToSkyArcsec } from '../../src/core/sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import type { MaskSolution, Slit } from '../../src/core/geometry/maskSolution';

const profile = parseProfileText(readFileSync('instrument-profiles/ridge10-narrow.json', 'utf8'));
const planJson = {
  format: 'haloweave.plan/1',
  galaxy: { id: 'g', ra: 30, dec: 10, reArcsec: 45, axisRatio: 0.8, paDeg: 30, distanceMpc: 18, vsysKms: 1250, sersicN: 4, muE: 21.5 },
  instrument: 'ridge10-narrow', catalog: 'c.csv',
  goals: { masks: 2, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498, 8542.1, 8662.1] },
  masks: [{ id: 'm1', raDeg: 30, decDeg: 10, paDeg: 30, locked: true, designHourAngleH: 1 }, { id: 'm2', raDeg: 30.03, decDeg: 10.04, paDeg: 100, locked: true }],
  observing: { seeingFwhmArcsec: 0.7, scienceRangeA: [7800, 9000], guideWavelengthA: 6500 },
};

function maskSolution(id: string, raDeg: number, decDeg: number, paDeg: number): MaskSolution {
  const c = tangentCentre(raDeg, decDeg);
  const slits: Slit[] = [];
  for (let i = 0; i < 20; i++) {
    const x = ((i * 53) % 260) - 130, y = -450 + i * 45;
    const s = maskToSkyArcsec(x, y, paDeg);
    const p = tangentToSkyDeg(c, s.xiArcsec, s.etaArcsec);
    slits.push({ maskId: id, slitId: `${id}-s${i}`, objectId: `${id}-o${i}`, role: i % 7 === 3 ? 'starlight' : 'tracer', raDeg: p.raDeg, decDeg: p.decDeg, xArcsec: x, yArcsec: y, lenBelowArcsec: 3, lenAboveArcsec: 3, widthArcsec: 1, tiltDeg: 0, priority: 1, mag: i % 7 === 3 ? null : 20 + (i % 4) });
  }
  return { mask: { id, raDeg, decDeg, paDeg, locked: true }, slits };
}

describe('refraction report of a plan', () => {
  const plan = parsePlan(planJson);
  const galaxy = galaxyModel(plan);
  const masks = [maskSolution('m1', 30, 10, 30), maskSolution('m2', 30.03, 10.04, 100)];

  it('gives one report per mask with its design hour angle and a window', () => {
    const settings = resolveObservingSettings(plan.observing, profile);
    const r = refractionReport({ galaxy, masks, site: profile.site, settings, designHourAnglesH: { m1: 1 } });
    // m1 keeps its own design hour angle; m2 gives none, so the report chooses the candidate with the longest window.
    expect(r.masks[0].designHourAngleH).toBe(1);
    const m2 = r.masks[1];
    const fixed = (h: number) => refractionReport({ galaxy, masks, site: profile.site, settings: { ...settings, designHourAngleChosen: false, designHourAngleH: h } }).masks[1];
    const len = (w: [number, number] | null) => (w ? w[1] - w[0] : 0);
    for (const h of [-2, -1, 0, 1, 2]) expect(len(m2.hourAngleWindowH)).toBeGreaterThanOrEqual(len(fixed(h).hourAngleWindowH) - 1e-9);
    for (const m of r.masks) {
      expect(m.windowSlitCount).toBe(17);
      expect(m.hourAngleWindowH).not.toBeNull();
      expect(m.hourAngleWindowH![0]).toBeLessThanOrEqual(m.designHourAngleH);
      expect(m.hourAngleWindowH![1]).toBeGreaterThanOrEqual(m.designHourAngleH);
      expect(m.rows).toHaveLength(33);
    }
    const lines = formatRefractionSummary(r);
    // Slits are cut for the middle of the science range, the guider works at its own wavelength.
    expect(lines[0]).toMatch(/^Differential refraction \(seeing 0.7" FWHM, slits cut at 8400 A, guide 6500 A, science 7800-9000 A/);
    expect(lines[1]).toMatch(/m1: designed for HA \+1.00 h; hour-angle window/);
  });

  it('the whole observing report adds exposures, and the solved plan carries it and each mask\'s window', () => {
    const r = observingReportForPlan(plan, profile, galaxy, masks);
    expect(r.exposures).toHaveLength(2);
    expect(r.exposures![0].slits.filter((s) => s.role === 'starlight')).toHaveLength(3);
    expect(r.settings.exposureTimeS).toBe(7200); // falls back to the starlight exposure time
    const solved = withObservingReport(plan, r) as typeof plan & { observingReport: unknown; masks: { hourAngleWindowH: unknown }[] };
    expect(solved.masks.map((m) => m.hourAngleWindowH)).toEqual(r.masks.map((m) => m.hourAngleWindowH));
    const text = JSON.stringify(solved);
    expect(JSON.parse(text).observingReport.masks[0].maskId).toBe('m1');
    expect(parsePlan(JSON.parse(text)).masks![0].designHourAngleH).toBe(1); // loads again as a plan
    // Opened again for editing: the solve's outputs go, every input stays (the design hour angle too).
    expect(withoutSolveOutputs(solved)).toStrictEqual({ ...plan, masks: plan.masks!.map((m, i) => ({ ...m, designHourAngleH: m.designHourAngleH ?? r.masks[i].designHourAngleH })) });
    const compact = compactObservingReport(r);
    expect(compact.masks[0].rows[10].maxLossFraction).toBeCloseTo(r.masks[0].rows[10].maxLossFraction!, 4);
  });

  it('solvePlan puts the report in the solution and the solved plan (and can skip it)', () => {
    const lines = ['id,ra,dec,mag,role'];
    let seed = 11;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
    for (let i = 0; i < 300; i++) lines.push(`t${i},${(30 + (rnd() - 0.5) * 0.3).toFixed(6)},${(10 + (rnd() - 0.5) * 0.3).toFixed(6)},${(20 + 3 * rnd()).toFixed(2)},tracer`);
    for (let i = 0; i < 40; i++) lines.push(`a${i},${(30 + (rnd() - 0.5) * 0.3).toFixed(6)},${(10 + (rnd() - 0.5) * 0.3).toFixed(6)},${(16 + 3 * rnd()).toFixed(2)},alignment`);
    const catalog = readCatalog(lines.join('\n'), 'c.csv');
    const solution = solvePlan({ plan, profile, catalog });
    expect(solution.observingReport?.masks.map((m) => m.maskId)).toEqual(['m1', 'm2']);
    const solvedMasks = solution.plan.masks as { id: string; hourAngleWindowH?: unknown }[];
    expect(solvedMasks.every((m) => 'hourAngleWindowH' in m)).toBe(true);
    expect((solution.plan as Record<string, unknown>).observingReport).toBeDefined();
    const fast = solvePlan({ plan, profile, catalog }, { skipObservingReport: true });
    expect(fast.observingReport).toBeUndefined();
  });
});
