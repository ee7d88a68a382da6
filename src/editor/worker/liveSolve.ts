/**
 * Fast re-solve while a mask is dragged: the pipeline's own stages (src/core/pipeline/pipeline.ts), with the
 * allocation of the last solve kept, so moving one mask re-prepares and re-allocates only that mask
 * (solver/allocateMasks.ts `reallocateOneMask`: the other masks keep their tracers), then redoes starlight and
 * sky slits (solver/starlight.ts `placeStarlightOnMask`, with the cells, bins and reach of the other masks counted
 * as taken, and one prepared starlight stage for the whole drag) and lengthening on that mask only (starlight co-added
 * per bin only when every mask is redone), and coverage with the co-added starlight bins over all. The result is a live preview; when the
 * drag ends, the editor solves the committed plan with the full `solvePlan`, so the numbers it keeps
 * are exactly the pipeline's.
 *
 * A plan with several spectrographs (plan key `instruments`) takes the same path with per-mask contexts
 * (solver/instrumentContexts.ts): the moved mask is re-prepared and re-allocated with its own profile's footprint,
 * rules and tracer values, and its starlight, sky and lengthening follow its own profile's stage.
 */
import type { CatalogReadResult } from '../../core/catalog/types';
import type { PlanFile } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';
import { galaxyModel } from '../../core/plan/validate';
import { wrap360Deg } from '../../core/sky/angles';
import { addStarlightAndSky, coaddStarlight, lengthenMasks, measureStarlightBins, placeMasks, planFullyPlaced, solvedPlanFile, targetWeights } from '../../core/pipeline/pipeline';
import { allocateForPointings, allocationContext, reallocateOneMask, type AllocationContext, type PointingsAllocation } from '../../core/solver/allocateMasks';
import { lineWindowSettings } from '../../core/profile/wavelength';
import { coverageReport } from '../../core/coverage/coverage';
import { objectiveContext } from '../../core/solver/objective';
import { starlightTrade } from '../../core/solver/searchEnv';
import { placeStarlightOnMask, starlightStage, starlightTaken, type StarlightStage, type StarlightTaken } from '../../core/solver/starlight';
import type { MaskPointing, MaskSolution } from '../../core/geometry/maskSolution';
import type { SolveResult } from './protocol';
import { instrumentsAllocationContext } from '../../core/solver/instrumentContexts';
import { contextFor, withContextSections } from '../../core/solver/maskContext';
import { planProfiles, planWithMaskInstruments } from '../../core/plan/instruments';

interface LiveCache {
  key: string;
  inputs: object;
  ctx: AllocationContext;
  galaxy: ReturnType<typeof galaxyModel>;
  weightWarnings: string[];
  pointings: MaskPointing[];
  alloc: PointingsAllocation;
  /** Every mask after starlight, sky and lengthening, for the current allocation. */
  finished: MaskSolution[] | null;
  /** The starlight stage of each profile (settings, rules, trade), by profile id, prepared once per profile. */
  stages: Map<string, StarlightStage>;
  trade: ReturnType<typeof starlightTrade>;
  /** Starlight coverage of every mask but `index` (those stay as they are while `index` is dragged). */
  taken: { index: number; value: StarlightTaken } | null;
}

let cache: LiveCache | null = null;

/** Everything of the plan except the mask placements (a change there, or of a mask's instrument, needs a full rebuild). */
function planKey(plan: PlanFile): string {
  const { masks, ...rest } = plan;
  return JSON.stringify([rest, (masks ?? []).map((m) => [m.id, m.instrument ?? null])]);
}

/** The starlight stage of mask `ms`'s own profile, made once per profile. */
function stageOf(c: LiveCache, ms: MaskSolution, plan: PlanFile): StarlightStage {
  const own = contextFor(c.ctx, ms.mask);
  let st = c.stages.get(own.profile.id);
  if (!st) c.stages.set(own.profile.id, (st = starlightStage(c.galaxy, own.profile, withContextSections(own, plan), c.trade)));
  return st;
}

const samePointing = (a: MaskPointing, b: MaskPointing) => a.raDeg === b.raDeg && a.decDeg === b.decDeg && a.paDeg === b.paDeg;

/** The plan's masks as pointings when every one is placed (a drag never has unplaced masks), else null. */
function givenPointings(plan: PlanFile): MaskPointing[] | null {
  const masks = plan.masks ?? [];
  if (!planFullyPlaced(plan)) return null;
  return masks.map((m) => ({
    id: m.id, raDeg: m.raDeg!, decDeg: m.decDeg!, paDeg: wrap360Deg(m.paDeg!), locked: true, ...(m.instrument !== undefined ? { instrument: m.instrument } : {}),
  }));
}

/**
 * Live solve of `plan` (every placed mask kept where it is); `inputs` identifies the catalog and profile. A plan with
 * `instruments` needs `profiles`, every profile by the plan's reference (as solvePlan's PlanInputs.profiles).
 */
export function liveSolve(planIn: PlanFile, profile: InstrumentProfile, catalog: CatalogReadResult, inputs: object, profiles?: Readonly<Record<string, InstrumentProfile>>): SolveResult {
  const t0 = performance.now();
  let moved = -1;
  // Several spectrographs: every mask listed with its own profile id, as solvePlan does.
  const plan = planWithMaskInstruments(planIn, profiles ?? {});
  const key = planKey(plan);
  if (!cache || cache.key !== key || cache.inputs !== inputs) {
    const galaxy = galaxyModel(plan);
    const weightWarnings: string[] = [];
    const weights = targetWeights(plan, catalog.targets, weightWarnings);
    const ctx = plan.instruments?.length
      ? instrumentsAllocationContext(plan, planProfiles(plan, profiles ?? {}), galaxy, catalog.targets, weights, profiles)
      : allocationContext(profile, galaxy, plan.goals.linesA, catalog.targets, weights, lineWindowSettings(plan.goals));
    // Every mask placed (the case while dragging): allocate for the pointings as given, without a search.
    const given = givenPointings(plan);
    const placed = given ? { pointings: given, allocation: allocateForPointings(ctx, given) } : placeMasks(plan, galaxy, profile, ctx);
    const objective = objectiveContext(plan.goals, plan.search, Array.from(ctx.tracerIndices, (i) => ctx.weights[i]));
    const trade = starlightTrade(objective);
    cache = { key, inputs, ctx, galaxy, weightWarnings, pointings: placed.pointings, alloc: placed.allocation, finished: null, stages: new Map(), trade, taken: null };
  } else {
    const c = cache;
    const next = givenPointings(plan);
    if (!next || next.length !== c.pointings.length || next.some((p, i) => p.id !== c.pointings[i].id)) {
      const placed = placeMasks(plan, c.galaxy, profile, c.ctx);
      c.pointings = placed.pointings;
      c.alloc = placed.allocation;
      c.finished = null;
    } else {
      const changed = next.map((p, i) => (samePointing(p, c.pointings[i]) ? -1 : i)).filter((i) => i >= 0);
      if (changed.length === 1) {
        c.alloc = reallocateOneMask(c.ctx, c.alloc, changed[0], next[changed[0]]);
        moved = changed[0];
      } else if (changed.length > 1) {
        c.alloc = allocateForPointings(c.ctx, next);
        c.finished = null;
      }
      c.pointings = next;
    }
  }
  const t1 = performance.now();
  const warnings = [...cache.weightWarnings];
  let masks: MaskSolution[];
  let t2: number;
  if (cache.finished && moved >= 0) {
    // One mask moved and the others kept their tracers: redo starlight, sky and lengthening on that mask only
    // (the full solve after the drag redoes them on all masks together).
    const stage = stageOf(cache, cache.alloc.masks[moved], plan);
    if (!cache.taken || cache.taken.index !== moved) {
      const finished = cache.finished;
      cache.taken = { index: moved, value: starlightTaken(stage, finished.filter((_, i) => i !== moved)) };
    }
    const one = placeStarlightOnMask(stage, cache.alloc.masks[moved], cache.taken.value);
    warnings.push(...one.warnings);
    t2 = performance.now();
    masks = cache.finished.slice();
    masks[moved] = lengthenMasks(plan, profile, [one.mask], cache.ctx)[0];
  } else if (cache.finished && moved < 0) {
    t2 = performance.now();
    masks = cache.finished;
  } else {
    cache.taken = null;
    masks = coaddStarlight(plan, cache.ctx, addStarlightAndSky(plan, cache.ctx, cache.alloc.masks, warnings));
    t2 = performance.now();
    masks = lengthenMasks(plan, profile, masks, cache.ctx);
  }
  cache.finished = masks;
  const t3 = performance.now();
  const coverage = coverageReport(cache.galaxy, plan.goals, masks.flatMap((m) => m.slits));
  measureStarlightBins(plan, cache.ctx, cache.galaxy, masks, coverage);
  const stageMs = { allocation: t1 - t0, starlightAndSky: t2 - t1, lengthening: t3 - t2, coverage: performance.now() - t3 };
  return {
    plan: solvedPlanFile(plan, cache.pointings), galaxy: cache.galaxy, masks, coverage, warnings,
    extra: { problems: cache.alloc.problems, preview: true, stageMs },
  };
}

/** Forget the cached allocation (new catalog or profile). */
export function resetLiveSolve(): void {
  cache = null;
}
