/**
 * Search quality against brute force: on small generated galaxies (the scenario generator, with the suite's kind of
 * variety: RA across 0/360, Dec from -70 to +75, flattened and round galaxies, every instrument profile), the pointing
 * search's result is compared with an exhaustive grid over the mask's centre offset and PA written here. The grid is
 * the independent part; the project's own allocation (allocateForPointings + planObjective: alignment boxes, exact
 * interval scheduling, joint allocation) is the evaluator, as the search's objective is defined by it.
 * Layouts with masks short of alignment boxes are invalid for both (the allocation reports them as problems).
 * Integrated starlight is off (goals.starlightReachRe 0) so that the evaluator is the tracer allocation alone.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { generateScenario, scenarioCatalog } from '../../src/core/scenario/generator';
import { galaxyModel, parsePlan } from '../../src/core/plan/validate';
import { parseProfile } from '../../src/core/profile/load';
import { solvePlan, targetWeights } from '../../src/core/pipeline/pipeline';
import { allocateForPointings, allocationContext } from '../../src/core/solver/allocateMasks';
import { evaluatePointings, planObjective } from '../../src/core/solver/pointingSearch';
import { searchEnv, type SearchEnv } from '../../src/core/solver/searchEnv';
import { polygonBounds } from '../../src/core/geometry/polygon';
import { skyToTangentArcsec, tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';
import type { MaskPointing } from '../../src/core/geometry/maskSolution';

interface Case { name: string; profileId: string; seed: number; masks: number; floor: number; galaxy: { raDeg: number; decDeg: number; reArcsec: number; axisRatio: number; paDeg: number } }

/**
 * Small cases: 160 catalog rows, 40 of them alignment stars, the rest clusters and field contaminants; galaxies unlike each other.
 * Measured with the default search budget (ratio search / grid optimum; the grid took 4 100-6 200 poses per case):
 *   narrow 0.957, square 1.032 (the search beats the grid between its nodes), wide 0.897; after the search learnt to
 *   keep the naive cross's reach and to weigh refraction (same evaluator for both): narrow 0.9487, square 1.0316,
 *   wide 0.9095; with four step levels at the default effort (the current default): narrow 0.9798, square 0.9768,
 *   wide 0.9495, and for two masks 0.9387, 0.9478;
 *   with search.effort 4: narrow 0.994, square 1.013, wide 0.943.
 * The wide-mask case finds a different basin: the grid's best centre is 180" away from the search's, at a PA turned
 * by 180 deg (neither turning the search's pose by 180 deg nor moving it there at its own PA gets close, so this is a
 * missed basin, not a missing flip move). `floor` is what each case asserts: 0.95 where it is reached, and just under
 * the measured ratio where not (narrow 0.94, wide 0.88), so a change that makes the search worse fails here.
 */
const CASES: Case[] = [
  { name: 'narrow slit mask, flattened galaxy across RA 0', profileId: 'ridge10-narrow', seed: 21, masks: 1, floor: 0.94, galaxy: { raDeg: 359.97, decDeg: -41.2, reArcsec: 25, axisRatio: 0.45, paDeg: 62 } },
  { name: 'square mask, round galaxy far north', profileId: 'quad8-square', seed: 22, masks: 1, floor: 0.95, galaxy: { raDeg: 187.2, decDeg: 74.6, reArcsec: 18, axisRatio: 0.95, paDeg: 140 } },
  { name: 'wide mask, far south', profileId: 'broad65-wide', seed: 23, masks: 1, floor: 0.88, galaxy: { raDeg: 0.08, decDeg: -69.5, reArcsec: 40, axisRatio: 0.7, paDeg: 10 } },
];

function setUp(c: Case) {
  const profile = parseProfile(JSON.parse(readFileSync(new URL(`../../instrument-profiles/${c.profileId}.json`, import.meta.url), 'utf8')), c.profileId);
  const s = generateScenario({
    seed: c.seed, candidates: 160, alignmentStars: 40, alignmentMagRange: profile.alignment.magRange, maxRadiusRe: 6,
    instrument: c.profileId, masks: c.masks, galaxy: { ...c.galaxy, id: `Grid Galaxy ${c.seed}` },
  });
  const plan = parsePlan({ ...s.plan, goals: { ...(s.plan.goals as object), starlightReachRe: 0, tracerReachRe: 6 } });
  const catalog = scenarioCatalog(s);
  const galaxy = galaxyModel(plan);
  const ctx = allocationContext(profile, galaxy, plan.goals.linesA, catalog.targets, targetWeights(plan, catalog.targets, []));
  return { profile, plan, catalog, galaxy, ctx, env: searchEnv(plan, ctx) };
}

/** A pose in the galaxy's tangent plane: centre offset (xi East, eta North, arcsec) and PA (deg East of North). */
interface Pose { xi: number; eta: number; paDeg: number }

/** Score of poses by the project's allocation: masks short of alignment boxes first (fewer is better), then the objective. */
function scorer(env: SearchEnv, ids: readonly string[]) {
  const gc = tangentCentre(env.ctx.galaxy.raDeg, env.ctx.galaxy.decDeg);
  const toPointing = (p: Pose, i: number): MaskPointing => {
    const sky = tangentToSkyDeg(gc, p.xi, p.eta);
    return { id: ids[i], raDeg: sky.raDeg, decDeg: sky.decDeg, paDeg: ((p.paDeg % 360) + 360) % 360, locked: false };
  };
  let evaluations = 0;
  const score = (poses: readonly Pose[]) => {
    evaluations++;
    const a = allocateForPointings(env.ctx, poses.map(toPointing));
    return { problems: a.problems.length, total: planObjective(env, a.masks).total };
  };
  return { score, toPointing, count: () => evaluations, gc };
}

const better = (a: { problems: number; total: number }, b: { problems: number; total: number }) => a.problems < b.problems || (a.problems === b.problems && a.total > b.total);

/**
 * Exhaustive grid for mask m with the others fixed: a coarse grid (centre step a sixth of the footprint's short side,
 * over the candidates' extent plus a quarter of that side; PA every paStepDeg over 360, as the footprint and the
 * wavelength rule are not symmetric), then a fine grid (step / 4, PA step / 6) around the refineTop best coarse poses.
 */
function gridBest(env: SearchEnv, profileBounds: ReturnType<typeof polygonBounds>, s: ReturnType<typeof scorer>, fixed: Pose[], m: number, g = { paStepDeg: 15, refineTop: 3 }) {
  const short = Math.min(profileBounds.maxX - profileBounds.minX, profileBounds.maxY - profileBounds.minY);
  let extent = 0;
  for (const i of env.ctx.tracerIndices) extent = Math.max(extent, Math.abs(env.xi[i]), Math.abs(env.eta[i]));
  const step = short / 6, half = extent + short / 4;
  const n = Math.ceil(half / step);
  const scored: { pose: Pose; v: { problems: number; total: number } }[] = [];
  const at = (p: Pose) => s.score(fixed.map((f, i) => (i === m ? p : f)));
  for (let i = -n; i <= n; i++) for (let j = -n; j <= n; j++) for (let k = 0; k * g.paStepDeg < 360; k++) {
    const pose = { xi: i * step, eta: j * step, paDeg: k * g.paStepDeg };
    scored.push({ pose, v: at(pose) });
  }
  scored.sort((a, b) => (better(a.v, b.v) ? -1 : better(b.v, a.v) ? 1 : 0));
  let best = scored[0];
  for (const top of scored.slice(0, g.refineTop)) {
    for (let i = -4; i <= 4; i++) for (let j = -4; j <= 4; j++) for (let k = -4; k <= 4; k++) {
      const pose = { xi: top.pose.xi + (i * step) / 4, eta: top.pose.eta + (j * step) / 4, paDeg: top.pose.paDeg + (k * g.paStepDeg) / 6 };
      const v = at(pose);
      if (better(v, best.v)) best = { pose, v };
    }
  }
  return best;
}

describe('pointing search against an exhaustive grid of centre offsets and PAs (one mask)', () => {
  for (const c of CASES) {
    it(`reaches at least ${c.floor} of the grid optimum: ${c.name}`, () => {
      const x = setUp(c);
      const sol = solvePlan({ plan: x.plan, profile: x.profile, catalog: x.catalog }, { skipObservingReport: true });
      expect(sol.problems).toEqual([]);
      const s = scorer(x.env, ['m1']);
      const got = sol.plan.masks![0];
      const t = skyToTangentArcsec(s.gc, got.raDeg!, got.decDeg!)!;
      const searchPose: Pose = { xi: t.xiArcsec, eta: t.etaArcsec, paDeg: got.paDeg! };
      // The search's reported objective is the evaluator's value of its pointing (starlight off: nothing else counts).
      const own = s.score([searchPose]);
      expect(own.problems).toBe(0);
      expect(own.total).toBeCloseTo(sol.search.objective.total, 6);
      const best = gridBest(x.env, polygonBounds(x.profile.footprint), s, [searchPose], 0);
      expect(best.v.problems).toBe(0);
      // The grid's best re-evaluated through the full path (joint allocation, then the starlight/sky stage) agrees.
      expect(evaluatePointings(x.env, [s.toPointing(best.pose, 0)]).value.total).toBeCloseTo(best.v.total, 6);
      const ratio = own.total / best.v.total;
      console.log(`${c.name}: search ${own.total.toFixed(2)} vs grid ${best.v.total.toFixed(2)} (${s.count()} poses), ratio ${ratio.toFixed(4)}; ` +
        `search pose (${searchPose.xi.toFixed(0)}", ${searchPose.eta.toFixed(0)}", ${searchPose.paDeg.toFixed(1)} deg), grid (${best.pose.xi.toFixed(0)}", ${best.pose.eta.toFixed(0)}", ${best.pose.paDeg.toFixed(1)} deg)`);
      expect(ratio).toBeGreaterThanOrEqual(c.floor);
    }, 300_000);
  }
});

describe('two masks: no single mask can be moved anywhere on the grid for a large gain', () => {
  it('moving either mask of the search\'s answer to its best grid pose (the other fixed) gains less than 9 %', () => {
    // Exhaustive over pairs is out of reach (10^7 layouts); instead each mask in turn is moved over the whole grid with
    // the other fixed where the search left it (block coordinate check). A search stuck in a poor layout would show a
    // single-mask move with a large gain. Measured on this grid: ratios 0.957 and 0.942 with the default budget (a single
    // move gains up to 6.2 %); on the finer one-mask grid 0.944 and 0.930, and with search.effort 4 there 0.992 and
    // 0.974. Floor 0.92.
    const c: Case = { name: 'two narrow masks', profileId: 'ridge10-narrow', seed: 31, masks: 2, floor: 0.92, galaxy: { raDeg: 0.02, decDeg: 12.3, reArcsec: 30, axisRatio: 0.6, paDeg: 115 } };
    const x = setUp(c);
    const sol = solvePlan({ plan: x.plan, profile: x.profile, catalog: x.catalog }, { skipObservingReport: true });
    expect(sol.problems).toEqual([]);
    const ids = sol.plan.masks!.map((m) => m.id);
    const s = scorer(x.env, ids);
    const poses = sol.plan.masks!.map((m) => {
      const t = skyToTangentArcsec(s.gc, m.raDeg!, m.decDeg!)!;
      return { xi: t.xiArcsec, eta: t.etaArcsec, paDeg: m.paDeg! };
    });
    const own = s.score(poses);
    expect(own.total).toBeCloseTo(sol.search.objective.total, 6);
    const ratios = [0, 1].map((m) => {
      // A coarser grid than for one mask (PA every 30 deg, the best coarse pose refined) keeps the run near a minute.
      const best = gridBest(x.env, polygonBounds(x.profile.footprint), s, poses, m, { paStepDeg: 30, refineTop: 1 });
      return own.total / best.v.total;
    });
    console.log(`two masks: search ${own.total.toFixed(2)}; ratio to the best single-mask grid move: ${ratios.map((r) => r.toFixed(4)).join(', ')} (${s.count()} layouts)`);
    for (const r of ratios) expect(r).toBeGreaterThanOrEqual(c.floor);
  }, 600_000);
});
