/**
 * Choice of a mask's design hour angle (hours of the mask centre, positive West) and the fit of its exposure in the
 * hour-angle window. The design hour angle is where the slits are cut for; the window is where every tracer slit
 * keeps its light loss under the limit (observe/maskRefraction.ts).
 */
import { contextForDesignHourAngle, hourAngleGridH, maskRefractionContext, maskRefractionReportOf, windowAcrossAt, windowDesignAcross, type MaskRefractionContext, type MaskRefractionInput, type MaskRefractionReport } from './maskRefraction';
import { altitudeDeg } from './horizon';
import { hardieAirmass } from './airmass';

/** Length in hours of a window [start, end], 0 without one. */
export function windowLengthH(window: [number, number] | null): number {
  return window ? window[1] - window[0] : 0;
}

/**
 * The design hour angle among candidatesH whose window (the passing stretch of hour angles that contains it) is the
 * longest (ties: the candidate nearest transit), then refined by a pattern search of half, quarter and eighth steps
 * about the best; returns the full report at that hour angle. A window that holds exposureS beats one that does not,
 * however long. Candidates are scored by designWindowScorer (no report rows built); the report is built once, on the
 * scorer's slit geometry.
 */
export function chooseDesignHourAngle(input: Omit<MaskRefractionInput, 'designHourAngleH'>, candidatesH: readonly number[], exposureS: number): MaskRefractionReport {
  const ctx = maskRefractionContext({ ...input, designHourAngleH: 0 });
  const scorer = designScorerOf(ctx);
  const scored = new Map<number, number>();
  const score = (h: number) => {
    let s = scored.get(h);
    if (s === undefined) scored.set(h, (s = scorer(h)));
    return s;
  };
  // No window is longer than the searched range (scores are rounded window ends, and rounding keeps order): once
  // the best holds that (and fits the exposure when the range does), a candidate no nearer transit cannot replace it.
  const grid = hourAngleGridH(input.settings.hourAngleRangeH, input.settings.hourAngleStepH);
  const maxScore = Math.round(grid[grid.length - 1] * 1e4) / 1e4 - Math.round(grid[0] * 1e4) / 1e4;
  const maxFits = maxScore * 3600 >= exposureS;
  const unbeatable = (s: number) => s >= maxScore - 1e-6 && (s * 3600 >= exposureS || !maxFits);
  let best: { h: number; s: number } | null = null;
  // The candidate nearest transit first: when it is unbeatable, the walk below would end on it too (every other
  // candidate and every refinement is farther from transit or outside the range), so it is taken without scoring them.
  const nearest = nearestTransitCandidate(candidatesH);
  if (nearest !== null && unbeatable(score(nearest))) best = { h: nearest, s: score(nearest) };
  const consider = (h: number) => {
    if (best && unbeatable(best.s) && Math.abs(h) >= Math.abs(best.h)) return;
    const s = score(h);
    if (!best) { best = { h, s }; return; }
    const fits = s * 3600 >= exposureS, bestFits = best.s * 3600 >= exposureS;
    if ((fits && !bestFits) || (fits === bestFits && (s > best.s + 1e-6 || (Math.abs(s - best.s) <= 1e-6 && Math.abs(h) < Math.abs(best.h))))) best = { h, s };
  };
  for (const h of candidatesH) consider(h);
  if (best && candidatesH.length > 1) {
    const lo = candidatesH[0], hi = candidatesH[candidatesH.length - 1];
    for (let step = (candidatesH[1] - candidatesH[0]) / 2, k = 0; k < 3; k++, step /= 2) {
      const b = (best as { h: number }).h;
      for (const h of [b - step, b + step]) if (h >= lo && h <= hi) consider(h);
    }
  }
  return maskRefractionReportOf(contextForDesignHourAngle(ctx, best ? (best as { h: number }).h : 0));
}

/**
 * The candidate nearest transit when seeding the choice with it cannot change the choice: the only one at its |h|,
 * and transit itself or with every candidate on its side of transit (so no refinement step about it comes nearer
 * transit inside the candidates' range); else null. Candidates in increasing order.
 */
function nearestTransitCandidate(candidatesH: readonly number[]): number | null {
  if (candidatesH.length === 0) return null;
  let k = 0;
  for (let i = 1; i < candidatesH.length; i++) if (Math.abs(candidatesH[i]) < Math.abs(candidatesH[k])) k = i;
  const h = candidatesH[k];
  if (candidatesH.some((c, i) => i !== k && Math.abs(c) === Math.abs(h))) return null;
  const oneSide = candidatesH.every((c) => Math.sign(c) === Math.sign(h)) && (h > 0 ? h === candidatesH[0] : h === candidatesH[candidatesH.length - 1]);
  return h === 0 || oneSide ? h : null;
}

/**
 * A scorer of design hour angles for one mask: score(d) is the length in hours of the window that contains d when
 * the slits are cut for d (maskRefractionReport's rule: passing rows of the hour-angle grid joined into a stretch,
 * its ends refined by 12 bisections), 0 when d itself fails or no stretch holds it. Made cheap for ranking many d:
 * the slit geometry is built once; the images' across-slit positions are computed once per grid hour angle for all
 * d; a slit's loss limit becomes an offset limit once, in the context (the loss grows with |offset|); only the
 * stretch about d is walked; and between grid hour angles the bisection interpolates the positions linearly (the
 * report built for the chosen d refines its window exactly; the two agree to better than 0.01 h, test/observe).
 */
export function designWindowScorer(input: Omit<MaskRefractionInput, 'designHourAngleH'>): (designH: number) => number {
  return designScorerOf(maskRefractionContext({ ...input, designHourAngleH: 0 }));
}

/** designWindowScorer on a prepared context of the mask (any design hour angle: only its slit geometry is used). */
function designScorerOf(ctx: MaskRefractionContext): (designH: number) => number {
  const input = ctx.input;
  const s = input.settings;
  const grid = hourAngleGridH(s.hourAngleRangeH, s.hourAngleStepH);
  /** Whether the mask centre is up and within the airmass limit at hour angle h. */
  const centreOk = (h: number) => {
    const alt = altitudeDeg(h * 15, input.mask.decDeg, input.latDeg);
    const airmass = alt > 0 ? hardieAirmass(90 - alt) : null;
    return airmass !== null && airmass <= s.maxAirmass;
  };
  // Positions at every grid hour angle with the centre up (also beyond the airmass limit, so that the bisection towards
  // an airmass-limited end interpolates too).
  const onGrid = grid.map((h) => ({ ok: centreOk(h), across: windowAcrossAt(ctx, h) }));
  return (d: number) => {
    const design = windowDesignAcross(ctx, d);
    const lim = design.offsetLimitArcsec;
    /** Every window slit within its offset limit, its blue and red images at (1 - t) x0 + t x1. */
    const slitsPass = (x0: Float64Array, x1: Float64Array, t: number) => {
      for (let i = 0; i < lim.length; i++) {
        const b = x0[2 * i] + t * (x1[2 * i] - x0[2 * i]), r = x0[2 * i + 1] + t * (x1[2 * i + 1] - x0[2 * i + 1]);
        if (Number.isNaN(b)) continue;
        if (Math.max(Math.abs(b - design.xArcsec[i]), Math.abs(r - design.xArcsec[i])) >= lim[i]) return false;
      }
      return true;
    };
    const flags = new Int8Array(grid.length);
    const passK = (k: number) => {
      if (!flags[k]) {
        const g = onGrid[k];
        flags[k] = g.ok && (!g.across || slitsPass(g.across, g.across, 0)) ? 1 : 2;
      }
      return flags[k] === 1;
    };
    const gridIndex = new Map(grid.map((h, k) => [h, k]));
    const exactPass = (h: number): boolean => {
      const k = gridIndex.get(h);
      if (k !== undefined) return passK(k);
      if (!centreOk(h)) return false;
      const x = windowAcrossAt(ctx, h);
      return !x || slitsPass(x, x, 0);
    };
    if (!exactPass(d)) return 0;
    // Bisection between a failing and a passing grid row, positions interpolated between the two rows.
    const refine = (kFail: number, kPass: number) => {
      const x0 = onGrid[kPass].across, x1 = onGrid[kFail].across;
      let pass = 0, fail = 1;
      for (let i = 0; i < 12; i++) {
        const t = (pass + fail) / 2, h = grid[kPass] + t * (grid[kFail] - grid[kPass]);
        const ok = centreOk(h) && (x0 && x1 ? slitsPass(x0, x1, t) : exactPass(h));
        if (ok) pass = t; else fail = t;
      }
      return grid[kPass] + pass * (grid[kFail] - grid[kPass]);
    };
    let i = -1;
    while (i + 1 < grid.length && grid[i + 1] <= d + 1e-9) i++;
    let lo: number;
    if (i >= 0 && passK(i)) lo = i;
    else if (i + 1 < grid.length && passK(i + 1)) lo = i + 1;
    else return 0;
    let hi = lo;
    while (hi + 1 < grid.length && passK(hi + 1)) hi++;
    while (lo > 0 && passK(lo - 1)) lo--;
    const a = lo > 0 ? refine(lo - 1, lo) : grid[lo];
    const b = hi + 1 < grid.length ? refine(hi + 1, hi) : grid[hi];
    return a - 1e-9 <= d && d <= b + 1e-9 ? Math.round(b * 1e4) / 1e4 - Math.round(a * 1e4) / 1e4 : 0;
  };
}

/** Candidate design hour angles: the searched range at the report's hour-angle step (at least 0.1 h), transit included (chooseDesignHourAngle refines by half, quarter and eighth steps). */
export function designHourAngleCandidatesH(rangeH: [number, number], stepH: number): number[] {
  const step = Math.max(stepH, 0.1);
  const out: number[] = [];
  for (let h = Math.ceil(rangeH[0] / step) * step; h <= rangeH[1] + 1e-9; h += step) out.push(Math.round(h * 1e6) / 1e6);
  return out.length ? out : [0];
}

/** Whether an exposure of exposureS seconds fits in the window, and a sentence saying so for the summary. */
export function exposureFit(window: [number, number] | null, exposureS: number): { fits: boolean; text: string } {
  const need = exposureS / 3600, have = windowLengthH(window);
  if (!window) return { fits: false, text: `no window for the ${need.toFixed(2)} h exposure` };
  if (have + 1e-9 >= need) return { fits: true, text: `window ${have.toFixed(2)} h holds the ${need.toFixed(2)} h exposure` };
  return { fits: false, text: `window ${have.toFixed(2)} h is shorter than the ${need.toFixed(2)} h exposure: split it over nights, observe through a narrower science range, or accept more loss` };
}
