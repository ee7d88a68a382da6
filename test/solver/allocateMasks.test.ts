/** The allocation stage on an invented scenario: joint allocation, one-mask re-solve after a drag, checker-clean rows. */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { generateScenario, scenarioCatalog } from '../../src/core/scenario/generator';
import { galaxyModel, parsePlan } from '../../src/core/plan/validate';
import { parseProfileText } from '../../src/core/profile/load';
import { targetWeights } from '../../src/core/pipeline/pipeline';
import { allocateForPointings, allocationContext, reallocateOneMask } from '../../src/core/solver/allocateMasks';
import { naiveCrossLayout } from '../../src/core/solver/pointingSearch';
import { checkOutput } from '../../src/core/check/checkOutput';
import { masksToCsv, parseMasksCsv, parseSlitsCsv, slitsToCsv } from '../../src/core/export/slitsCsv';
import type { MaskSolution } from '../../src/core/geometry/maskSolution';
import { weightedIntervalScheduling } from '../../src/core/solver/intervalScheduling';

const profile = parseProfileText(readFileSync(resolve(__dirname, '../../instrument-profiles/quad8-square.json'), 'utf8'));
const s = generateScenario({ seed: 'alloc-test', candidates: 1500, alignmentStars: 400, alignmentMagRange: profile.alignment.magRange as [number, number], instrument: profile.id });
const plan = parsePlan(s.plan);
const galaxy = galaxyModel(plan);
const catalog = scenarioCatalog(s);
const ctx = allocationContext(profile, galaxy, plan.goals.linesA, catalog.targets, targetWeights(plan, catalog.targets, []));
const pointings = naiveCrossLayout({ ...plan, masks: [] }, galaxy, profile);

function violations(masks: MaskSolution[]) {
  return checkOutput({
    masks: parseMasksCsv(masksToCsv(masks.map((m) => ({ maskId: m.mask.id, instrument: profile.id, raDeg: m.mask.raDeg, decDeg: m.mask.decDeg, paDeg: m.mask.paDeg }))), 'masks.csv'),
    slits: parseSlitsCsv(slitsToCsv(masks.flatMap((m) => m.slits)), 'slits.csv'),
    profileFor: () => profile, linesRestA: plan.goals.linesA, vsysKms: galaxy.vsysKms,
  });
}

describe('allocation stage', () => {
  const full = allocateForPointings(ctx, pointings);

  it('gives every mask its boxes and tracer slits, checker-clean, with a bound no lower than the yield', () => {
    expect(full.problems).toEqual([]);
    expect(full.masks.every((m) => m.slits.filter((x) => x.role === 'alignment').length === profile.alignment.minCount)).toBe(true);
    expect(full.masks.every((m) => m.slits.some((x) => x.role === 'tracer'))).toBe(true);
    expect(full.joint.upperBound).toBeGreaterThanOrEqual(full.joint.objective - 1e-9);
    expect(violations(full.masks)).toEqual([]);
  });

  it('after a drag, the moved mask is re-solved exactly with the others fixed, and stays checker-clean', () => {
    const m = 2;
    const moved = { ...pointings[m], raDeg: pointings[m].raDeg + 20 / 3600, paDeg: (pointings[m].paDeg + 7) % 360 };
    const r = reallocateOneMask(ctx, full, m, moved);
    expect(r.masks[m].mask.paDeg).toBe(moved.paDeg);
    for (let i = 0; i < 4; i++) if (i !== m) expect(r.masks[i]).toBe(full.masks[i]);
    expect(violations(r.masks)).toEqual([]);
    // Exact for mask m: equal to interval scheduling over its candidates not held by the other masks.
    const held = new Set(r.masks.filter((_, i) => i !== m).flatMap((x) => x.slits.map((y) => y.objectId)));
    const p = r.prepared[m].candidates;
    const w = Array.from(p.objects, (o) => (held.has(ctx.targets[o].id) ? 0 : ctx.weights[o]));
    const best = weightedIntervalScheduling(p.starts, p.ends, w).total;
    const got = r.masks[m].slits.filter((x) => x.role === 'tracer').reduce((a, x) => a + x.priority, 0);
    expect(got).toBeCloseTo(best, 9);
  });
});
