/**
 * The planning pipeline: a pure, synchronous composition of stages (the editor runs it in a Web Worker):
 * target weighting -> mask placement -> joint allocation (alignment boxes first) -> starlight and sky slits ->
 * slit lengthening -> coverage. Each stage is a small function of the previous stages' results, so a stage can
 * be replaced (e.g. the pointing search instead of the default layout) without touching the others.
 */
import type { CatalogReadResult, Target } from '../catalog/types';
import { targetColumnsOf, type TargetColumns } from '../catalog/targetColumns';
import { catalogTargetColumns } from '../catalog/validate';
import type { InstrumentProfile } from '../profile/schema';
import type { Problem } from '../result';
import type { GalaxyModel, PlanFile, PlanMask } from '../plan/schema';
import { galaxyModel } from '../plan/validate';
import { allocationContext, type AllocationContext, type PointingsAllocation } from '../solver/allocateMasks';
import { lengthenSlits } from '../solver/lengthen';
import { coverageReport, type CoverageReport } from '../coverage/coverage';
import { galaxyRadiusAndAzimuth } from '../sky/galaxyRadius';
import { planGoals, type GoalStatus, type StarlightBinsResult } from '../coverage/goals';
import { coaddStarlightBins, planStarlightModels } from '../solver/starlightCoadd';
import { starlightBins, starlightBinsForFile } from '../solver/starlightBins';
import type { MaskPointing, MaskSolution } from '../geometry/maskSolution';
import { keptColumnsOf, positionsFor, weighTargets, weightingPositions, type GalaxyPositions, type WeightingResult } from '../solver/weighting';
import { type WeightingRules } from '../plan/weightingSection';
import { starlightSettings } from '../solver/starlight';
import { startLayouts, searchPointings, type SearchReport } from '../solver/pointingSearch';
import { searchEnv, starlightTrade } from '../solver/searchEnv';
import { objectiveContext } from '../solver/objective';
import { withObservingReport, type ObservingReport } from './refractionReport';
import { lineWindowSettings } from '../profile/wavelength';
import { spectralReportForGroups, type SpectralReport } from '../spectro/spectralReport';
import { instrumentsAllocationContext } from '../solver/instrumentContexts';
import { instrumentsCrossLayout } from '../solver/instrumentLayout';
import { placeStarlightForMasks } from '../solver/instrumentSearch';
import { contextFor } from '../solver/maskContext';
import { observingReportForMasks } from './instrumentsReport';
import { planProfiles, planWithMaskInstruments } from '../plan/instruments';

export interface PlanInputs {
  plan: PlanFile;
  /** The plan's (first) instrument profile. */
  profile: InstrumentProfile;
  catalog: CatalogReadResult;
  /** Every profile a plan with `instruments` names, by the reference the plan gives (plan/instruments.ts). */
  profiles?: Readonly<Record<string, InstrumentProfile>>;
}

export interface SolveOptions {
  onProgress?(fraction: number, message: string): void;
  /** Skip the refraction/hour-angle and exposure report (observe/), e.g. while a mask is being dragged. */
  skipObservingReport?: boolean;
}

/** Per-mask figures for reports. */
export interface MaskStats {
  maskId: string;
  /** Tracers whose minimal slit fits and whose lines land on the detector (after the alignment boxes). */
  eligibleTracers: number;
  tracerSlits: number;
  alignmentBoxes: number;
}

export interface PlanSolution {
  /** The plan with every mask placed (raDeg, decDeg, paDeg in [0, 360)). */
  plan: PlanFile;
  galaxy: GalaxyModel;
  masks: MaskSolution[];
  coverage: CoverageReport;
  /** Every goal with its target, what was achieved, met or not and why (written into coverage.json as `goals`). */
  goals: GoalStatus[];
  warnings: string[];
  /** Problems that make the plan unusable as it stands (e.g. a mask with too few alignment stars). */
  problems: Problem[];
  /** The weighting rules in effect (text), the weights' sources and every target the rules excluded (solver/weighting). */
  weighting: WeightingResult;
  /** The pointing search's report: objective of the starting (naive) layout and of the result (solver/pointingSearch). */
  search: SearchReport;
  /** Refraction rows and recommended hour-angle window per mask, exposure estimates per slit (pipeline/refractionReport.ts). */
  observingReport?: ObservingReport;
  /** Photometry, line windows, resolving power and instrumental dispersion, OH-line flags, usable x per mask (spectro/spectralReport.ts). */
  spectralReport?: SpectralReport;
  stats: {
    masks: MaskStats[];
    /** Total tracer weight allocated, and the Lagrangian upper bound on the optimum for these pointings. */
    tracerWeight: number;
    tracerWeightUpperBound: number;
  };
}

/** Default cap on a lengthened slit, as a multiple of the profile's minimal length (plan key allocation.maxSlitLengthArcsec overrides). */
export const DEFAULT_MAX_LENGTH_FACTOR = 3;

// ---- stage 1: target weighting -------------------------------------------------------------------------

/**
 * Weight of every target from the plan's weighting rules (solver/weighting.ts; docs/weighting.md): without a
 * `weighting` section every tracer weighs its catalog priority, or 1; with one, the documented formula, a catalog
 * priority winning over it. targetOverrides win over both (`weight`; `force: "out"` gives 0). Targets the rules
 * exclude get 0 (alignment stars too, e.g. inside an exclusion region); kept alignment stars get 1. `force: "in"`
 * adds the sum of all other weights so the target is taken wherever it fits.
 */
export function targetWeights(plan: PlanFile, targets: readonly Target[] | TargetColumns, warnings: string[], weighting: WeightingResult = weighPlanTargets(plan, targets)): Float64Array {
  const table = targetColumnsOf(targets);
  const w = new Float64Array(table.length);
  const cols = keptColumnsOf(weighting, targets);
  if (cols) {
    for (let j = 0; j < cols.index.length; j++) { const i = cols.index[j]; w[i] = table.isAlignment(i) ? 1 : cols.weight[j]; }
    return withOverrides(plan, table, warnings, w);
  }
  // The kept targets are a subsequence of the catalog in catalog order (weighTargets keeps the order), so one walk
  // pairs them without an index of every id; a list of another order falls back to the lookup by id.
  const kept = weighting.targets;
  let j = 0;
  for (let i = 0; i < table.length && j < kept.length; i++) {
    if (kept[j].id !== table.ids[i]) continue;
    w[i] = table.isAlignment(i) ? 1 : kept[j].weight;
    j++;
  }
  if (j < kept.length) {
    const byId = new Map(kept.map((t) => [t.id, t]));
    table.ids.forEach((id, i) => { const k = byId.get(id); w[i] = k ? (table.isAlignment(i) ? 1 : k.weight) : 0; });
  }
  return withOverrides(plan, table, warnings, w);
}

/** Weights w with targetOverrides' `force: "in"` applied (an unknown id is a warning). */
function withOverrides(plan: PlanFile, table: TargetColumns, warnings: string[], w: Float64Array): Float64Array {
  const overrides = Object.entries(plan.targetOverrides ?? {});
  if (overrides.length === 0) return w;
  // Only the overridden ids are looked up (the last row of an id, as a map of every id would give).
  const index = new Map<string, number>();
  for (const [id] of overrides) index.set(id, -1);
  table.ids.forEach((id, i) => { if (index.has(id)) index.set(id, i); });
  let total = 0;
  for (const v of w) total += v;
  for (const [id, o] of overrides) {
    const i = index.get(id)!;
    if (i < 0) { warnings.push(`a weight or forcing is set for target "${id}" (targetOverrides in the plan file), but the catalog has no target with that id; it is ignored`); continue; }
    if (o.force === 'in' && w[i] > 0) w[i] += total;
  }
  return w;
}

/** Stage 1 proper: the weighting rules applied to the catalog (uniform weights when the plan has no `weighting` section). */
export function weighPlanTargets(plan: PlanFile, targets: readonly Target[] | TargetColumns): WeightingResult {
  const rules = plan.weighting as WeightingRules | undefined;
  const uniform = { formula: { magSlope: 0, radiusExponent: 0 } };
  const r = weighTargets(targets, galaxyModel(plan), rules ?? uniform, plan.targetOverrides);
  if (!rules) r.rulesText = ['no weighting section: every tracer weighs its catalog priority, or 1', ...r.rulesText.filter((l) => !l.startsWith('weight ='))];
  return r;
}

// ---- stage 2: mask placement ---------------------------------------------------------------------------

/** True when a plan mask has a centre and a PA. */
export function maskPlaced(m: PlanMask): boolean {
  return m.raDeg !== undefined && m.decDeg !== undefined && m.paDeg !== undefined;
}

/** True when the plan lists every mask its goal asks for, each with a centre and a PA (nothing left to place). */
export function planFullyPlaced(plan: PlanFile): boolean {
  const masks = plan.masks ?? [];
  return masks.length >= plan.goals.masks && masks.every(maskPlaced);
}

/**
 * Every mask placed: locked masks kept; the others by the pointing search (solver/pointingSearch.ts), which starts
 * from the naive cross layout (or the plan's own positions) and never ends worse than it on the objective.
 * Returns the pointings, the search report, and the full allocation of the result for stage 3 to reuse.
 */
export function placeMasks(plan: PlanFile, galaxy: GalaxyModel, profile: InstrumentProfile, ctx: AllocationContext, onProgress?: (fraction: number, message: string) => void, positions?: GalaxyPositions | null): { pointings: MaskPointing[]; search: SearchReport; allocation: PointingsAllocation; withStarlight: MaskSolution[]; starlightWarnings: string[] } {
  const starts = startLayouts(plan, galaxy, profile);
  if (ctx.byInstrument) {
    // Several spectrographs: each start carries every mask's own instrument, and the profile-by-profile cross comes first.
    const own = new Map((plan.masks ?? []).map((m) => [m.id, m.instrument]));
    for (const s of starts) s.pointings = s.pointings.map((p) => (own.get(p.id) !== undefined ? { ...p, instrument: own.get(p.id) } : p));
    starts.unshift({ name: 'cross by instrument', pointings: instrumentsCrossLayout(plan, galaxy, ctx) });
  }
  const r = searchPointings(searchEnv(plan, ctx, positions), starts[0].pointings, onProgress, starts);
  return { pointings: r.pointings, search: r.report, allocation: r.allocation, withStarlight: r.masks, starlightWarnings: r.starlightWarnings };
}

// ---- stage 4: starlight and sky slits --------------------------------------------------------------------

/**
 * Integrated-starlight and sky slits in the space the tracers leave (solver/starlight.ts), trading tracer slits for
 * starlight slits only where the search objective gains. (solvePlan takes this stage's result from the pointing
 * search, which evaluates exactly this on its final pointings.)
 */
export function addStarlightAndSky(plan: PlanFile, ctx: AllocationContext, masks: MaskSolution[], warnings: string[]): MaskSolution[] {
  const objective = objectiveContext(plan.goals, plan.search, Array.from(ctx.tracerIndices, (i) => ctx.weights[i]));
  const r = placeStarlightForMasks(ctx, plan, masks, starlightTrade(objective));
  warnings.push(...r.warnings);
  return r.masks;
}

/** The starlight stage and exposure model per profile of a plan (solver/starlightCoadd.ts), made once and shared by stages 4b and 6. */
type StarlightModels = ReturnType<typeof planStarlightModels>;

/** Stage 4b: starlight slits added to bins short of the co-added target, over every mask (solver/starlightCoadd.ts). */
export function coaddStarlight(plan: PlanFile, ctx: AllocationContext, masks: MaskSolution[], models?: StarlightModels): MaskSolution[] {
  if (plan.goals.starlightReachRe <= 0) return masks;
  const m = models ?? planStarlightModels(plan, ctx);
  return coaddStarlightBins(masks, m.stageOf, m.modelOf, m.settings).masks;
}

/** The co-added starlight bins of finished masks (solver/starlightBins.ts), also written into `coverage.starlightBins`. */
export function measureStarlightBins(plan: PlanFile, ctx: AllocationContext, galaxy: GalaxyModel, masks: readonly MaskSolution[], coverage: CoverageReport, models?: StarlightModels): StarlightBinsResult | undefined {
  if (plan.goals.starlightReachRe <= 0) return undefined;
  const m = models ?? planStarlightModels(plan, ctx);
  const r = { bins: starlightBins(masks, galaxy, m.modelOf, m.settings), ...m.settings };
  coverage.starlightBins = starlightBinsForFile(r);
  return r;
}

// ---- stage 5: lengthening --------------------------------------------------------------------------------

/** Lengthen every slit (boxes stay fixed) into the free space of its mask; `ctx` (optional) gives each mask its own profile. */
export function lengthenMasks(plan: PlanFile, planProfile: InstrumentProfile, masks: MaskSolution[], ctx?: AllocationContext): MaskSolution[] {
  return masks.map((ms) => {
    const profile = ctx ? contextFor(ctx, ms.mask).profile : planProfile;
    const maxLengthArcsec = plan.allocation?.maxSlitLengthArcsec ?? DEFAULT_MAX_LENGTH_FACTOR * profile.slits.minLengthArcsec;
    const rows = ms.slits.map((s) => ({ ...s, fixed: s.role === 'alignment' }));
    const grown = lengthenSlits(rows, { footprint: profile.footprint, gapArcsec: profile.slits.gapArcsec, maxLengthArcsec });
    return { mask: ms.mask, slits: grown.map(({ fixed: _f, ...s }) => s) };
  });
}

/** The masks of each profile (first use first); one group of every mask with one profile. */
function maskGroupsByProfile(ctx: AllocationContext, pointings: readonly MaskPointing[]): { profile: InstrumentProfile; maskIds: string[] }[] {
  const groups = new Map<string, { profile: InstrumentProfile; maskIds: string[] }>();
  for (const p of pointings) {
    const profile = contextFor(ctx, p).profile;
    const g = groups.get(profile.id) ?? { profile, maskIds: [] };
    g.maskIds.push(p.id);
    groups.set(profile.id, g);
  }
  return groups.size ? [...groups.values()] : [{ profile: ctx.profile, maskIds: [] }];
}

// ---- the solved plan file -----------------------------------------------------------------------------------

/** The plan with every mask placed, keeping each mask's other keys. */
export function solvedPlanFile(plan: PlanFile, pointings: readonly MaskPointing[]): PlanFile {
  const given = new Map((plan.masks ?? []).map((m) => [m.id, m]));
  const masks: PlanMask[] = pointings.map((p) => ({ ...(given.get(p.id) ?? {}), id: p.id, raDeg: p.raDeg, decDeg: p.decDeg, paDeg: p.paDeg, locked: p.locked, ...(p.instrument !== undefined ? { instrument: p.instrument } : {}) }));
  return { ...plan, masks };
}

/** Solve a plan: pure and synchronous; onProgress gets fractions in [0, 1] with a short message. */
export function solvePlan(inputs: PlanInputs, opts: SolveOptions = {}): PlanSolution {
  const progress = opts.onProgress ?? (() => {});
  const { profile, catalog } = inputs;
  // Several spectrographs: every mask listed with its own profile id (plan/instruments.ts).
  const plan = planWithMaskInstruments(inputs.plan, inputs.profiles ?? {});
  const warnings: string[] = [];
  const galaxy = galaxyModel(plan);

  progress(0, 'weighting targets');
  // The catalog's rows as columns from here on: no object per row in the solver's path.
  const table = catalogTargetColumns(catalog);
  const weighting = weighPlanTargets(plan, table);
  const weights = targetWeights(plan, table, warnings, weighting);
  const ctx = plan.instruments?.length
    ? instrumentsAllocationContext(plan, planProfiles(plan, inputs.profiles ?? {}), galaxy, table, weights, inputs.profiles)
    : allocationContext(profile, galaxy, plan.goals.linesA, table, weights, lineWindowSettings(plan.goals));

  progress(0.1, 'placing masks');
  // The weighting's projection of every target about the galaxy, reused by the search and the reach below.
  const positions = weightingPositions(weighting);
  const placed = placeMasks(plan, galaxy, profile, ctx, (f, message) => progress(0.1 + 0.6 * f, message), positions);
  const pointings = placed.pointings;

  const alloc: PointingsAllocation = placed.allocation;

  progress(0.72, 'adding starlight and sky slits');
  let masks = placed.withStarlight;
  warnings.push(...placed.starlightWarnings);

  progress(0.76, 'co-adding starlight per bin');
  // One starlight stage and exposure model per profile for the co-adding and the bins measured below.
  const starlightModels = plan.goals.starlightReachRe > 0 ? planStarlightModels(plan, ctx) : undefined;
  masks = coaddStarlight(plan, ctx, masks, starlightModels);

  progress(0.8, 'lengthening slits');
  masks = lengthenMasks(plan, profile, masks, ctx);

  progress(0.9, 'measuring coverage');
  const allSlits = masks.flatMap((m) => m.slits);
  const coverage = coverageReport(galaxy, plan.goals, allSlits);
  const starlightBinsResult = measureStarlightBins(plan, ctx, galaxy, masks, coverage, starlightModels);
  let candidateReachRe = 0;
  const known = positionsFor(positions, ctx.table, galaxy);
  const reachOf = known ? (i: number) => known.radiusRe[i] : (i: number) => galaxyRadiusAndAzimuth(galaxy, ctx.raDeg[i], ctx.decDeg[i]).rRe;
  for (const i of ctx.tracerIndices) candidateReachRe = Math.max(candidateReachRe, reachOf(i));
  const goals = planGoals(plan, galaxy, profile, masks, coverage, candidateReachRe, starlightSettings(plan.starlight, profile, plan).maxSlitLengthArcsec, starlightBinsResult);

  const stats = {
    masks: alloc.prepared.map((p, m) => ({
      maskId: p.mask.id,
      eligibleTracers: p.candidates.objects.length,
      tracerSlits: alloc.joint.chosen[m].length,
      alignmentBoxes: p.boxes.length,
    })),
    tracerWeight: alloc.joint.objective,
    tracerWeightUpperBound: alloc.joint.upperBound,
  };
  for (const s of stats.masks) if (s.tracerSlits === 0) warnings.push(`mask ${s.maskId}: no tracer slit could be placed (${s.eligibleTracers} eligible tracers)`);
  for (const [id, o] of Object.entries(plan.targetOverrides ?? {})) {
    if (o.force === 'in' && !allSlits.some((s) => s.objectId === id)) warnings.push(`target "${id}" is forced in but fits on no mask`);
  }
  let solved = solvedPlanFile(plan, pointings);
  let observingReport: ObservingReport | undefined;
  if (!opts.skipObservingReport) {
    progress(0.95, 'refraction and exposure report');
    // The report's co-added bins are the ones just measured (same masks, models and settings): not measured again.
    observingReport = observingReportForMasks(plan, ctx, galaxy, masks, starlightBinsResult);
    solved = withObservingReport(solved, observingReport);
  }
  const spectral = spectralReportForGroups(plan, maskGroupsByProfile(ctx, pointings), pointings.map((p) => p.id));
  progress(1, 'done');
  return { plan: solved, galaxy, masks, coverage, goals, warnings, problems: alloc.problems, weighting, search: placed.search, observingReport, spectralReport: spectral, stats };
}
