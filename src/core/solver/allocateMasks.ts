/**
 * The allocation stage for a set of mask pointings: project the targets into each mask frame, choose the
 * alignment boxes (each mask on its own: an alignment star may serve several masks, each mask being its own
 * exposure; contract revision 2), find the tracers eligible on each mask
 * whose minimal slit keeps the gap to every box, allocate tracers jointly over all masks, and build the
 * minimal slit rows (tilt 0, centred on their targets). Mask frame: x along dispersion, y along slits, arcsec.
 * The pointing search calls `allocateForPointings` inside its loop.
 */
import type { Target } from '../catalog/types';
import { targetColumnsOf, type TargetColumns } from '../catalog/targetColumns';
import type { GalaxyModel } from '../plan/schema';
import type { InstrumentProfile } from '../profile/schema';
import type { Problem } from '../result';
import { alignmentBoxFits, eligibilityRules, scienceSlitEligible, type EligibilityRules } from '../profile/eligibility';
import { chooseAlignmentBoxes, largestClearSet, type AlignmentCandidate } from './alignment';
import { allocateJoint, compactJointProblem, maskCandidateSet, resolveOneMask, jointObjective, type JointOptions, type JointProblem, type JointSolution, type MaskCandidateSet } from './jointAllocation';
import { maskBasis, maskPointToSkyDeg, projectIndicesToMaskArcsec, unitVectors, type UnitVectors } from './maskTargets';
import { unitGrid, unitGridNear, type UnitGrid } from './unitGrid';
import { ARCSEC_PER_RAD } from '../sky/angles';
import { polygonBounds } from '../geometry/polygon';
import type { LineWindowSettings } from '../profile/wavelength';
import type { MaskPointing, MaskSolution, Slit } from '../geometry/maskSolution';
import { PMath } from '../numeric/portableMath';
import { candidateValues, contextFor } from './maskContext';

/** Everything about the targets and the instrument that does not depend on the pointings. */
export interface AllocationContext {
  profile: InstrumentProfile;
  galaxy: GalaxyModel;
  /** The targets as objects (made from `table` on first read; not enumerable, so a spread of the context leaves it out). */
  targets: readonly Target[];
  /** The targets as columns: what the allocation reads (no object per target). */
  table: TargetColumns;
  /** Weight of every target (index as in targets); weight 0 means never allocated. */
  weights: Float64Array;
  rules: EligibilityRules;
  raDeg: Float64Array;
  decDeg: Float64Array;
  /** Unit vectors of the targets, for fast projection into each mask. */
  unit: UnitVectors;
  /** Largest distance (arcsec) of a footprint corner from the mask centre: targets farther away are never on the mask. */
  footprintRadiusArcsec: number;
  /** Indices of tracer targets with weight > 0, and of alignment stars inside the profile's magnitude range. */
  tracerIndices: Int32Array;
  alignmentIndices: Int32Array;
  /** In a plan with several spectrographs: the context of each profile id (solver/instrumentContexts.ts, maskContext.ts). */
  byInstrument?: ReadonlyMap<string, AllocationContext>;
}

/** Build the allocation context; linesA are rest wavelengths (Angstrom), redshifted by galaxy.vsysKms. */
export function allocationContext(profile: InstrumentProfile, galaxy: GalaxyModel, linesA: readonly number[], targets: readonly Target[] | TargetColumns, weights: Float64Array, lineWindow?: LineWindowSettings): AllocationContext {
  const table = targetColumnsOf(targets);
  const [bright, faint] = profile.alignment.magRange;
  const tracers: number[] = [], aligns: number[] = [];
  for (let i = 0; i < table.length; i++) {
    // An alignment star with weight 0 was excluded by the weighting rules (exclusion region, force out).
    if (table.isAlignment(i)) { if (weights[i] > 0 && table.mag[i] >= bright && table.mag[i] <= faint) aligns.push(i); }
    else if (weights[i] > 0) tracers.push(i);
  }
  const { raDeg, decDeg } = table;
  const b = polygonBounds(profile.footprint);
  return withTargetObjects({
    profile, galaxy, table, weights,
    rules: eligibilityRules(profile, linesA, galaxy.vsysKms, lineWindow),
    raDeg, decDeg,
    unit: unitVectors(raDeg, decDeg),
    footprintRadiusArcsec: PMath.hypot(Math.max(-b.minX, b.maxX), Math.max(-b.minY, b.maxY)) + 1,
    tracerIndices: Int32Array.from(tracers),
    alignmentIndices: Int32Array.from(aligns),
  });
}

/** The context with `targets` defined: its table's rows as objects, made on first read (not enumerable). */
export function withTargetObjects<C extends Omit<AllocationContext, 'targets'>>(ctx: C): C & AllocationContext {
  let objects: Target[] | null = null;
  const targets = { enumerable: false, configurable: true, get: () => (objects ??= ctx.table.toTargets()) };
  return Object.defineProperty(ctx, 'targets', targets) as C & AllocationContext;
}

/** Alignment stars whose box fits on the mask (mask frame, arcsec): every star in the context, shared ones included. */
export function alignmentCandidates(ctx: AllocationContext, mask: Pick<MaskPointing, 'raDeg' | 'decDeg' | 'paDeg'>): AlignmentCandidate[] {
  const al = ctx.alignmentIndices;
  const ap = projectIndicesToMaskArcsec(mask, ctx.unit, al, ctx.footprintRadiusArcsec);
  const out: AlignmentCandidate[] = [];
  for (let k = 0; k < al.length; k++) if (alignmentBoxFits(ctx.rules, ap.xArcsec[k], ap.yArcsec[k])) out.push({ object: al[k], xArcsec: ap.xArcsec[k], yArcsec: ap.yArcsec[k] });
  return out;
}

/**
 * The alignment rule of a mask pointing, the one the allocation applies and the pointing search keeps as a hard
 * constraint: how many stars' boxes fit, and how many of them at most are clear of each other along y
 * (boxSize + gap apart). The mask can be aligned exactly when compatibleMax >= alignment.minCount.
 */
export function alignmentCapacity(ctx: AllocationContext, mask: Pick<MaskPointing, 'raDeg' | 'decDeg' | 'paDeg'>): { available: number; compatibleMax: number } {
  const c = alignmentCandidates(ctx, mask).sort((a, b) => a.yArcsec - b.yArcsec || a.object - b.object);
  return { available: c.length, compatibleMax: largestClearSet(c, ctx.profile.alignment.boxSizeArcsec + ctx.profile.slits.gapArcsec).length };
}

/** The spatial index of each context's tracers (built on first use; a context never changes once built). */
const tracerGrids = new WeakMap<AllocationContext, UnitGrid>();

/**
 * Tracer indices (into targets), in the order of ctx.tracerIndices, of every tracer within the footprint radius of
 * the mask centre and a few beyond it: through a spatial index, so a mask's cost grows with the tracers near it.
 */
export function tracersNear(ctx: AllocationContext, mask: Pick<MaskPointing, 'raDeg' | 'decDeg' | 'paDeg'>): Int32Array {
  const radiusRad = ctx.footprintRadiusArcsec / ARCSEC_PER_RAD;
  let grid = tracerGrids.get(ctx);
  if (!grid) tracerGrids.set(ctx, (grid = unitGrid(ctx.unit, ctx.tracerIndices, radiusRad)));
  const b = maskBasis(mask);
  const positions = unitGridNear(grid, b.cx, b.cy, b.cz, radiusRad);
  const out = new Int32Array(positions.length);
  for (let k = 0; k < positions.length; k++) out[k] = ctx.tracerIndices[positions[k]];
  return out;
}

/** One mask ready for allocation: its alignment boxes and its tracer candidates (mask-frame positions). */
export interface PreparedMask {
  mask: MaskPointing;
  boxes: AlignmentCandidate[];
  /** Present when the mask has fewer compatible alignment stars than alignment.minCount. */
  alignmentShortfall?: { available: number; compatibleMax: number };
  candidates: MaskCandidateSet;
  candidateX: Float64Array;
  candidateY: Float64Array;
}

/** Prepare one mask: alignment boxes (from every alignment star on it, shared stars included) and eligible tracer candidates. */
export function prepareMask(planCtx: AllocationContext, mask: MaskPointing): PreparedMask {
  const ctx = contextFor(planCtx, mask);
  const { profile, rules } = ctx;
  const L = profile.slits.minLengthArcsec, g = profile.slits.gapArcsec, box = profile.alignment.boxSizeArcsec;
  const choice = chooseAlignmentBoxes(alignmentCandidates(ctx, mask), profile.alignment.minCount, box + g);
  const boxes = choice.chosen;
  const near = tracersNear(ctx, mask);
  const tp = projectIndicesToMaskArcsec(mask, ctx.unit, near, ctx.footprintRadiusArcsec);
  const objects: number[] = [], xs: number[] = [], ys: number[] = [];
  const clearOfBox = L / 2 + box / 2 + g;
  const boxY = boxes.map((b) => b.yArcsec);
  for (let k = 0; k < near.length; k++) {
    const x = tp.xArcsec[k], y = tp.yArcsec[k];
    if (!scienceSlitEligible(rules, x, y)) continue;
    let clash = false;
    for (let j = 0; j < boxY.length && !clash; j++) clash = Math.abs(boxY[j] - y) < clearOfBox;
    if (clash) continue;
    objects.push(near[k]); xs.push(x); ys.push(y);
  }
  const n = ys.length, starts = new Float64Array(n), ends = new Float64Array(n);
  for (let k = 0; k < n; k++) { starts[k] = ys[k] - L / 2; ends[k] = ys[k] + L / 2 + g; }
  return {
    mask,
    boxes,
    alignmentShortfall: choice.ok ? undefined : { available: choice.available, compatibleMax: choice.compatibleMax },
    candidates: { ...maskCandidateSet(objects, starts, ends), values: candidateValues(ctx, objects) },
    candidateX: Float64Array.from(xs),
    candidateY: Float64Array.from(ys),
  };
}

/** Prepare every mask, each on its own (the same alignment rule the pointing search keeps: alignmentCapacity). */
export function prepareMasks(ctx: AllocationContext, pointings: readonly MaskPointing[]): PreparedMask[] {
  return pointings.map((m) => prepareMask(ctx, m));
}

/** The joint problem over prepared masks (weights indexed by target). */
export function jointProblemOf(ctx: AllocationContext, prepared: readonly PreparedMask[]): JointProblem {
  return compactJointProblem(ctx.weights, prepared.map((p) => p.candidates));
}

/** A Problem for a mask with too few alignment stars: names the mask, found vs needed, and how to fix it. */
export function alignmentProblem(planCtx: AllocationContext, p: PreparedMask): Problem | null {
  if (!p.alignmentShortfall) return null;
  const ctx = contextFor(planCtx, p.mask);
  const { available, compatibleMax } = p.alignmentShortfall;
  const [b, f] = ctx.profile.alignment.magRange;
  const need = ctx.profile.alignment.minCount;
  const clash = compatibleMax < available ? ` (${compatibleMax} with boxes clear of each other along y)` : '';
  return {
    where: `mask ${p.mask.id}`,
    what: `${available} alignment star(s) with mag in [${b}, ${f}] fit on the mask${clash}, but the instrument profile needs at least ${need} alignment boxes per mask`,
    fix: 'move or rotate the mask, add alignment stars to the catalog (rows whose role column says alignment), or use an instrument profile that needs fewer alignment boxes',
  };
}

/** Minimal slit rows (tilt 0) of each mask for a joint selection, plus its alignment boxes; ids A01.. and S001.. by y. */
export function buildMaskSolutions(ctx: AllocationContext, prepared: readonly PreparedMask[], chosen: readonly (readonly number[])[]): MaskSolution[] {
  return prepared.map((p, m) => {
    const { profile } = contextFor(ctx, p.mask);
    const L = profile.slits.minLengthArcsec, w = profile.slits.widthArcsec, box = profile.alignment.boxSizeArcsec;
    const row = (objectIndex: number, role: Slit['role'], x: number, y: number, half: number, width: number, slitId: string): Slit => {
      const sky = maskPointToSkyDeg(p.mask, x, y);
      return {
        maskId: p.mask.id, slitId, objectId: ctx.table.ids[objectIndex], role, raDeg: sky.raDeg, decDeg: sky.decDeg, xArcsec: x, yArcsec: y,
        lenBelowArcsec: half, lenAboveArcsec: half, widthArcsec: width, tiltDeg: 0,
        priority: role === 'alignment' ? 0 : ctx.weights[objectIndex], mag: ctx.table.mag[objectIndex],
      };
    };
    const boxes = [...p.boxes].sort((a, b) => a.yArcsec - b.yArcsec).map((b, i) => row(b.object, 'alignment', b.xArcsec, b.yArcsec, box / 2, box, `A${String(i + 1).padStart(2, '0')}`));
    const picks = [...chosen[m]].sort((a, b) => p.candidateY[a] - p.candidateY[b]);
    const slits = picks.map((k, i) => row(p.candidates.objects[k], 'tracer', p.candidateX[k], p.candidateY[k], L / 2, w, `S${String(i + 1).padStart(3, '0')}`));
    return { mask: p.mask, slits: [...boxes, ...slits] };
  });
}

export interface PointingsAllocation {
  prepared: PreparedMask[];
  joint: JointSolution;
  masks: MaskSolution[];
  problems: Problem[];
}

/** Full allocation for a set of pointings: alignment boxes, joint tracer allocation, minimal slit rows. */
export function allocateForPointings(ctx: AllocationContext, pointings: readonly MaskPointing[], opts: Pick<JointOptions, 'maxIterations' | 'steals' | 'relativeGap'> = {}): PointingsAllocation {
  const prepared = prepareMasks(ctx, pointings);
  const joint = allocateJoint(jointProblemOf(ctx, prepared), opts);
  const problems = prepared.map((p) => alignmentProblem(ctx, p)).filter((p): p is Problem => p !== null);
  return { prepared, joint, masks: buildMaskSolutions(ctx, prepared, joint.chosen), problems };
}

/**
 * Re-solve one mask after it moved (the editor's drag): re-prepare mask m at its new pointing (alignment stars may
 * be shared with the other masks) and re-allocate it exactly with the other masks' tracers fixed.
 */
export function reallocateOneMask(ctx: AllocationContext, previous: PointingsAllocation, m: number, pointing: MaskPointing): PointingsAllocation {
  const prepared = previous.prepared.slice();
  prepared[m] = prepareMask(ctx, pointing);
  const problem = jointProblemOf(ctx, prepared);
  const start = previous.joint.chosen.map((s, i) => (i === m ? [] : s.slice()));
  const chosen = resolveOneMask(problem, start, m);
  const joint: JointSolution = { chosen, objective: jointObjective(problem, chosen), upperBound: Infinity, iterations: 0 };
  const problems = prepared.map((p) => alignmentProblem(ctx, p)).filter((p): p is Problem => p !== null);
  // Only mask m's rows change: the other masks keep their slits as they were.
  const masks = previous.masks.slice();
  masks[m] = buildMaskSolutions(ctx, [prepared[m]], [chosen[m]])[0];
  return { prepared, joint, masks, problems };
}
