/**
 * The plan's goals against what a solved plan achieves (coverage.json `goals`): each goal with its target, what was
 * achieved, whether it is met, and for an unmet goal its cause and what would meet it. Radii are circularised R/Re
 * (docs/frames.md); the starlight S/N is per Angstrom from the CCD equation (spectro/, through solver/starlight).
 */
import type { GalaxyModel, PlanFile } from '../plan/schema';
import type { InstrumentProfile } from '../profile/schema';
import type { CoverageReport } from './coverage';
import type { MaskSolution } from '../geometry/maskSolution';
import { starlightSettings, starlightSignalToNoise, type StarlightSettings } from '../solver/starlight';
import type { StarlightRules } from '../plan/starlightSection';
import { sersicBn, sersicMuMagPerArcsec2 } from '../sky/sersic';
import { polygonBounds } from '../geometry/polygon';
import type { StarlightBin } from '../solver/starlightBins';

/** One goal of coverage.json (contract: name, target, achieved, met, reason). */
export interface GoalStatus {
  name: string;
  target: number;
  achieved: number;
  met: boolean;
  /** For an unmet goal: the cause and what would meet it (empty when met). */
  reason: string;
}

const f2 = (v: number) => (Number.isFinite(v) ? v.toFixed(2) : String(v));

/** S/N per A of a starlight slit of `lengthArcsec` centred at radius rRe (surface brightness there), with settings s. */
export function starlightSnAtRadius(galaxy: GalaxyModel, rRe: number, lengthArcsec: number, widthArcsec: number, s: StarlightSettings): number {
  const mu = sersicMuMagPerArcsec2(rRe * galaxy.reArcsec, galaxy.reArcsec, galaxy.sersicN, galaxy.muE, sersicBn(galaxy.sersicN));
  return starlightSignalToNoise(mu, lengthArcsec, widthArcsec, s);
}

/** Smallest x in [lo, hi] with ok(x) for a monotone predicate (bisection), or null when ok(hi) is false. */
function smallestPassing(lo: number, hi: number, ok: (x: number) => boolean): number | null {
  if (!ok(hi)) return null;
  if (ok(lo)) return lo;
  for (let i = 0; i < 60 && hi - lo > 1e-6 * hi; i++) { const mid = 0.5 * (lo + hi); if (ok(mid)) hi = mid; else lo = mid; }
  return hi;
}

/**
 * Why the starlight goal is short, in the observer's terms: the S/N reached at the goal radius with the longest
 * starlight slit, and the slit length (up to the footprint's length along the slits) or the exposure that would reach
 * the target there; or, when the light allows it, that no mask has free space at that radius.
 */
export function starlightShortfall(galaxy: GalaxyModel, profile: InstrumentProfile, s: StarlightSettings, maxSlitArcsec: number): string {
  const goal = s.reachRe, w = profile.slits.widthArcsec;
  const sn = starlightSnAtRadius(galaxy, goal, maxSlitArcsec, w, s);
  if (sn >= s.targetSnPerA) {
    return `the light allows it (S/N ${f2(sn)} per A at R = ${f2(goal)} Re with a ${f2(maxSlitArcsec)}" slit, target ${f2(s.targetSnPerA)}), but no mask leaves free slit space that far out: move a mask over that radius, raise starlight.maxPerMask, or lower goals.tracerReachRe so fewer tracer slits compete`;
  }
  const b = polygonBounds(profile.footprint);
  const footprintLength = b.maxY - b.minY;
  const length = smallestPassing(maxSlitArcsec, footprintLength, (L) => starlightSnAtRadius(galaxy, goal, L, w, s) >= s.targetSnPerA);
  const exposure = smallestPassing(s.exposureS, 100 * s.exposureS, (t) => starlightSnAtRadius(galaxy, goal, maxSlitArcsec, w, { ...s, exposureS: t }) >= s.targetSnPerA);
  const ways: string[] = [];
  if (length !== null) ways.push(`a starlight slit of ${f2(length)}" (starlight.maxSlitLengthArcsec)`);
  if (exposure !== null) ways.push(`an exposure of ${(exposure / 3600).toFixed(1)} h (starlight.exposureS ${Math.ceil(exposure)})`);
  const limits = length === null ? `; no slit up to the footprint's ${f2(footprintLength)}" reaches it` : '';
  const fixes = ways.length ? `${ways.join(' or ')} would reach it, or lower goals.starlightReachRe` : 'nor does 100 times the exposure: lower goals.starlightReachRe';
  return `S/N ${f2(sn)} per A at the goal radius R = ${f2(goal)} Re with a ${f2(maxSlitArcsec)}" slit in ${(s.exposureS / 3600).toFixed(1)} h (target ${f2(s.targetSnPerA)})${limits}; ${fixes}`;
}

/**
 * Goals of a solved plan: `masks` (masks holding tracer slits), `tracerReachRe` (largest R/Re of a tracer slit; met when
 * the outermost 1-Re bin inside the goal holds one), `tracerRadialBins` (1-Re bins to the goal holding a tracer slit) and,
 * unless starlight is off, the starlight goals: with the co-added bins (`bins`), `starlightReachRe` and
 * `starlightBins` (starlightBinGoals); without them, `starlightReachRe` as the largest R/Re of a starlight slit.
 * `candidateReachRe`: the largest R/Re of a usable tracer candidate, to tell a short catalog from short masks.
 */
export function planGoals(plan: PlanFile, galaxy: GalaxyModel, profile: InstrumentProfile, masks: readonly MaskSolution[], coverage: CoverageReport, candidateReachRe: number, maxStarlightSlitArcsec: number, starlightBins?: StarlightBinsResult): GoalStatus[] {
  const goals: GoalStatus[] = [];
  const g = plan.goals;
  const withTracers = masks.filter((m) => m.slits.some((s) => s.role === 'tracer')).length;
  const empty = masks.filter((m) => !m.slits.some((s) => s.role === 'tracer')).map((m) => m.mask.id);
  goals.push({
    name: 'masks', target: g.masks, achieved: withTracers, met: withTracers >= g.masks,
    reason: withTracers >= g.masks ? '' : `mask(s) ${empty.join(', ')} hold no tracer slit (no usable candidate whose lines land on the detector where the mask can be aligned): lower goals.masks, or widen the catalog's selection (weighting)`,
  });
  const tr = coverage.roles.tracer;
  const trMet = tr.maxReachRe >= g.tracerReachRe - 1;
  const masksWord = `${masks.length} mask(s)`;
  // A chain of every mask laid end to end along the major axis (long side radial): an upper limit of the reach.
  const fb = polygonBounds(profile.footprint);
  const longArcsec = Math.max(fb.maxX - fb.minX, fb.maxY - fb.minY);
  const chainReachRe = (masks.length * longArcsec * Math.sqrt(galaxy.axisRatio)) / galaxy.reArcsec;
  goals.push({
    name: 'tracerReachRe', target: g.tracerReachRe, achieved: Number(tr.maxReachRe.toFixed(4)), met: trMet,
    reason: trMet ? '' : candidateReachRe < g.tracerReachRe - 1
      ? `the catalog's usable tracer candidates reach only R = ${f2(candidateReachRe)} Re: extend the catalog (or its weighting radiusRangeRe), or lower goals.tracerReachRe`
      : chainReachRe < g.tracerReachRe - 1
        ? `candidates reach R = ${f2(candidateReachRe)} Re, but ${masksWord} of ${f2(longArcsec)}" laid end to end from the centre reach at most R = ${f2(chainReachRe)} Re along the major axis: add masks (goals.masks), use a profile with a larger footprint, or lower goals.tracerReachRe`
        : `candidates reach R = ${f2(candidateReachRe)} Re, and ${masksWord} could reach R = ${f2(chainReachRe)} Re end to end, but the search placed them where they gain more tracer weight and coverage: to favour reach raise search.objective.aBin (the worth of each filled 1-Re bin), add masks (goals.masks), or lower goals.tracerReachRe`,
  });
  const bins = tr.radialBins.length, filled = bins - tr.emptyBinsFromRe.length;
  goals.push({
    name: 'tracerRadialBins', target: bins, achieved: filled, met: filled >= bins,
    reason: filled >= bins ? '' : `no tracer slit in the bin(s) from R = ${tr.emptyBinsFromRe.join(', ')} Re (1 Re wide)${tr.emptyBinsFromRe.some((r) => r < candidateReachRe) ? '' : ' and no usable candidate there'}: add masks or candidates there, or lower goals.tracerReachRe`,
  });
  if (g.starlightReachRe > 0) {
    const s = starlightSettings(plan.starlight as StarlightRules | undefined, profile, plan);
    if (starlightBins) goals.push(...starlightBinGoals(galaxy, profile, s, maxStarlightSlitArcsec, starlightBins));
    else {
      const sl = coverage.roles.starlight;
      const met = sl.maxReachRe >= g.starlightReachRe;
      goals.push({
        name: 'starlightReachRe', target: g.starlightReachRe, achieved: Number(sl.maxReachRe.toFixed(4)), met,
        reason: met ? '' : starlightShortfall(galaxy, profile, s, maxStarlightSlitArcsec),
      });
    }
  }
  return goals;
}

/** The co-added starlight bins of a solved plan with the floor and target they were measured with. */
export interface StarlightBinsResult {
  bins: StarlightBin[];
  targetSnPerA: number;
  skySystematicFraction: number;
  reachRe: number;
}

/** Why one bin is short of the target, in the observer's terms (empty when met). */
export function starlightBinReason(b: StarlightBin, skySystematicFraction: number): string {
  if (b.met) return '';
  const where = `${b.fromRe}-${b.toRe} Re, ${b.sectorDeg}-${b.sectorDeg + 45} deg`;
  if (b.floorCapSnPerA !== null && b.floorCapSnPerA < b.targetSnPerA) {
    return `${where}: the sky-subtraction floor (${(100 * skySystematicFraction).toFixed(2)} % of the sky) caps co-added S/N at ${f2(b.floorCapSnPerA)} per A even at the bin's inner edge, below the target ${f2(b.targetSnPerA)}, whatever the number of slits: lower observing.skySystematicFraction (a sky subtraction that does better) or starlight.targetSnPerA`;
  }
  return `${where}: ${b.starlightSlits} starlight slit(s) and ${b.tracerSkyParts} tracer sky part(s) co-add to S/N ${f2(b.snPerA)} per A (target ${f2(b.targetSnPerA)}) and no free slit space is left there that would reach it: move a mask over this bin, add masks, or lengthen the exposure`;
}

/**
 * Starlight goals from the co-added bins (solver/starlightBins.ts): `starlightReachRe` is met when the outermost 1-Re
 * bin inside the goal has a sector whose co-added S/N reaches the target (achieved: the largest R/Re of a spectrum in a
 * bin that reaches it); `starlightBins` counts the bins inside the goal holding galaxy light that reach the target,
 * each short one named with its cause (the floor, or no room left).
 */
export function starlightBinGoals(galaxy: GalaxyModel, profile: InstrumentProfile, s: StarlightSettings, maxSlitArcsec: number, r: StarlightBinsResult): GoalStatus[] {
  const inside = r.bins.filter((b) => b.fromRe < r.reachRe);
  const met = inside.filter((b) => b.met);
  const outer = Math.ceil(r.reachRe - 1e-12) - 1;
  const outerBins = inside.filter((b) => b.fromRe === outer);
  const reachMet = outerBins.some((b) => b.met);
  const achieved = met.reduce((a, b) => Math.max(a, b.reachRe), 0);
  let reachReason = '';
  if (!reachMet) {
    const best = outerBins.reduce<StarlightBin | null>((a, b) => (!a || b.snPerA > a.snPerA ? b : a), null);
    reachReason = best
      ? `no sector of the outermost bin ${outer}-${outer + 1} Re reaches the co-added target; best ${starlightBinReason(best, r.skySystematicFraction)}`
      : `no spectrum holds galaxy light in the outermost bin ${outer}-${outer + 1} Re; ${starlightShortfall(galaxy, profile, s, maxSlitArcsec)}`;
  }
  const short = inside.filter((b) => !b.met);
  const capped = short.filter((b) => b.floorCapSnPerA !== null && b.floorCapSnPerA < b.targetSnPerA);
  const room = short.filter((b) => !capped.includes(b));
  const name = (b: StarlightBin) => `${b.fromRe}-${b.toRe} Re ${b.sectorDeg}-${b.sectorDeg + 45} deg`;
  const causes: string[] = [];
  if (capped.length) {
    causes.push(`${capped.length} bin(s) cannot reach S/N ${f2(r.targetSnPerA)} with any number of slits, the sky-subtraction floor (${(100 * r.skySystematicFraction).toFixed(2)} % of the sky) capping them at ${capped.map((b) => `${f2(b.floorCapSnPerA!)} (${name(b)})`).join(', ')}: lower observing.skySystematicFraction (a sky subtraction that does better) or starlight.targetSnPerA`);
  }
  if (room.length) {
    causes.push(`${room.length} bin(s) short for want of free slit space: ${room.map((b) => `${name(b)} S/N ${f2(b.snPerA)} from ${b.starlightSlits} starlight slit(s) and ${b.tracerSkyParts} tracer sky part(s)`).join(', ')}: move a mask over them, add masks, or lengthen the exposure`);
  }
  return [
    { name: 'starlightReachRe', target: r.reachRe, achieved: Number(achieved.toFixed(4)), met: reachMet, reason: reachReason },
    { name: 'starlightBins', target: inside.length, achieved: met.length, met: met.length >= inside.length && inside.length > 0, reason: causes.length ? causes.join('; ') : inside.length ? '' : 'no spectrum holds galaxy light inside the goal radius' },
  ];
}

/** One line per unmet goal, for stderr. */
export function unmetGoalLines(goals: readonly GoalStatus[]): string[] {
  return goals.filter((x) => !x.met).map((x) => `goal not met: ${x.name} (target ${x.target}, achieved ${x.achieved}): ${x.reason}`);
}
