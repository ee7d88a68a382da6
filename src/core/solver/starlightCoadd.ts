/**
 * Integrated starlight measured per bin (1 Re of circularised radius x 45 degrees of azimuth from the major axis,
 * inside the starlight goal radius): starlight slits are added to a bin, over every mask, until the bin's co-added S/N
 * per A reaches the target or no free slit space is left there (solver/starlightBins.ts is the measure: starlight slits
 * and the sky parts of tracer slits inside the goal radius, each with its sky estimated from its mask's sky slits,
 * co-added with the systematic sky-subtraction floor).
 *
 * Candidates are the free y-slots left on each mask (solver/starlight.ts freeSlots), alone or joined up to
 * starlight.maxSlitLengthArcsec (a longer slit where the galaxy is fainter), at x positions obeying the footprint and the
 * wavelength rule; a candidate belongs to the bin of its centre. Bins are taken inner first, sectors in order; in each,
 * the candidate that raises the co-added S/N most is added until the target is met. When a bin cannot be met with the
 * room left, the slits tried for it are given back (none is spent on a bin that stays short). A bin the floor caps below
 * the target (solver/starlightBins.ts floorCapSnPerA) is not tried. Mask frame: x along the dispersion, y along slits, arcsec.
 */
import type { MaskSolution, Slit } from '../geometry/maskSolution';
import type { ExposureModel } from './exposure';
import { binOf, coaddedSignalToNoise, floorCapSnPerA, maskSpectra, skySlitLengthArcsec, spectrumPart, type SpectrumPart } from './starlightBins';
import { freeSlots, galaxyOnMask, galaxyRadiusAt, slitMeanMu, slotPositions, slotRows, starlightWindows, trimAround, type SlotChoice, type StarlightStage } from './starlight';
import { centredRectFits } from '../profile/eligibility';
import { starlightBinModel } from './starlightBins';
import { contextFor } from './maskContext';
import type { AllocationContext } from './allocateMasks';
import type { PlanFile } from '../plan/schema';
import { starlightStage } from './starlight';

/** What the co-adding needs: target, floor and goal radius (Re). */
export interface CoaddSettings {
  targetSnPerA: number;
  skySystematicFraction: number;
  reachRe: number;
}

/** One possible new starlight slit: its mask, the free slots it uses, its place and its electrons. */
interface Candidate { mask: number; slots: number[]; choice: SlotChoice; part: SpectrumPart; key: string }

/** Grid step (arcsec) of the x positions tried for a new slit. */
const X_STEP_ARCSEC = 6;

/** Bin sums of the spectra already planned. */
type Sums = Map<string, SpectrumPart[]>;

/**
 * Add starlight slits to bins short of the target (see the module comment). `stageOf` and `modelOf` give each mask its
 * spectrograph's starlight stage and exposure model. Returns the masks (new rows `sl-<mask>-NNN` after the existing
 * ones, neighbours trimmed) and the number of slits added.
 */
export function coaddStarlightBins(masks: readonly MaskSolution[], stageOf: (ms: MaskSolution) => StarlightStage, modelOf: (ms: MaskSolution) => ExposureModel, c: CoaddSettings): { masks: MaskSolution[]; added: number } {
  if (c.reachRe <= 0 || masks.length === 0) return { masks: masks.slice(), added: 0 };
  const nBins = Math.ceil(c.reachRe - 1e-12);
  const sums: Sums = new Map();
  const add = (key: string, p: SpectrumPart) => { const l = sums.get(key); if (l) l.push(p); else sums.set(key, [p]); };
  const candidates: Candidate[] = [];
  masks.forEach((ms, i) => {
    const st = stageOf(ms), m = modelOf(ms);
    const g = galaxyOnMask(ms.mask, st.galaxy, st.bn);
    for (const sp of maskSpectra(ms, g, m, c.reachRe)) add(`${sp.fromRe}:${sp.sectorDeg}`, sp.part);
    const skyArcsec = skySlitLengthArcsec(ms);
    if (!(skyArcsec > 0) || st.s.reachRe <= 0 || st.s.maxPerMask === 0) return;
    const slots = freeSlots(ms.slits, st.rules, st.gapArcsec, st.s.slitLengthArcsec);
    const windows = st.s.maxSlitLengthArcsec > st.s.slitLengthArcsec ? starlightWindows(slots, st.gapArcsec, st.s.maxSlitLengthArcsec) : slots.map((span, k) => ({ span, slots: [k] }));
    const xs = slotPositions(st.rules, X_STEP_ARCSEC);
    const re = st.galaxy.reArcsec, sq = Math.sqrt(st.galaxy.axisRatio), hw = st.rules.widthArcsec / 2, ab = m.catalogToAbMag ?? 0;
    for (const w of windows) {
      const yc = 0.5 * (w.span.lo + w.span.hi), half = 0.5 * (w.span.hi - w.span.lo);
      // R >= sqrt(q) x |y - y_centre|: a window whose line stays beyond the goal bins holds no candidate.
      if (sq * Math.abs(yc - g.gyArcsec) >= nBins * re) continue;
      const best = new Map<string, Candidate>();
      for (const x of xs) {
        const { rArcsec, azimuthDeg } = galaxyRadiusAt(g, x, yc);
        const rRe = rArcsec / re;
        if (rRe >= nBins) continue;
        const b = binOf(rRe, azimuthDeg);
        const mu = slitMeanMu(g, x, w.span.lo, w.span.hi, 3);
        const part = spectrumPart(mu + ab, 2 * half, st.rules.widthArcsec, skyArcsec, m);
        if (!part) continue;
        const prev = best.get(b.key);
        if (prev && prev.part.signalE * prev.part.signalE / prev.part.varianceE2 >= part.signalE * part.signalE / part.varianceE2) continue;
        if (!centredRectFits(st.rules, x, yc, hw, half)) continue;
        best.set(b.key, { mask: i, slots: w.slots, key: b.key, part, choice: { y0: w.span.lo, y1: w.span.hi, xArcsec: x, rRe, azimuthDeg, snPerA: NaN, muMagPerArcsec2: mu } });
      }
      candidates.push(...best.values());
    }
  });
  const used = masks.map(() => new Set<number>());
  const chosen = masks.map(() => [] as Candidate[]);
  const sn = (parts: readonly SpectrumPart[]) => coaddedSignalToNoise(parts, c.skySystematicFraction).sn;
  const galaxy = stageOf(masks[0]).galaxy, model0 = modelOf(masks[0]);
  for (let r = 0; r < nBins; r++) {
    if (floorCapSnPerA(r, galaxy, model0, c.skySystematicFraction) < c.targetSnPerA) continue;
    for (let sector = 0; sector < 360; sector += 45) {
      const key = `${r}:${sector}`;
      const parts = (sums.get(key) ?? []).slice();
      let now = sn(parts);
      if (now >= c.targetSnPerA) continue;
      const mine = candidates.filter((k) => k.key === key);
      const taken: Candidate[] = [];
      while (now < c.targetSnPerA) {
        let best: Candidate | null = null, bestSn = now;
        for (const k of mine) {
          if (k.slots.some((s) => used[k.mask].has(s))) continue;
          const v = sn([...parts, k.part]);
          if (v > bestSn) { bestSn = v; best = k; }
        }
        if (!best) break;
        taken.push(best);
        parts.push(best.part);
        for (const s of best.slots) used[best.mask].add(s);
        now = bestSn;
      }
      if (now >= c.targetSnPerA) {
        for (const k of taken) chosen[k.mask].push(k);
        sums.set(key, parts);
      } else {
        for (const k of taken) for (const s of k.slots) used[k.mask].delete(s);
      }
    }
  }
  let added = 0;
  const out = masks.map((ms, i) => {
    if (!chosen[i].length) return ms;
    const st = stageOf(ms);
    const picks = chosen[i].map((k) => k.choice).sort((a, b) => a.y0 - b.y0);
    added += picks.length;
    const kept = trimAround(ms.slits as Slit[], picks, st.gapArcsec, st.rules.minLengthArcsec / 2);
    const first = ms.slits.filter((s) => s.role === 'starlight').length + 1;
    const rows = [...kept, ...slotRows(ms.mask, picks, 'starlight', st.rules.widthArcsec, first)];
    rows.sort((a, b) => a.yArcsec - b.yArcsec);
    return { ...ms, slits: rows };
  });
  return { masks: out, added };
}

/** Per-mask starlight stage and exposure model of a plan (each mask its own spectrograph's), cached per profile id. */
export function planStarlightModels(plan: PlanFile, ctx: AllocationContext): { stageOf: (ms: MaskSolution) => StarlightStage; modelOf: (ms: MaskSolution) => ExposureModel; settings: CoaddSettings } {
  const byProfile = new Map<string, { stage: StarlightStage; model: ExposureModel }>();
  const of = (ms: MaskSolution) => {
    const profile = ctx.byInstrument ? contextFor(ctx, ms.mask).profile : ctx.profile;
    let e = byProfile.get(profile.id);
    if (!e) {
      const bm = starlightBinModel(plan, profile);
      byProfile.set(profile.id, (e = { stage: starlightStage(ctx.galaxy, profile, plan), model: bm.model }));
    }
    return e;
  };
  // Target, floor and goal radius are the plan's, whatever the spectrograph.
  return { stageOf: (ms) => of(ms).stage, modelOf: (ms) => of(ms).model, settings: starlightBinModel(plan, ctx.profile).settings };
}
