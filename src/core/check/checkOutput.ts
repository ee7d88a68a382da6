/**
 * The independent checker of an output folder: every rule of a valid mask re-derived from the contract, using only
 * the folder's own files (masks.csv, slits.csv, solved.plan.json) and the instrument profile each mask names. It
 * shares no bookkeeping with the solver. Mask frame arcsec (x along dispersion, y along slits), sky degrees.
 */
import type { InstrumentProfile } from '../profile/schema';
import type { Slit } from '../geometry/maskSolution';
import { separationDeg } from '../sky/separation';
import { maskToSkyArcsec } from '../sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../sky/tangentPlane';
import { quadInside, rowCorners, type Pt } from './geometry';
import { wavelengthRuleProblems } from './wavelengthRule';

/** One row of masks.csv as the checker needs it. */
export interface CheckedMask {
  maskId: string;
  instrument: string;
  raDeg: number;
  decDeg: number;
  paDeg: number;
}

export interface CheckInput {
  masks: readonly CheckedMask[];
  slits: readonly Slit[];
  /** The profile for a masks.csv `instrument` value, or null when none can be found. */
  profileFor(instrument: string): InstrumentProfile | null;
  /** Required rest wavelengths (Angstrom) and the galaxy's systemic velocity (km/s), from solved.plan.json. */
  linesRestA: readonly number[];
  vsysKms: number;
  /** The wavelength rule's velocity half-range (km/s, default 500) and line half-window (A, default 10): solved.plan.json goals. */
  velocityHalfRangeKms?: number;
  lineHalfWindowA?: number;
  /** File names used in messages. */
  slitsSource?: string;
  masksSource?: string;
  /** File line (counting the header) of each slits.csv / masks.csv row; default: row index + 2 (no blank lines). */
  slitLines?: readonly number[];
  maskLines?: readonly number[];
}

export interface Violation {
  where: string;
  rule: string;
  what: string;
}

/** Tolerance for lengths and containment (arcsec); far below any slit dimension, far above rounding. */
export const LENGTH_TOL_ARCSEC = 1e-6;
/** Tolerance for "ra/dec is the point (x, y) on the sky" (arcsec). */
export const SKY_TOL_ARCSEC = 1e-3;

export function formatViolation(v: Violation): string {
  return `${v.where}: [${v.rule}] ${v.what}`;
}

/** Every violation of the contract's mask rules in an output folder's rows (empty when the folder is valid). */
export function checkOutput(input: CheckInput): Violation[] {
  const out: Violation[] = [];
  const slitsSrc = input.slitsSource ?? 'slits.csv';
  const masksSrc = input.masksSource ?? 'masks.csv';
  const rowWhere = (i: number, s: Slit) => `${slitsSrc} line ${input.slitLines?.[i] ?? i + 2} (mask ${s.maskId}, slit ${s.slitId})`;
  const tol = LENGTH_TOL_ARCSEC;

  const maskById = new Map<string, CheckedMask>();
  const profiles = new Map<string, InstrumentProfile>();
  input.masks.forEach((m, i) => {
    const where = `${masksSrc} line ${input.maskLines?.[i] ?? i + 2} (mask ${m.maskId})`;
    if (maskById.has(m.maskId)) out.push({ where, rule: 'unique mask id', what: `mask id "${m.maskId}" appears twice` });
    maskById.set(m.maskId, m);
    if (!(m.paDeg >= 0 && m.paDeg < 360)) out.push({ where, rule: 'position angle', what: `pa_deg ${m.paDeg} is not in [0, 360)` });
    if (!(m.raDeg >= 0 && m.raDeg < 360) || !(m.decDeg >= -90 && m.decDeg <= 90)) out.push({ where, rule: 'mask centre', what: `ra_deg ${m.raDeg}, dec_deg ${m.decDeg} is not a sky position` });
    const p = input.profileFor(m.instrument);
    if (!p) out.push({ where, rule: 'instrument', what: `no instrument profile "${m.instrument}" could be found` });
    else profiles.set(m.maskId, p);
  });
  if (input.masks.length === 0) out.push({ where: masksSrc, rule: 'masks', what: 'no mask rows' });

  const seenObject = new Map<string, number>();
  const seenAlignment = new Map<string, number>(), seenNonAlignment = new Map<string, number>();
  const seenSlit = new Set<string>();
  const spansByMask = new Map<string, { lo: number; hi: number; i: number }[]>();
  const boxesByMask = new Map<string, number>();

  input.slits.forEach((s, i) => {
    const where = rowWhere(i, s);
    const m = maskById.get(s.maskId);
    if (!m) { out.push({ where, rule: 'mask', what: `mask "${s.maskId}" is not in ${masksSrc}` }); return; }
    const key = `${s.maskId}\u0000${s.slitId}`;
    if (seenSlit.has(key)) out.push({ where, rule: 'unique slit id', what: `slit id "${s.slitId}" appears twice on mask ${s.maskId}` });
    seenSlit.add(key);
    if (s.objectId !== '') {
      // Contract revision 2: an alignment star may serve several masks (each mask is its own exposure), once per mask;
      // every other object appears at most once over all masks.
      const key = s.role === 'alignment' ? `${s.maskId}\u0000${s.objectId}` : s.objectId;
      const first = seenObject.get(key) ?? (s.role === 'alignment' ? seenNonAlignment.get(s.objectId) : seenAlignment.get(s.objectId));
      if (first !== undefined) out.push({ where, rule: 'object once', what: `object "${s.objectId}" already has ${rowWhere(first, input.slits[first])}` });
      else {
        seenObject.set(key, i);
        if (s.role === 'alignment') { if (!seenAlignment.has(s.objectId)) seenAlignment.set(s.objectId, i); } else seenNonAlignment.set(s.objectId, i);
      }
    } else if (s.role === 'tracer' || s.role === 'alignment') out.push({ where, rule: 'object id', what: `a ${s.role} row needs an object_id` });

    // ra/dec is the point (x, y) of the mask frame on the sky.
    const sky = maskToSkyArcsec(s.xArcsec, s.yArcsec, m.paDeg);
    const p = tangentToSkyDeg(tangentCentre(m.raDeg, m.decDeg), sky.xiArcsec, sky.etaArcsec);
    const offArcsec = separationDeg(p.raDeg, p.decDeg, s.raDeg, s.decDeg) * 3600;
    if (!(offArcsec <= SKY_TOL_ARCSEC)) out.push({ where, rule: 'sky position', what: `ra_deg/dec_deg is ${offArcsec.toPrecision(4)} arcsec from the point (x_arcsec, y_arcsec) = (${s.xArcsec}, ${s.yArcsec}) of mask ${m.maskId} on the sky` });

    const prof = profiles.get(s.maskId);
    if (!prof) return;
    const sl = prof.slits;
    if (!(s.widthArcsec > 0)) out.push({ where, rule: 'width', what: `width_arcsec ${s.widthArcsec} must be positive` });
    if (!(Math.abs(s.tiltDeg) <= sl.maxTiltDeg + 1e-9)) out.push({ where, rule: 'tilt', what: `tilt_deg ${s.tiltDeg} exceeds slits.maxTiltDeg ${sl.maxTiltDeg}` });
    if (s.role === 'alignment') {
      const b = prof.alignment.boxSizeArcsec;
      if (Math.abs(s.lenBelowArcsec - b / 2) > tol || Math.abs(s.lenAboveArcsec - b / 2) > tol || Math.abs(s.widthArcsec - b) > tol) {
        out.push({ where, rule: 'alignment box', what: `a box must have len_below = len_above = ${b / 2} and width = ${b} arcsec (alignment.boxSizeArcsec ${b}); it has ${s.lenBelowArcsec}, ${s.lenAboveArcsec}, ${s.widthArcsec}` });
      }
      boxesByMask.set(s.maskId, (boxesByMask.get(s.maskId) ?? 0) + 1);
    } else {
      const half = sl.minLengthArcsec / 2;
      if (!(s.lenBelowArcsec >= half - tol)) out.push({ where, rule: 'minimal length', what: `len_below_arcsec ${s.lenBelowArcsec} is below slits.minLengthArcsec/2 = ${half}` });
      if (!(s.lenAboveArcsec >= half - tol)) out.push({ where, rule: 'minimal length', what: `len_above_arcsec ${s.lenAboveArcsec} is below slits.minLengthArcsec/2 = ${half}` });
    }
    const corners = rowCorners(s);
    if (!quadInside(corners, prof.footprint as readonly Pt[], tol)) {
      out.push({ where, rule: 'footprint', what: `not every corner of the ${s.role === 'alignment' ? 'box' : 'slit'} lies inside the footprint (corners ${corners.map(([x, y]) => `(${x.toFixed(3)}, ${y.toFixed(3)})`).join(' ')})` });
    }
    if (s.role === 'tracer' || s.role === 'starlight') {
      for (const what of wavelengthRuleProblems(prof.detector, s.xArcsec, input)) out.push({ where, rule: 'wavelength', what });
    }
    const ys = corners.map((c) => c[1]);
    const list = spansByMask.get(s.maskId) ?? [];
    list.push({ lo: Math.min(...ys), hi: Math.max(...ys), i });
    spansByMask.set(s.maskId, list);
  });

  // Gap rule: sorted by lower end, each span must start at least gap above the highest end so far.
  for (const [maskId, spans] of spansByMask) {
    const prof = profiles.get(maskId)!;
    const g = prof.slits.gapArcsec;
    spans.sort((a, b) => a.lo - b.lo);
    let top = spans[0];
    for (let k = 1; k < spans.length; k++) {
      const s = spans[k];
      const clear = s.lo - top.hi;
      if (clear < g - tol) {
        out.push({ where: rowWhere(s.i, input.slits[s.i]), rule: 'gap', what: `y-span [${s.lo.toFixed(4)}, ${s.hi.toFixed(4)}] is ${clear.toFixed(4)} arcsec from ${rowWhere(top.i, input.slits[top.i])} (y up to ${top.hi.toFixed(4)}); slits.gapArcsec is ${g}` });
      }
      if (s.hi > top.hi) top = s;
    }
  }
  for (const m of input.masks) {
    const prof = profiles.get(m.maskId);
    if (!prof) continue;
    const n = boxesByMask.get(m.maskId) ?? 0;
    if (n < prof.alignment.minCount) out.push({ where: `${masksSrc} (mask ${m.maskId})`, rule: 'alignment count', what: `${n} alignment boxes, the instrument profile needs at least ${prof.alignment.minCount} per mask` });
  }
  return out;
}
