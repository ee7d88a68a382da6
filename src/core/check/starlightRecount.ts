/**
 * The checker's re-derivation of coverage.json `starlightBins` (docs/faults.md, "Starlight bins"): every spectrum
 * holding galaxy light — each starlight slit whole and, inside the starlight goal, the two parts of each tracer slit
 * beside its extraction (2 seeing FWHM) — from the rows of slits.csv; its bin (1 Re of circularised radius x 45 deg of
 * azimuth from the major axis towards +v) at its midpoint; its electrons per A from the Sérsic profile (flux mean over
 * 5 points) and the CCD equation with the sky-estimate term of the mask's sky slits; co-added per bin with the
 * systematic sky floor. A mask point is placed in the galaxy frame as the model defines it (docs/signal-to-noise.md):
 * the galaxy centre projected (TAN) into the mask frame, the offset from it turned to the sky by the mask PA and to
 * the galaxy frame by the galaxy PA. It shares the physical formulas (spectro/, sky/sersic, one spectrum's electrons and
 * the co-added S/N of solver/starlightBins) and the plan's settings (starlightBinModel) with the solver, not its
 * binning, geometry or which spectra are summed; test/contract/contract_check.py re-derives the formulas too.
 */
import type { GalaxyModel, PlanFile } from '../plan/schema';
import type { InstrumentProfile } from '../profile/schema';
import type { Slit } from '../geometry/maskSolution';
import { maskToSkyArcsec, skyToMaskArcsec } from '../sky/frames';
import { skyToTangentArcsec, tangentCentre } from '../sky/tangentPlane';
import { sersicBn, sersicMuMagPerArcsec2 } from '../sky/sersic';
import { PMath } from '../numeric/portableMath';
import { RAD_PER_DEG } from '../sky/angles';
import { coaddedSignalToNoise, floorCapSnPerA, spectrumPart, starlightBinModel, type SpectrumPart } from '../solver/starlightBins';
import { pointExtractionArcsec, type ExposureModel } from '../solver/exposure';
import type { CheckedMask, Violation } from './checkOutput';

/** A spectrum this close (arcsec, radially or along the azimuth) to a bin edge may be in either bin (slits.csv to 1e-4). */
export const EDGE_TOL_ARCSEC = 0.01;
/** S/N per A: written to 0.01, from slit ends written to 1e-4 arcsec. */
export const SN_ABS_TOL = 0.011;
export const SN_REL_TOL = 1e-3;
/** reachRe: written to 1e-4 Re. */
export const REACH_TOL_RE = 3e-4;
/** Most layouts of the edge cases tried (each a choice of bin per edge case); further edge cases stay in their own bin. */
const MAX_EDGE_LAYOUTS = 1024;

/** A spectrum and the bins it may be in, its own first (null: outside the goal radius, not counted). */
interface Spectrum { cands: (string | null)[]; kind: 'starlight' | 'tracer'; rRe: number; part: SpectrumPart; where: string }

export interface StarlightCheckInput {
  coverage: unknown;
  plan: PlanFile;
  galaxy: GalaxyModel;
  masks: readonly CheckedMask[];
  slits: readonly Slit[];
  profileFor(instrument: string): InstrumentProfile | null;
  coverageSource?: string;
  /** Names a slits.csv row (index into `slits`) in messages. */
  rowWhere?: (i: number) => string;
}

const isObj = (x: unknown): x is Record<string, unknown> => !!x && typeof x === 'object' && !Array.isArray(x);
const keyOf = (fromRe: number, sectorDeg: number) => `${fromRe}:${sectorDeg}`;
/** A bin in the user's words: "2-3 Re, 90-135 deg". */
export const starlightBinName = (fromRe: number, sectorDeg: number) => `${fromRe}-${fromRe + 1} Re, ${sectorDeg}-${sectorDeg + 45} deg`;

/** Bins (keys) a spectrum at (R/Re, azimuth) may be in, its own first: near an edge, the neighbour too. */
function candidateBins(rRe: number, phiDeg: number, reArcsec: number): string[] {
  const r0 = Math.floor(rRe), s0 = 45 * Math.floor(phiDeg / 45);
  const radial = [r0], sector = [s0 % 360];
  for (const e of [r0, r0 + 1]) if (Math.abs(rRe - e) * reArcsec < EDGE_TOL_ARCSEC) radial.push(e === r0 ? e - 1 : e);
  const rArcsec = Math.max(rRe * reArcsec, 1e-9);
  for (const e of [s0, s0 + 45]) {
    const gapDeg = Math.min(Math.abs(phiDeg - e), 360 - Math.abs(phiDeg - e));
    if (gapDeg * RAD_PER_DEG * rArcsec < EDGE_TOL_ARCSEC) sector.push(e === s0 ? (e + 315) % 360 : e % 360);
  }
  return radial.filter((r) => r >= 0).flatMap((r) => sector.map((x) => keyOf(r, x)));
}

/** Every spectrum of the folder holding galaxy light (see the module comment). */
function spectraOf(input: StarlightCheckInput, goalRe: number): { spectra: Spectrum[]; firstModel: ExposureModel | null } {
  const g = input.galaxy, bn = sersicBn(g.sersicN);
  const models = new Map<string, ExposureModel>();
  let firstModel: ExposureModel | null = null;
  const spectra: Spectrum[] = [];
  const rowsByMask = new Map<string, number[]>();
  input.slits.forEach((s, i) => {
    const list = rowsByMask.get(s.maskId);
    if (list) list.push(i); else rowsByMask.set(s.maskId, [i]);
  });
  for (const mask of input.masks) {
    const profile = input.profileFor(mask.instrument);
    if (!profile) continue; // reported by the mask rules
    let m = models.get(profile.id);
    if (!m) models.set(profile.id, (m = starlightBinModel(input.plan, profile).model));
    firstModel ??= m;
    const rows = (rowsByMask.get(mask.maskId) ?? []).map((i) => ({ s: input.slits[i], i }));
    const skyLength = rows.filter((r) => r.s.role === 'sky').reduce((a, r) => a + r.s.lenBelowArcsec + r.s.lenAboveArcsec, 0);
    if (!(skyLength > 0)) continue;
    // The galaxy centre in the mask frame, then each point's offset from it turned to the sky and the galaxy frame.
    const t = skyToTangentArcsec(tangentCentre(mask.raDeg, mask.decDeg), g.raDeg, g.decDeg);
    if (!t) continue;
    const gc = skyToMaskArcsec(t.xiArcsec, t.etaArcsec, mask.paDeg);
    const sinGal = PMath.sin(g.paDeg * RAD_PER_DEG), cosGal = PMath.cos(g.paDeg * RAD_PER_DEG), q = g.axisRatio;
    const at = (x: number, y: number) => {
      const o = maskToSkyArcsec(x - gc.xArcsec, y - gc.yArcsec, mask.paDeg);
      const u = o.xiArcsec * sinGal + o.etaArcsec * cosGal, v = o.xiArcsec * cosGal - o.etaArcsec * sinGal;
      const phiDeg = PMath.atan2(v, u) / RAD_PER_DEG;
      return { rRe: Math.sqrt(q * u * u + (v * v) / q) / g.reArcsec, phiDeg: phiDeg < 0 ? phiDeg + 360 : phiDeg };
    };
    const extraction = pointExtractionArcsec(m.seeingFwhmArcsec);
    for (const { s, i } of rows) {
      const lo = s.yArcsec - s.lenBelowArcsec, hi = s.yArcsec + s.lenAboveArcsec;
      const parts: [number, number, 'starlight' | 'tracer'][] = s.role === 'starlight' ? [[lo, hi, 'starlight']]
        : s.role === 'tracer' ? [[lo, Math.max(lo, s.yArcsec - extraction / 2), 'tracer'], [Math.min(hi, s.yArcsec + extraction / 2), hi, 'tracer']] : [];
      for (const [y0, y1, kind] of parts) {
        if (!(y1 - y0 > 0)) continue;
        const mid = at(s.xArcsec, 0.5 * (y0 + y1));
        if (kind === 'tracer' && (mid.rRe - goalRe) * g.reArcsec > EDGE_TOL_ARCSEC) continue;
        let flux = 0;
        for (let k = 0; k < 5; k++) flux += PMath.pow(10, -0.4 * sersicMuMagPerArcsec2(at(s.xArcsec, y0 + ((k + 0.5) / 5) * (y1 - y0)).rRe * g.reArcsec, g.reArcsec, g.sersicN, g.muE, bn));
        const muAb = -2.5 * PMath.log10(flux / 5) + (m.catalogToAbMag ?? 0);
        let cands: (string | null)[] = candidateBins(mid.rRe, mid.phiDeg, g.reArcsec);
        // At the goal radius a tracer sky part is counted or not.
        if (kind === 'tracer' && Math.abs(mid.rRe - goalRe) * g.reArcsec < EDGE_TOL_ARCSEC) cands = mid.rRe <= goalRe ? [...cands, null] : [null, ...cands];
        const part = spectrumPart(muAb, y1 - y0, s.widthArcsec, skyLength, m);
        if (!part) continue; // no sky estimate (skyLength > 0 above: never)
        spectra.push({ cands, kind, rRe: mid.rRe, part, where: input.rowWhere?.(i) ?? `slit ${s.slitId} of mask ${s.maskId}` });
      }
    }
  }
  return { spectra, firstModel };
}

const within = (v: unknown, lo: number, hi: number, rel: number, abs: number) => typeof v === 'number' && v >= lo - abs - rel * Math.abs(lo) && v <= hi + abs + rel * Math.abs(hi);
const f2 = (v: number) => v.toFixed(2);

/** Every disagreement between coverage.json `starlightBins` (and its goal) and the re-derivation (empty when they agree). */
export function checkStarlightBins(input: StarlightCheckInput): Violation[] {
  const out: Violation[] = [];
  const src = input.coverageSource ?? 'coverage.json';
  const where0 = `${src} starlightBins`;
  const add = (where: string, what: string) => out.push({ where, rule: 'starlight bins', what });
  const cov = isObj(input.coverage) ? input.coverage : {};
  const goalRe = input.plan.goals.starlightReachRe;
  const sb = cov.starlightBins;
  if (!(goalRe > 0)) {
    if (isObj(sb) && Array.isArray(sb.bins) && sb.bins.length) add(where0, `${sb.bins.length} bins, but goals.starlightReachRe is ${goalRe} (starlight slits off)`);
    return out;
  }
  if (!isObj(sb) || !Array.isArray(sb.bins)) return [{ where: where0, rule: 'starlight bins', what: 'missing (co-added starlight per bin of 1 Re x 45 deg)' }];
  const profile = input.masks.map((m) => input.profileFor(m.instrument)).find((p) => p) ?? null;
  if (!profile) return out; // no profile: reported by the mask rules
  const settings = starlightBinModel(input.plan, profile).settings;
  const target = settings.targetSnPerA, f = settings.skySystematicFraction;
  for (const [k, want] of [['targetSnPerA', target], ['skySystematicFraction', f], ['goalRe', goalRe]] as const) {
    if (typeof sb[k] !== 'number' || Math.abs((sb[k] as number) - want) > 1e-9) add(`${where0}.${k}`, `${String(sb[k])}, but solved.plan.json gives ${want}`);
  }
  const { spectra, firstModel } = spectraOf(input, goalRe);
  const fileBins = new Map<string, { i: number; b: Record<string, unknown>; fromRe: number; sectorDeg: number }>();
  sb.bins.forEach((b, i) => {
    if (!isObj(b) || typeof b.fromRe !== 'number' || typeof b.sectorDeg !== 'number') { add(`${where0}.bins[${i}]`, 'no numeric fromRe/sectorDeg'); return; }
    const k = keyOf(b.fromRe, b.sectorDeg);
    if (fileBins.has(k)) add(`${where0}.bins[${i}] (${starlightBinName(b.fromRe, b.sectorDeg)})`, 'the bin is listed twice');
    fileBins.set(k, { i, b, fromRe: b.fromRe, sectorDeg: b.sectorDeg });
  });
  const sorted = [...fileBins.values()].sort((a, c) => a.fromRe - c.fromRe || a.sectorDeg - c.sectorDeg);

  /** Disagreements of the file's bins with the spectra placed in bins by `binOf` (one choice for the edge cases). */
  const compare = (binOf: (sp: Spectrum) => string | null): Violation[] => {
    const found: Violation[] = [];
    const v = (where: string, what: string) => found.push({ where, rule: 'starlight bins', what });
    const derived = new Map<string, Spectrum[]>();
    for (const sp of spectra) {
      const k = binOf(sp);
      if (k === null) continue;
      const list = derived.get(k);
      if (list) list.push(sp); else derived.set(k, [sp]);
    }
    for (const [k, sps] of derived) {
      if (fileBins.has(k)) continue;
      const [r, x] = k.split(':').map(Number);
      v(`${where0} (${starlightBinName(r, x)})`, `missing: ${sps.length} spectra hold galaxy light there, e.g. ${sps[0].where}`);
    }
    for (const { i, b, fromRe, sectorDeg } of sorted) {
      const where = `${where0}.bins[${i}] (${starlightBinName(fromRe, sectorDeg)})`;
      const sps = derived.get(keyOf(fromRe, sectorDeg));
      if (!sps) { v(where, 'no starlight slit or tracer sky part of slits.csv lies in this bin'); continue; }
      for (const [field, kind, words] of [['starlightSlits', 'starlight', 'starlight slits'], ['tracerSkyParts', 'tracer', 'tracer sky parts']] as const) {
        const n = sps.filter((s) => s.kind === kind).length;
        if (b[field] !== n) v(where, `${field} ${String(b[field])}, but slits.csv gives ${n} ${words} there`);
      }
      const co = coaddedSignalToNoise(sps.map((s) => s.part), f);
      for (const [field, sn] of [['snPerA', co.sn], ['snPerAWithoutFloor', co.snWithoutFloor]] as const) {
        if (!within(b[field], sn, sn, SN_REL_TOL, SN_ABS_TOL)) v(where, `${field} ${String(b[field])}, but the spectra of slits.csv in this bin co-add to ${f2(sn)}`);
      }
      const reach = Math.max(...sps.map((s) => s.rRe));
      if (!within(b.reachRe, reach, reach, 0, REACH_TOL_RE)) v(where, `reachRe ${String(b.reachRe)}, but its spectra reach ${reach.toFixed(4)} Re`);
    }
    return found;
  };
  // Every spectrum in its own bin, except the few near an edge: the choice of their bins that explains the file best.
  const edge: Spectrum[] = [];
  let layouts = 1;
  for (const sp of spectra) {
    if (sp.cands.length < 2 || layouts * sp.cands.length > MAX_EDGE_LAYOUTS) continue;
    edge.push(sp);
    layouts *= sp.cands.length;
  }
  const choice = new Map<Spectrum, number>(edge.map((s) => [s, 0]));
  let best: Violation[] | null = null;
  for (;;) {
    const found = compare((sp) => sp.cands[choice.get(sp) ?? 0]);
    if (!best || found.length < best.length) best = found;
    if (!best.length) break;
    // Next choice (an odometer over the edge cases' candidates); done when it wraps round.
    let k = 0;
    for (; k < edge.length; k++) {
      const c = (choice.get(edge[k])! + 1) % edge[k].cands.length;
      choice.set(edge[k], c);
      if (c !== 0) break;
    }
    if (k === edge.length) break;
  }
  out.push(...(best ?? []));

  let inside = 0, metInside = 0;
  const short: { name: string; capped: boolean }[] = [];
  for (const { i, b, fromRe, sectorDeg } of sorted) {
    const name = starlightBinName(fromRe, sectorDeg);
    const where = `${where0}.bins[${i}] (${name})`;
    if (firstModel) {
      const capOrInfinity = floorCapSnPerA(fromRe, input.galaxy, firstModel, f);
      const cap = Number.isFinite(capOrInfinity) ? capOrInfinity : null;
      const got = b.floorCapSnPerA;
      if ((cap === null) !== (got === null) || (cap !== null && !within(got, cap, cap, 1e-6, SN_ABS_TOL))) add(where, `floorCapSnPerA ${String(got)}, but the sky floor caps this bin at ${cap === null ? 'nothing (central bin or no floor)' : f2(cap)}`);
    }
    const sn = b.snPerA, met = b.met;
    if (typeof met !== 'boolean' || typeof sn !== 'number' || (met !== sn >= target && Math.abs(sn - target) > 0.005)) {
      add(where, `met ${String(met)}, but its S/N ${String(sn)} is ${typeof sn === 'number' && sn >= target ? 'at or above' : 'below'} the target ${target}`);
    }
    if (b.targetSnPerA !== target) add(where, `targetSnPerA ${String(b.targetSnPerA)}, but solved.plan.json gives ${target}`);
    if (fromRe < goalRe) {
      inside++;
      if (met === true) metInside++;
      else short.push({ name, capped: typeof b.floorCapSnPerA === 'number' && b.floorCapSnPerA < target });
    }
  }
  // The goal: bins inside the goal radius, those reaching the target, each short one named with its cause.
  const gwhere = `${src} goals (starlightBins)`;
  const goal = Array.isArray(cov.goals) ? cov.goals.find((x) => isObj(x) && x.name === 'starlightBins') : undefined;
  if (!isObj(goal)) add(gwhere, 'missing: the goal of co-added starlight per bin');
  else {
    if (goal.target !== inside || goal.achieved !== metInside) add(gwhere, `target ${String(goal.target)} / achieved ${String(goal.achieved)}, but ${inside} bins inside ${goalRe} Re hold galaxy light and ${metInside} of them reach the target`);
    if (goal.met !== (inside > 0 && metInside >= inside)) add(gwhere, `met ${String(goal.met)} with ${metInside} of ${inside} bins reaching the target`);
    const reason = typeof goal.reason === 'string' ? goal.reason : '';
    for (const s of short) {
      const cause = s.capped ? 'floor' : 'free slit space';
      if (!reason.includes(s.name.replace(',', '')) || !reason.includes(cause)) add(gwhere, `the short bin ${s.name} is not named with its cause (${s.capped ? 'the sky-subtraction floor' : 'no free slit space'}) in the reason`);
    }
  }
  return out;
}
