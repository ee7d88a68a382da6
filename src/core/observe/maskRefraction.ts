/**
 * Differential atmospheric refraction over one slit mask, hour angle by hour angle.
 * Model: the telescope guides at guideWavelengthA on the mask centre (translation removed) and holds the mask's
 * PA fixed on the sky, North taken at the true (unrefracted) mask centre. Each target's image at wavelength L is
 * lifted toward the zenith (sky PA = its parallactic angle) by the plane-parallel refraction at its own zenith
 * distance; the slits were cut where the targets' images were at designWavelengthA (default guideWavelengthA) at the
 * design hour angle, the telescope guiding at guideWavelengthA.
 * Offsets are in the mask frame (x across the slits, along the dispersion; y along the slits), arcsec.
 * Slit tilt is not applied to the projection (x is taken as the across-slit direction).
 * Hour angles are of the mask centre, hours, positive West; target hour angles follow from their RA offsets (J2000).
 */
import type { MaskPointing, Slit, SlitRole } from '../geometry/maskSolution';
import { skyToTangentArcsec, tangentCentre, tangentToSkyDeg } from '../sky/tangentPlane';
import { maskTurn, skyToMaskTurned, type MaskTurn } from '../sky/frames';
import { altitudeDeg } from './horizon';
import { parallacticAngleDeg } from './parallactic';
import { hardieAirmass } from './airmass';
import { edlenRefractivity, type AirConditions } from './refractiveIndex';
import { centredSlitTransmission, lossRelativeToCentred, offsetAtLoss, slitTransmission } from './slitLoss';
import { ARCSEC_PER_RAD, RAD_PER_DEG } from '../sky/angles';
import { PMath } from '../numeric/portableMath';

/** Settings of the refraction report (resolved: every value present). */
export interface RefractionSettings {
  seeingFwhmArcsec: number;
  /** A slit fails when its light lost to refraction, relative to a centred image, reaches this fraction. */
  maxLossFraction: number;
  guideWavelengthA: number;
  /** Wavelength at which the slits are cut (default: the guide wavelength). */
  designWavelengthA?: number;
  /** Science wavelength range [blue, red], Angstrom (air). */
  scienceRangeA: [number, number];
  hourAngleRangeH: [number, number];
  hourAngleStepH: number;
  /** Hour angles where the mask centre's Hardie airmass exceeds this are outside any window. */
  maxAirmass: number;
}

/** Roles whose targets are point sources and so count for the hour-angle window. */
export const WINDOW_ROLES: readonly SlitRole[] = ['tracer'];

/** One slit at one hour angle. Across-slit values are mask x, arcsec; [blue end, red end] of the science range. */
export interface SlitRefraction {
  slitId: string;
  objectId: string;
  role: SlitRole;
  /** (a) Image displacement across the slit between the guide wavelength and each end of the science range. */
  dispersionAcrossArcsec: [number, number];
  /** (b) Shift of the target's guide-wavelength image relative to its slit, across and along, since the design hour angle. */
  fieldShiftAcrossArcsec: number;
  fieldShiftAlongArcsec: number;
  /** Total across-slit offset of the image from the slit centre at each end of the science range. */
  totalAcrossArcsec: [number, number];
  /** (c) Light lost relative to a centred image, worse of the two ends. */
  lossFraction: number;
  /** Fraction of the light through the slit at the worse end (absolute, includes the loss of a centred image). */
  transmission: number;
}

export interface MaskHourAngleRow {
  hourAngleH: number;
  /** Mask centre. */
  altitudeDeg: number;
  airmass: number | null;
  parallacticAngleDeg: number;
  /** Largest |(a)| over window slits and both ends, arcsec. */
  maxDispersionAcrossArcsec: number | null;
  /** Largest |(b)| across the slits over window slits, arcsec. */
  maxFieldShiftAcrossArcsec: number | null;
  maxLossFraction: number | null;
  worstSlitId: string | null;
  slitsOverLimit: number;
  /** Above the horizon, below the airmass limit and every window slit under the loss limit. */
  passes: boolean;
}

export interface MaskRefractionReport {
  maskId: string;
  paDeg: number;
  designHourAngleH: number;
  /** Recommended window [start, end] in hours of the mask centre's hour angle, or null if no hour angle passes. */
  hourAngleWindowH: [number, number] | null;
  /** False when the design hour angle itself fails and the longest passing stretch is given instead. */
  windowContainsDesign: boolean;
  /** Why there is no window, or why it is not a plain window around the design hour angle; null otherwise. */
  windowNote: string | null;
  /** Number of slits that count for the window (point-source roles). */
  windowSlitCount: number;
  /** Whether the planned exposure fits in the window, and whether the design hour angle was chosen (set by the plan's observing report). */
  exposureFitsWindow?: boolean;
  designHourAngleChosen?: boolean;
  rows: MaskHourAngleRow[];
}

export interface MaskRefractionInput {
  mask: MaskPointing;
  slits: Slit[];
  designHourAngleH: number;
  latDeg: number;
  air: AirConditions;
  settings: RefractionSettings;
}

interface SlitGeometry {
  slit: Slit;
  windowRole: boolean;
  widthArcsec: number;
  /** Transmission of the centred image, for the relative loss. */
  centredTransmission: number;
  /** Across-slit offset (arcsec) at which the loss reaches the limit (offsetAtLoss; the loss grows with |offset|); window-role slits only, else Infinity. */
  offsetLimitArcsec: number;
  /** RA offset from the mask centre (degrees) and the target's sin/cos Dec. */
  dRaDeg: number;
  sinDec: number;
  cosDec: number;
  /** Jacobian from a small displacement at the target (East, North; arcsec) to mask-frame (x, y) arcsec. */
  jxe: number;
  jxn: number;
  jye: number;
  jyn: number;
  /** Image displacement at the guide wavelength, relative to the guided centre, at the design hour angle (mask frame). */
  design: { xArcsec: number; yArcsec: number };
}

/** Precomputed state of one mask: refractivities, site trigonometry, slit geometry and the design positions. */
export interface MaskRefractionContext {
  input: MaskRefractionInput;
  /** Refraction constants ARCSEC_PER_RAD (n - 1) per wavelength, arcsec per unit tan z. */
  kArcsec: { guide: number; design: number; blue: number; red: number };
  sinLat: number;
  cosLat: number;
  centreSinDec: number;
  centreCosDec: number;
  /** Sine and cosine of the mask PA (sky to mask frame). */
  turn: MaskTurn;
  slits: SlitGeometry[];
  /**
   * Window-role slits' image x at hour angles already asked for (windowImagesAt), shared by the contexts of one slit
   * geometry (they do not depend on the design hour angle).
   */
  imagesByHour: Map<number, Float64Array | null>;
}

/**
 * The vector (East, North) = tan z (sin q, cos q) of an object
 * at hour angle haDeg, from Meeus (13.6) and (14.1): (sin H cos phi, sin phi cos dec - cos phi sin dec cos H) / cos z.
 * Multiplied by ARCSEC_PER_RAD (n - 1) it is the plane-parallel refraction displacement in arcsec. Null below the horizon.
 */
function liftPerUnitRefractivity(ctx: MaskRefractionContext, haDeg: number, sinDec: number, cosDec: number): [number, number] | null {
  const h = haDeg * RAD_PER_DEG;
  const cosH = PMath.cos(h);
  const cosZ = ctx.sinLat * sinDec + ctx.cosLat * cosDec * cosH;
  if (!(cosZ > 0)) return null;
  return [(PMath.sin(h) * ctx.cosLat) / cosZ, (ctx.sinLat * cosDec - ctx.cosLat * sinDec * cosH) / cosZ];
}

/** The guided centre's own refraction displacement in the mask frame (arcsec) at hour angle haH; null below the horizon. */
function centreLift(ctx: MaskRefractionContext, haH: number): { xArcsec: number; yArcsec: number } | null {
  const u = liftPerUnitRefractivity(ctx, haH * 15, ctx.centreSinDec, ctx.centreCosDec);
  if (!u) return null;
  return skyToMaskTurned(ctx.kArcsec.guide * u[0], ctx.kArcsec.guide * u[1], ctx.turn);
}

/** Image displacement (mask frame, arcsec) of a slit's target at refraction constant k, relative to the guided centre. */
function slitLift(g: SlitGeometry, u: [number, number], k: number, c: { xArcsec: number; yArcsec: number }) {
  const e = k * u[0], n = k * u[1];
  return { xArcsec: g.jxe * e + g.jxn * n - c.xArcsec, yArcsec: g.jye * e + g.jyn * n - c.yArcsec };
}

/** Zenith distance (deg) and parallactic angle (deg) of the mask centre at hour angle haH. */
function centreAngles(input: MaskRefractionInput, haH: number) {
  return {
    zenithDeg: 90 - altitudeDeg(haH * 15, input.mask.decDeg, input.latDeg),
    qDeg: parallacticAngleDeg(haH * 15, input.mask.decDeg, input.latDeg),
  };
}

/**
 * Prepare a mask for evaluation at many hour angles (sky slits, which have no target, are left out). The map from a
 * small displacement at each target to the mask frame (gnomonic projection about the true mask centre, then the PA
 * rotation) is taken once by central differences of the sky/ projection functions; displacements of a minute of arc
 * are mapped to better than 1e-4 arcsec this way.
 */
export function maskRefractionContext(input: MaskRefractionInput): MaskRefractionContext {
  const s = input.settings;
  const k = (l: number) => ARCSEC_PER_RAD * edlenRefractivity(l, input.air);
  const ctx: MaskRefractionContext = {
    input,
    kArcsec: { guide: k(s.guideWavelengthA), design: k(s.designWavelengthA ?? s.guideWavelengthA), blue: k(s.scienceRangeA[0]), red: k(s.scienceRangeA[1]) },
    sinLat: PMath.sin(input.latDeg * RAD_PER_DEG), cosLat: PMath.cos(input.latDeg * RAD_PER_DEG),
    centreSinDec: PMath.sin(input.mask.decDeg * RAD_PER_DEG), centreCosDec: PMath.cos(input.mask.decDeg * RAD_PER_DEG),
    turn: maskTurn(input.mask.paDeg),
    slits: [], imagesByHour: new Map(),
  };
  const maskCentre = tangentCentre(input.mask.raDeg, input.mask.decDeg);
  const toMask = (p: { raDeg: number; decDeg: number }) => {
    const t = skyToTangentArcsec(maskCentre, p.raDeg, p.decDeg)!;
    return skyToMaskTurned(t.xiArcsec, t.etaArcsec, ctx.turn);
  };
  const eps = 1;
  const c0 = designCentreLift(ctx, input.designHourAngleH);
  for (const slit of input.slits) {
    if (slit.role === 'sky') continue;
    const at = tangentCentre(slit.raDeg, slit.decDeg);
    const pe = toMask(tangentToSkyDeg(at, eps, 0)), me = toMask(tangentToSkyDeg(at, -eps, 0));
    const pn = toMask(tangentToSkyDeg(at, 0, eps)), mn = toMask(tangentToSkyDeg(at, 0, -eps));
    const windowRole = WINDOW_ROLES.includes(slit.role);
    const g: SlitGeometry = {
      slit, widthArcsec: slit.widthArcsec, windowRole,
      centredTransmission: centredSlitTransmission(slit.widthArcsec, s.seeingFwhmArcsec),
      offsetLimitArcsec: windowRole ? offsetAtLoss(slit.widthArcsec, s.seeingFwhmArcsec, s.maxLossFraction) : Infinity,
      dRaDeg: slit.raDeg - input.mask.raDeg,
      // The slit's own projection centre holds its Dec's sine and cosine (the same expressions).
      sinDec: at.sinDec0, cosDec: at.cosDec0,
      jxe: (pe.xArcsec - me.xArcsec) / (2 * eps), jxn: (pn.xArcsec - mn.xArcsec) / (2 * eps),
      jye: (pe.yArcsec - me.yArcsec) / (2 * eps), jyn: (pn.yArcsec - mn.yArcsec) / (2 * eps),
      design: { xArcsec: 0, yArcsec: 0 },
    };
    g.design = designImage(ctx, g, input.designHourAngleH, c0);
    ctx.slits.push(g);
  }
  return ctx;
}

/** The guided centre's lift at the design hour angle designH (zero when the centre is below the horizon then). */
function designCentreLift(ctx: MaskRefractionContext, designH: number): { xArcsec: number; yArcsec: number } {
  return centreLift(ctx, designH) ?? { xArcsec: 0, yArcsec: 0 };
}

/** Where a slit is cut for design hour angle designH: its target's design-wavelength image (mask frame) relative to the guided centre's lift c0; zero below the horizon. */
function designImage(ctx: MaskRefractionContext, g: SlitGeometry, designH: number, c0: { xArcsec: number; yArcsec: number }): { xArcsec: number; yArcsec: number } {
  const u = liftPerUnitRefractivity(ctx, designH * 15 - g.dRaDeg, g.sinDec, g.cosDec);
  return u ? slitLift(g, u, ctx.kArcsec.design, c0) : { xArcsec: 0, yArcsec: 0 };
}

/**
 * The context of the same mask, slits, site and settings designed for hour angle designH: the slit geometry of ctx
 * reused, only the design positions made anew (the same bits as maskRefractionContext with that design hour angle).
 */
export function contextForDesignHourAngle(ctx: MaskRefractionContext, designH: number): MaskRefractionContext {
  if (Object.is(designH, ctx.input.designHourAngleH)) return ctx;
  const out: MaskRefractionContext = { ...ctx, input: { ...ctx.input, designHourAngleH: designH }, slits: [] };
  const c0 = designCentreLift(out, designH);
  for (const g of ctx.slits) out.slits.push({ ...g, design: designImage(out, g, designH, c0) });
  return out;
}

/** Every slit's (a), (b) and (c) at mask-centre hour angle haH (empty when the mask centre is below the horizon). */
export function slitsAtHourAngle(ctx: MaskRefractionContext, haH: number): SlitRefraction[] {
  const { seeingFwhmArcsec } = ctx.input.settings;
  const c = centreLift(ctx, haH);
  if (!c) return [];
  const out: SlitRefraction[] = [];
  for (const g of ctx.slits) {
    const u = liftPerUnitRefractivity(ctx, haH * 15 - g.dRaDeg, g.sinDec, g.cosDec);
    if (!u) continue;
    const guide = slitLift(g, u, ctx.kArcsec.guide, c);
    const blue = slitLift(g, u, ctx.kArcsec.blue, c);
    const red = slitLift(g, u, ctx.kArcsec.red, c);
    const totalBlue = blue.xArcsec - g.design.xArcsec, totalRed = red.xArcsec - g.design.xArcsec;
    const worst = Math.abs(totalBlue) >= Math.abs(totalRed) ? totalBlue : totalRed;
    const transmission = slitTransmission(worst, g.widthArcsec, seeingFwhmArcsec);
    out.push({
      slitId: g.slit.slitId,
      objectId: g.slit.objectId,
      role: g.slit.role,
      dispersionAcrossArcsec: [blue.xArcsec - guide.xArcsec, red.xArcsec - guide.xArcsec],
      fieldShiftAcrossArcsec: guide.xArcsec - g.design.xArcsec,
      fieldShiftAlongArcsec: guide.yArcsec - g.design.yArcsec,
      totalAcrossArcsec: [totalBlue, totalRed],
      lossFraction: lossRelativeToCentred(transmission, g.centredTransmission),
      transmission,
    });
  }
  return out;
}

/**
 * Mask x (arcsec) of a slit target's image at hour angle haH relative to the guided centre, written into out as
 * [guide wavelength, blue end, red end], given the centre's lift c; false (out untouched) when the target is below
 * the horizon. The same arithmetic as slitLift in slitsAtHourAngle, without building a row per slit.
 */
function acrossAt(ctx: MaskRefractionContext, g: SlitGeometry, haH: number, c: { xArcsec: number; yArcsec: number }, out: Float64Array): boolean {
  const u = liftPerUnitRefractivity(ctx, haH * 15 - g.dRaDeg, g.sinDec, g.cosDec);
  if (!u) return false;
  const k = ctx.kArcsec;
  // slitLift's x component at the guide, blue and red refraction constants.
  out[0] = g.jxe * (k.guide * u[0]) + g.jxn * (k.guide * u[1]) - c.xArcsec;
  out[1] = g.jxe * (k.blue * u[0]) + g.jxn * (k.blue * u[1]) - c.xArcsec;
  out[2] = g.jxe * (k.red * u[0]) + g.jxn * (k.red * u[1]) - c.xArcsec;
  return true;
}

/**
 * Mask x (arcsec) of every window-role slit's image at mask-centre hour angle haH, relative to the guided centre, at
 * the blue and red ends of the science range: [blue_0, red_0, blue_1, red_1, ...] in the order of ctx.slits' window
 * slits, NaN for a target below the horizon; null when the mask centre is. maskRowAt's arithmetic, for the fast choice
 * of a design hour angle (observe/designHourAngle.ts), which compares these with windowDesignAcross.
 */
export function windowAcrossAt(ctx: MaskRefractionContext, haH: number): Float64Array | null {
  const images = windowImagesAt(ctx, haH);
  if (!images) return null;
  const out = new Float64Array((2 * images.length) / 3);
  for (let i = 0; 3 * i < images.length; i++) {
    out[2 * i] = images[3 * i + 1];
    out[2 * i + 1] = images[3 * i + 2];
  }
  return out;
}

/**
 * acrossAt of every window-role slit at mask-centre hour angle haH, in the order of ctx.slits' window slits:
 * [guide_0, blue_0, red_0, guide_1, ...], NaN for a target below the horizon; null when the mask centre is. Computed
 * once per hour angle for every context of the slit geometry (maskRowAt and the design hour angle's scorer share it).
 */
function windowImagesAt(ctx: MaskRefractionContext, haH: number): Float64Array | null {
  const known = ctx.imagesByHour.get(haH);
  if (known !== undefined) return known;
  const c = centreLift(ctx, haH);
  let out: Float64Array | null = null;
  if (c) {
    let n = 0;
    for (const g of ctx.slits) if (g.windowRole) n++;
    out = new Float64Array(3 * n);
    const x = new Float64Array(3);
    let i = 0;
    for (const g of ctx.slits) {
      if (!g.windowRole) continue;
      const ok = acrossAt(ctx, g, haH, c, x);
      out[3 * i] = ok ? x[0] : NaN;
      out[3 * i + 1] = ok ? x[1] : NaN;
      out[3 * i + 2] = ok ? x[2] : NaN;
      i++;
    }
  }
  ctx.imagesByHour.set(haH, out);
  return out;
}

/**
 * Mask x (arcsec) where every window-role slit is cut when the mask is designed for hour angle designH (the design
 * wavelength's image relative to the guided centre, as maskRefractionContext sets it), and each such slit's offset
 * limit (arcsec, SlitGeometry.offsetLimitArcsec).
 */
export function windowDesignAcross(ctx: MaskRefractionContext, designH: number): { xArcsec: Float64Array; offsetLimitArcsec: Float64Array } {
  // The context's own design hour angle: its slits already hold these positions (the same computation).
  const own = Object.is(designH, ctx.input.designHourAngleH);
  const c0 = own ? null : designCentreLift(ctx, designH);
  const win = ctx.slits.filter((g) => g.windowRole);
  const xArcsec = new Float64Array(win.length), offsetLimitArcsec = new Float64Array(win.length);
  win.forEach((g, i) => {
    xArcsec[i] = c0 ? designImage(ctx, g, designH, c0).xArcsec : g.design.xArcsec;
    offsetLimitArcsec[i] = g.offsetLimitArcsec;
  });
  return { xArcsec, offsetLimitArcsec };
}

/** The summary row of the mask at hour angle haH (window-role slits only; no per-slit rows are built). */
export function maskRowAt(ctx: MaskRefractionContext, haH: number, stopAtFirstFailure = false): MaskHourAngleRow {
  const { input } = ctx;
  const c = centreAngles(input, haH);
  const alt = 90 - c.zenithDeg;
  const airmass = alt > 0 ? hardieAirmass(c.zenithDeg) : null;
  const row: MaskHourAngleRow = {
    hourAngleH: haH, altitudeDeg: alt, airmass, parallacticAngleDeg: c.qDeg,
    maxDispersionAcrossArcsec: null, maxFieldShiftAcrossArcsec: null, maxLossFraction: null,
    worstSlitId: null, slitsOverLimit: 0, passes: false,
  };
  if (airmass === null) return row;
  let maxD = 0, maxS = 0, maxL = 0;
  // Every slit's images from the shared ones when known or when every slit is looked at anyway; a row that stops at
  // its first failing slit computes them slit by slit.
  const images = !stopAtFirstFailure || ctx.imagesByHour.has(haH) ? windowImagesAt(ctx, haH) : undefined;
  const lift = images === undefined ? centreLift(ctx, haH) : images;
  const { seeingFwhmArcsec, maxLossFraction } = input.settings;
  const x = new Float64Array(3);
  if (lift && !(stopAtFirstFailure && airmass > input.settings.maxAirmass)) {
    // The loss grows with |offset|: per slit width, only the largest offset's loss is computed (the error function is
    // the costly part), and the count over the limit compares offsets with the width's offset at the loss limit.
    const widest = new Map<number, { offset: number; g: SlitGeometry }>();
    let k = -1;
    for (const g of ctx.slits) {
      if (!g.windowRole) continue;
      k++;
      if (images) {
        if (Number.isNaN(images[3 * k])) continue;
        x[0] = images[3 * k]; x[1] = images[3 * k + 1]; x[2] = images[3 * k + 2];
      } else if (!acrossAt(ctx, g, haH, lift as { xArcsec: number; yArcsec: number }, x)) continue;
      const totalBlue = x[1] - g.design.xArcsec, totalRed = x[2] - g.design.xArcsec;
      const worst = Math.max(Math.abs(totalBlue), Math.abs(totalRed));
      maxD = Math.max(maxD, Math.abs(x[1] - x[0]), Math.abs(x[2] - x[0]));
      maxS = Math.max(maxS, Math.abs(x[0] - g.design.xArcsec));
      const w = widest.get(g.widthArcsec);
      if (!w) widest.set(g.widthArcsec, { offset: worst, g });
      else if (worst >= w.offset) { w.offset = worst; w.g = g; }
      if (worst >= g.offsetLimitArcsec) {
        row.slitsOverLimit++;
        if (stopAtFirstFailure) break;
      }
    }
    for (const { offset, g } of widest.values()) {
      const loss = lossRelativeToCentred(slitTransmission(offset, g.widthArcsec, seeingFwhmArcsec), g.centredTransmission);
      if (loss >= maxL) { maxL = loss; row.worstSlitId = g.slit.slitId; }
    }
  }
  row.maxDispersionAcrossArcsec = maxD;
  row.maxFieldShiftAcrossArcsec = maxS;
  row.maxLossFraction = maxL;
  row.passes = airmass <= input.settings.maxAirmass && row.slitsOverLimit === 0;
  return row;
}

/** Hour angles of the grid: from range start to end by step, end included (hours). */
export function hourAngleGridH(rangeH: [number, number], stepH: number): number[] {
  const n = Math.floor((rangeH[1] - rangeH[0]) / stepH + 1e-9);
  const out: number[] = [];
  for (let i = 0; i <= n; i++) out.push(Math.round((rangeH[0] + i * stepH) * 1e9) / 1e9);
  if (rangeH[1] - out[out.length - 1] > 1e-9) out.push(rangeH[1]);
  return out;
}

/** Per-mask report: rows over the hour-angle grid and the recommended window (ends refined by bisection). */
export function maskRefractionReport(input: MaskRefractionInput): MaskRefractionReport {
  return maskRefractionReportOf(maskRefractionContext(input));
}

/** maskRefractionReport of a prepared context (its input's design hour angle), e.g. one from contextForDesignHourAngle. */
export function maskRefractionReportOf(ctx: MaskRefractionContext): MaskRefractionReport {
  const { input } = ctx;
  const grid = hourAngleGridH(input.settings.hourAngleRangeH, input.settings.hourAngleStepH);
  const rows = grid.map((h) => maskRowAt(ctx, h));
  const passes = (h: number) => maskRowAt(ctx, h, true).passes;
  const refine = (fail: number, pass: number) => {
    for (let i = 0; i < 12; i++) {
      const mid = (fail + pass) / 2;
      if (passes(mid)) pass = mid; else fail = mid;
    }
    return pass;
  };
  const segments: [number, number][] = [];
  for (let i = 0; i < rows.length; i++) {
    if (!rows[i].passes) continue;
    let j = i;
    while (j + 1 < rows.length && rows[j + 1].passes) j++;
    const start = i > 0 ? refine(grid[i - 1], grid[i]) : grid[i];
    const end = j + 1 < rows.length ? refine(grid[j + 1], grid[j]) : grid[j];
    segments.push([start, end]);
    i = j;
  }
  const d = input.designHourAngleH;
  const containing = passes(d) ? segments.find(([a, b]) => a - 1e-9 <= d && d <= b + 1e-9) : undefined;
  const longest = segments.reduce<[number, number] | null>((best, s) => (!best || s[1] - s[0] > best[1] - best[0] ? s : best), null);
  const window = containing ?? longest;
  const round = (h: number) => Math.round(h * 1e4) / 1e4;
  const [h0, h1] = input.settings.hourAngleRangeH;
  let windowNote: string | null = null;
  if (!window) {
    if (rows.every((r) => r.airmass === null)) windowNote = 'the mask centre is below the horizon at every hour angle searched';
    else if (rows.every((r) => r.airmass === null || r.airmass > input.settings.maxAirmass)) windowNote = `the mask centre never gets below airmass ${input.settings.maxAirmass}`;
    else windowNote = `no hour angle keeps every tracer slit under ${(input.settings.maxLossFraction * 100).toFixed(0)} % loss`;
  } else if (d < h0 || d > h1) windowNote = 'the design hour angle lies outside the searched range';
  else if (!containing) windowNote = 'the design hour angle itself fails; the longest passing stretch is given';
  else if (window[0] <= h0 || window[1] >= h1) windowNote = 'the window reaches the end of the searched range and may extend beyond it';
  return {
    maskId: input.mask.id,
    paDeg: input.mask.paDeg,
    designHourAngleH: d,
    hourAngleWindowH: window ? [round(window[0]), round(window[1])] : null,
    windowContainsDesign: containing !== undefined,
    windowNote,
    windowSlitCount: ctx.slits.filter((g) => g.windowRole).length,
    rows,
  };
}
