/**
 * Integrated-starlight and sky slits, placed in the y-space the tracer slits and alignment boxes leave free
 * on each mask (mask frame: x along the dispersion, y along the slits, arcsec; tilt 0).
 *
 * Free space is measured between the *minimal* spans of the existing rows (a tracer slit's lengthening is
 * given back), so each new slit keeps the gap rule; neighbours lengthened into that space are trimmed back,
 * never below minLengthArcsec/2 on either side. Each free stretch is cut into slots of `slitLengthArcsec`
 * (or the whole stretch when shorter, down to the profile's minimal length). For each slot the slit's x is
 * chosen on a grid of positions that obey the footprint and the wavelength rule; the galaxy's surface
 * brightness there comes from the Sérsic model and the S/N per A from the CCD equation (spectro/signalToNoise).
 * - starlight: S/N >= targetSnPerA and R/Re <= starlightReachRe + reachMarginRe; chosen greedily to fill new (radial bin of
 *   1 Re, 45-degree sector) cells first, outermost first, up to maxPerMask per mask;
 * - sky: the galaxy at least skyContrastMag fainter than in the faintest starlight slit (solver/skySlitRule.ts); the faintest slots, up to skyPerMask per mask.
 * Both are science slits for the wavelength rule (a sky spectrum must cover the same lines to subtract them).
 * Object ids: `sl-<mask>-NNN` and `sky-<mask>-NNN`, so each appears once over all masks.
 * Surface brightness at a mask point uses the galaxy centre projected into the mask frame and a planar
 * rotation into the galaxy frame. The projection's second-order differences are ignored: measured against the exact
 * projection, 0.06 arcsec on the demo and up to 0.7 arcsec (0.017 Re) for a wide mask far off the galaxy, small
 * against a starlight slit's length; the checkers (check/starlightRecount.ts) place points the same way.
 */
import type { StarlightRules } from '../plan/starlightSection';
import type { InstrumentProfile } from '../profile/schema';
import type { GalaxyModel, PlanFile } from '../plan/schema';
import type { MaskSolution, Slit } from '../geometry/maskSolution';
import { centredRectFits, eligibilityRules, wavelengthOk, type EligibilityRules } from '../profile/eligibility';
import { circularisedRadiusArcsec, galaxyAzimuthDeg, galaxyTurn, maskTurn, skyToMaskTurned, type GalaxyTurn } from '../sky/frames';
import { skyToTangentArcsec, tangentCentre } from '../sky/tangentPlane';
import { sersicBn, sersicMuMagPerArcsec2, sersicRadiusAtMuArcsec } from '../sky/sersic';
import { electronsPerAFromSurfaceBrightness, signalToNoisePerA, type SpectroSetup } from '../spectro/signalToNoise';
import { maskPointToSkyDeg } from './maskTargets';
import { lineWindowSettings, observedWavelengthA } from '../profile/wavelength';
import { PMath } from '../numeric/portableMath';
import { resolvePhotometry } from '../plan/photometry';
import { sectorOf } from './objective';
import { skySlitMuThreshold } from './skySlitRule';
import { parseDecDeg, parseRaDeg } from '../sky/sexagesimal';
import { planSkyMagPerArcsec2 } from '../observe/planSky';
import { orderOf } from '../numeric/orderByValue';
import type { ObservingSection } from '../plan/observingSection';

/** Settings after defaults. */
export interface StarlightSettings {
  exposureS: number;
  /** Sky the S/N is computed against (AB mag/arcsec^2): the dark sky brightened by the plan's Moon (observe/planSky.ts). */
  skyMagPerArcsec2: number;
  /** The dark sky as given (starlight.skyMagPerArcsec2 or its default), AB mag/arcsec^2. */
  darkSkyMagPerArcsec2: number;
  /**
   * Length of sky slit (arcsec) a starlight slit's sky is estimated from while slits are placed: the planned sky slits,
   * skyPerMask x slitLengthArcsec (Howell's 1 + n_pix/n_B term; the co-added bins then use the sky slits really placed).
   * Null when skyPerMask is 0: no sky slit, no estimate, no starlight S/N.
   */
  skyEstimateArcsec: number | null;
  targetSnPerA: number;
  slitLengthArcsec: number;
  /** Longest starlight slit: free slots next to each other are joined up to this length where a longer slit reaches farther. */
  maxSlitLengthArcsec: number;
  maxPerMask: number;
  skyPerMask: number;
  skyContrastMag: number;
  /** Added to a catalog-band magnitude (the galaxy's muE) to make it AB (plan key photometry; plan/photometry.ts). */
  catalogToAbMag: number;
  /** Goal radius (goals.starlightReachRe; 0 turns starlight off) and the outer limit of placement, in Re. */
  reachRe: number;
  maxRe: number;
  setup: SpectroSetup;
}

/** Defaults: 2 h, sky 19.6 AB mag/arcsec^2 (dark sky near 8500 A, common practice order of magnitude), S/N 5 per A. */
export const STARLIGHT_DEFAULTS = { exposureS: 7200, skyMagPerArcsec2: 19.6, targetSnPerA: 5, throughput: 0.15, maxPerMask: 8, skyPerMask: 2, skyContrastMag: 3 } as const;

/** The plan's sky with its Moon, cached per observing section (the Moon from a date costs a lunar theory evaluation). */
const skyCache = new WeakMap<object, Map<string, number>>();
function planSky(darkSkyMagPerArcsec2: number, profile: InstrumentProfile, plan: Pick<PlanFile, 'galaxy'> & { photometry?: PlanFile['photometry']; observing?: PlanFile['observing'] }): number {
  const obs = plan.observing as ObservingSection | undefined;
  if (!obs || (!obs.moon && obs.date === undefined && !obs.dateRange)) return darkSkyMagPerArcsec2;
  const ra = parseRaDeg(plan.galaxy.ra), dec = parseDecDeg(plan.galaxy.dec);
  if (!ra.ok || !dec.ok) return darkSkyMagPerArcsec2;
  const site = profile.site;
  const key = `${darkSkyMagPerArcsec2}|${ra.value}|${dec.value}|${site.latDeg}|${site.lonDeg}|${site.elevationM}|${JSON.stringify(plan.photometry ?? null)}`;
  let byKey = skyCache.get(obs);
  if (!byKey) skyCache.set(obs, (byKey = new Map()));
  let sky = byKey.get(key);
  if (sky === undefined) byKey.set(key, (sky = planSkyMagPerArcsec2(darkSkyMagPerArcsec2, obs, plan.photometry, site, { raDeg: ra.value, decDeg: dec.value })));
  return sky;
}

/** Resolve the plan's starlight settings against the profile (throughput, detector scales, noise), goals and Moon. */
export function starlightSettings(rules: StarlightRules | undefined, profile: InstrumentProfile, plan: Pick<PlanFile, 'goals' | 'galaxy'> & { photometry?: PlanFile['photometry']; observing?: PlanFile['observing'] }): StarlightSettings {
  const r = rules ?? {};
  const darkSky = r.skyMagPerArcsec2 ?? STARLIGHT_DEFAULTS.skyMagPerArcsec2;
  const skyPerMask = r.skyPerMask ?? STARLIGHT_DEFAULTS.skyPerMask;
  const lines = plan.goals.linesA.map((l) => observedWavelengthA(l, plan.galaxy.vsysKms));
  const det = profile.detector;
  const slitLengthArcsec = Math.max(profile.slits.minLengthArcsec, r.slitLengthArcsec ?? Math.max(3 * profile.slits.minLengthArcsec, 12));
  return {
    exposureS: r.exposureS ?? STARLIGHT_DEFAULTS.exposureS,
    skyMagPerArcsec2: planSky(darkSky, profile, plan),
    darkSkyMagPerArcsec2: darkSky,
    skyEstimateArcsec: skyPerMask > 0 ? skyPerMask * slitLengthArcsec : null,
    targetSnPerA: r.targetSnPerA ?? STARLIGHT_DEFAULTS.targetSnPerA,
    slitLengthArcsec,
    maxSlitLengthArcsec: Math.max(slitLengthArcsec, r.maxSlitLengthArcsec ?? 4 * slitLengthArcsec),
    maxPerMask: r.maxPerMask ?? STARLIGHT_DEFAULTS.maxPerMask,
    skyPerMask,
    skyContrastMag: r.skyContrastMag ?? STARLIGHT_DEFAULTS.skyContrastMag,
    catalogToAbMag: resolvePhotometry(plan.photometry).catalogToAbMag,
    reachRe: plan.goals.starlightReachRe,
    maxRe: plan.goals.starlightReachRe > 0 ? plan.goals.starlightReachRe + (r.reachMarginRe ?? 0.5) : 0,
    setup: {
      apertureM: profile.telescope.apertureM,
      obstructedFraction: r.obstructedFraction ?? 0,
      throughput: r.throughput ?? profile.telescope.throughput ?? STARLIGHT_DEFAULTS.throughput,
      dispersionAPerPixel: det.dispersionAPerPixel,
      yArcsecPerPixel: r.yArcsecPerPixel ?? det.yArcsecPerPixel ?? det.xArcsecPerPixel,
      readNoiseE: r.readNoiseE ?? det.readNoiseE ?? 3,
      darkEPerPixelPerS: r.darkEPerPixelPerS ?? det.darkEPerPixelPerS ?? 0.001,
      wavelengthA: r.wavelengthA ?? lines.reduce((a, b) => a + b, 0) / lines.length,
    },
  };
}

/** A mask's view of the galaxy: its centre in the mask frame and what is needed for R, azimuth and mu. */
export interface GalaxyOnMask {
  gxArcsec: number;
  gyArcsec: number;
  maskPaDeg: number;
  galaxy: GalaxyModel;
  bn: number;
  /** sin/cos of the mask PA and of the galaxy PA (for the rotation mask frame -> sky -> galaxy frame). */
  sinMask: number;
  cosMask: number;
  sinGal: number;
  cosGal: number;
}

/** The galaxy centre in a mask's frame (gnomonic about the mask centre, rotated by the mask PA). */
export function galaxyOnMask(mask: { raDeg: number; decDeg: number; paDeg: number }, galaxy: GalaxyModel, bn = sersicBn(galaxy.sersicN)): GalaxyOnMask {
  const t = skyToTangentArcsec(tangentCentre(mask.raDeg, mask.decDeg), galaxy.raDeg, galaxy.decDeg);
  const turn = maskTurn(mask.paDeg);
  const m = t ? skyToMaskTurned(t.xiArcsec, t.etaArcsec, turn) : { xArcsec: Infinity, yArcsec: Infinity };
  const gal = cachedGalaxyTurn(galaxy);
  return {
    gxArcsec: m.xArcsec, gyArcsec: m.yArcsec, maskPaDeg: mask.paDeg, galaxy, bn,
    sinMask: turn.sinPa, cosMask: turn.cosPa, sinGal: gal.sinPa, cosGal: gal.cosPa,
  };
}

/** The galaxy PA's turn (sky/frames.ts galaxyTurn), cached per galaxy model and PA (the search places thousands of trial masks on one galaxy). */
const galaxyTurnCache = new WeakMap<GalaxyModel, { paDeg: number; turn: GalaxyTurn }>();
function cachedGalaxyTurn(galaxy: GalaxyModel): GalaxyTurn {
  const hit = galaxyTurnCache.get(galaxy);
  if (hit && hit.paDeg === galaxy.paDeg) return hit.turn;
  const turn = galaxyTurn(galaxy.paDeg);
  galaxyTurnCache.set(galaxy, { paDeg: galaxy.paDeg, turn });
  return turn;
}

/** Circularised radius (arcsec) and azimuth from the major axis (degrees) of a mask point (x, y) arcsec. */
export function galaxyRadiusAt(g: GalaxyOnMask, xArcsec: number, yArcsec: number): { rArcsec: number; azimuthDeg: number } {
  const { u, v } = maskOffsetToGalaxy(g, xArcsec, yArcsec);
  return { rArcsec: circularisedRadiusArcsec(u, v, g.galaxy.axisRatio), azimuthDeg: galaxyAzimuthDeg(u, v) };
}

/**
 * Galaxy frame (u, v) of a mask point: the mask-frame offset from the galaxy centre rotated to the sky
 * (maskToSkyArcsec: xi = x cosPA + y sinPA, eta = -x sinPA + y cosPA), then to the galaxy frame (skyToGalaxyArcsec).
 */
function maskOffsetToGalaxy(g: GalaxyOnMask, xArcsec: number, yArcsec: number): { u: number; v: number } {
  const dx = xArcsec - g.gxArcsec, dy = yArcsec - g.gyArcsec;
  const xi = dx * g.cosMask + dy * g.sinMask, eta = -dx * g.sinMask + dy * g.cosMask;
  return { u: xi * g.sinGal + eta * g.cosGal, v: xi * g.cosGal - eta * g.sinGal };
}

/** Circularised radius (arcsec) only, for the inner loops. */
function radiusAt(g: GalaxyOnMask, xArcsec: number, yArcsec: number): number {
  const { u, v } = maskOffsetToGalaxy(g, xArcsec, yArcsec);
  return circularisedRadiusArcsec(u, v, g.galaxy.axisRatio);
}

/** Sérsic surface brightness (mag/arcsec^2) averaged in flux over `samples` points along a slit from y0 to y1 at x. */
export function slitMeanMu(g: GalaxyOnMask, xArcsec: number, y0Arcsec: number, y1Arcsec: number, samples = 5): number {
  // Same as fluxMeanSurfaceBrightness over the samples, without building the list.
  let f = 0;
  for (let i = 0; i < samples; i++) {
    const y = samples === 1 ? 0.5 * (y0Arcsec + y1Arcsec) : y0Arcsec + ((i + 0.5) / samples) * (y1Arcsec - y0Arcsec);
    f += PMath.pow(10, -0.4 * sersicMuMagPerArcsec2(radiusAt(g, xArcsec, y), g.galaxy.reArcsec, g.galaxy.sersicN, g.galaxy.muE, g.bn));
  }
  return -2.5 * PMath.log10(f / samples);
}

/**
 * S/N per A of the galaxy light through a slit of length `lengthArcsec` with mean surface brightness mu (catalog band),
 * its sky estimated from `skyEstimateArcsec` of sky slit (default the planned sky slits, s.skyEstimateArcsec; null: no
 * estimate, S/N 0) against the plan's sky with its Moon.
 */
export function starlightSignalToNoise(muMagPerArcsec2: number, lengthArcsec: number, widthArcsec: number, s: StarlightSettings, skyEstimateArcsec: number | null = s.skyEstimateArcsec): number {
  if (skyEstimateArcsec === null) return 0;
  const perS = electronsPerAFromSurfaceBrightness(muMagPerArcsec2 + s.catalogToAbMag, lengthArcsec * widthArcsec, s.setup, 1);
  return signalToNoisePerA({ sourceEPerAPerS: perS, extractionArcsec: lengthArcsec, slitWidthArcsec: widthArcsec, skyMagPerArcsec2: s.skyMagPerArcsec2, skyLengthArcsec: skyEstimateArcsec }, s.setup, s.exposureS);
}

/** A stretch of y along the slits, arcsec (mask frame). */
export interface Span { lo: number; hi: number }

/** The fields of a row that fix the y-space it occupies. */
export type RowSpan = Pick<Slit, 'role' | 'yArcsec' | 'lenBelowArcsec' | 'lenAboveArcsec' | 'widthArcsec' | 'tiltDeg'>;

/** The minimal y-span of an existing row: alignment boxes whole, slits shortened to minLength/2 each side. */
function coreSpan(slit: RowSpan, minHalf: number): Span {
  const out = new Float64Array(2);
  coreBoundsInto(slit.role, slit.yArcsec, slit.lenBelowArcsec, slit.lenAboveArcsec, slit.widthArcsec, slit.tiltDeg, minHalf, out, 0);
  return { lo: out[0], hi: out[1] };
}

/** coreSpan of a row given by its fields, written as lo, hi (arcsec) into out[2k], out[2k + 1] (no object per row). */
function coreBoundsInto(role: Slit['role'], yArcsec: number, lenBelowArcsec: number, lenAboveArcsec: number, widthArcsec: number, tiltDeg: number, minHalf: number, out: Float64Array, k: number): void {
  if (role === 'alignment') { out[2 * k] = yArcsec - lenBelowArcsec; out[2 * k + 1] = yArcsec + lenAboveArcsec; return; }
  const below = role === 'tracer' ? Math.min(lenBelowArcsec, minHalf) : lenBelowArcsec;
  const above = role === 'tracer' ? Math.min(lenAboveArcsec, minHalf) : lenAboveArcsec;
  const t = Math.abs(tiltDeg) * Math.PI / 180;
  // An untilted slit (nearly every one) takes the sine and cosine of 0 computed once.
  const sinT = t === 0 ? SIN0 : PMath.sin(t), cosT = t === 0 ? COS0 : PMath.cos(t);
  const halfW = (widthArcsec / 2) * sinT;
  out[2 * k] = yArcsec - below * cosT - halfW;
  out[2 * k + 1] = yArcsec + above * cosT + halfW;
}
const SIN0 = PMath.sin(0), COS0 = PMath.cos(0);

/** One possible new slit: a y slot and the chosen x, with its radius, azimuth and S/N. */
export interface SlotChoice {
  y0: number;
  y1: number;
  xArcsec: number;
  rRe: number;
  azimuthDeg: number;
  snPerA: number;
  muMagPerArcsec2: number;
}

/** Safety margin (arcsec) kept beyond the gap so rounding never brings two rows closer than the gap. */
const MARGIN = 1e-6;

/** Free y-slots (arcsec) between the minimal spans of a mask's rows, each at most slotLength long and at least minLength. */
export function freeSlots(slits: readonly RowSpan[], rules: EligibilityRules, gapArcsec: number, slotLengthArcsec: number): Span[] {
  const minHalf = rules.minLengthArcsec / 2;
  const cores = new Float64Array(2 * slits.length);
  slits.forEach((r, k) => coreBoundsInto(r.role, r.yArcsec, r.lenBelowArcsec, r.lenAboveArcsec, r.widthArcsec, r.tiltDeg, minHalf, cores, k));
  return slotsBetweenCores(cores, slits.length, rules, gapArcsec, slotLengthArcsec);
}

/** freeSlots of untilted tracer slits of half-length halfLengthArcsec (arcsec) at yArcsec[k] for k in `rows`, no object per slit. */
export function freeSlotsOfTracers(yArcsec: ArrayLike<number>, rows: readonly number[], halfLengthArcsec: number, widthArcsec: number, rules: EligibilityRules, gapArcsec: number, slotLengthArcsec: number): Span[] {
  const minHalf = rules.minLengthArcsec / 2;
  const cores = new Float64Array(2 * rows.length);
  for (let k = 0; k < rows.length; k++) coreBoundsInto('tracer', yArcsec[rows[k]], halfLengthArcsec, halfLengthArcsec, widthArcsec, 0, minHalf, cores, k);
  return slotsBetweenCores(cores, rows.length, rules, gapArcsec, slotLengthArcsec);
}

/** The slots of freeSlots between n minimal spans given as lo, hi pairs (arcsec) in `cores`, in any order. */
function slotsBetweenCores(cores: Float64Array, n: number, rules: EligibilityRules, gapArcsec: number, slotLengthArcsec: number): Span[] {
  // By lower edge; spans with equal lower edges give the same slots in either order (the stretch between them is empty).
  const order = new Int32Array(n);
  for (let k = 0; k < n; k++) order[k] = k;
  order.sort((a, b) => cores[2 * a] - cores[2 * b] || a - b);
  const slots: Span[] = [];
  let lo = rules.bounds.minY;
  for (let k = 0; k <= n; k++) {
    const hi = k < n ? cores[2 * order[k]] - gapArcsec - MARGIN : rules.bounds.maxY;
    pushStretchSlots(slots, lo, hi, rules, gapArcsec, slotLengthArcsec);
    if (k < n) lo = Math.max(lo, cores[2 * order[k] + 1] + gapArcsec + MARGIN);
  }
  return slots;
}

/** Cut the free stretch [lo, hi] (arcsec) into centred slots of slotLength (or one shorter slot, at least minLength) pushed onto `slots`. */
function pushStretchSlots(slots: Span[], lo: number, hi: number, rules: EligibilityRules, gapArcsec: number, slotLengthArcsec: number): void {
  const len = hi - lo;
  if (len < rules.minLengthArcsec) return;
  const n = Math.max(1, Math.floor((len + gapArcsec) / (slotLengthArcsec + gapArcsec)));
  const each = n === 1 ? Math.min(len, slotLengthArcsec) : slotLengthArcsec;
  // Centre the n slots in the stretch.
  const used = n * each + (n - 1) * (gapArcsec + 2 * MARGIN);
  let y = lo + (len - used) / 2;
  for (let i = 0; i < n; i++) {
    slots.push({ lo: y, hi: y + each });
    y += each + gapArcsec + 2 * MARGIN;
  }
}

/** Candidate x positions (arcsec) for a slot: a grid over the footprint bounds that obey the wavelength rule (fit is checked later). */
const positionCache = new WeakMap<EligibilityRules, Map<number, number[]>>();
export function slotPositions(rules: EligibilityRules, stepArcsec: number): number[] {
  let byStep = positionCache.get(rules);
  if (!byStep) positionCache.set(rules, (byStep = new Map()));
  const cached = byStep.get(stepArcsec);
  if (cached) return cached;
  const hw = rules.widthArcsec / 2;
  const xs: number[] = [];
  for (let x = rules.bounds.minX + hw; x <= rules.bounds.maxX - hw; x += stepArcsec) if (wavelengthOk(rules, x)) xs.push(x);
  byStep.set(stepArcsec, xs);
  return xs;
}

/**
 * Radius (arcsec, circularised) beyond which a slit of this length cannot reach the S/N goal: the Sérsic surface
 * brightness falls with radius and the S/N (CCD equation) rises with the source flux, so every point of a slit
 * beyond it is fainter than a slit that just fails. Found by bisection on the upper side, cached per spectrograph
 * setup, galaxy, goal and slit size (none of which depends on where the mask points); Infinity when no radius fails.
 */
interface LimitEntry { galaxy: GalaxyModel; bn: number; widthArcsec: number; targetSnPerA: number; exposureS: number; skyMagPerArcsec2: number; skyEstimateArcsec: number | null; limitArcsec: number }
const limitCache = new WeakMap<SpectroSetup, Map<number, LimitEntry>>();
/** Step (arcsec) to which a slot's length is rounded up for its S/N limit radius (evaluateSlot). */
const LIMIT_LENGTH_STEP_ARCSEC = 0.25;
function snLimitRadiusArcsec(g: GalaxyOnMask, lengthArcsec: number, widthArcsec: number, s: StarlightSettings): number {
  const gal = g.galaxy;
  let byLength = limitCache.get(s.setup);
  if (!byLength) limitCache.set(s.setup, (byLength = new Map()));
  const e = byLength.get(lengthArcsec);
  if (e && e.galaxy === gal && e.bn === g.bn && e.widthArcsec === widthArcsec && e.targetSnPerA === s.targetSnPerA && e.exposureS === s.exposureS && e.skyMagPerArcsec2 === s.skyMagPerArcsec2 && e.skyEstimateArcsec === s.skyEstimateArcsec) return e.limitArcsec;
  const ok = (rArcsec: number) => starlightSignalToNoise(sersicMuMagPerArcsec2(rArcsec, gal.reArcsec, gal.sersicN, gal.muE, g.bn), lengthArcsec, widthArcsec, s) >= s.targetSnPerA;
  let lo = 0, hi = 1e3 * gal.reArcsec;
  let limit: number;
  if (ok(hi)) limit = Infinity;
  else if (!ok(lo)) limit = 0;
  else {
    for (let i = 0; i < 80 && hi - lo > 1e-9 * hi; i++) { const mid = 0.5 * (lo + hi); if (ok(mid)) lo = mid; else hi = mid; }
    limit = hi;
  }
  if (byLength.size > 1024) byLength.clear();
  byLength.set(lengthArcsec, { galaxy: gal, bn: g.bn, widthArcsec, targetSnPerA: s.targetSnPerA, exposureS: s.exposureS, skyMagPerArcsec2: s.skyMagPerArcsec2, skyEstimateArcsec: s.skyEstimateArcsec, limitArcsec: limit });
  return limit;
}

/**
 * An upper bound of the R/Re of every starlight option evaluateSlot gives on any slot at most
 * max(slitLength, maxSlitLength) long (the slots and joined windows of chooseSlots): its S/N limit radius test, at the
 * longest length (the limit never falls as a slit lengthens), plus half that length's reach, and at most maxRe.
 */
export function starlightRadiusCeilingRe(g: GalaxyOnMask, widthArcsec: number, s: StarlightSettings): number {
  const longest = Math.max(s.slitLengthArcsec, s.maxSlitLengthArcsec) + 1e-9;
  const limit = snLimitRadiusArcsec(g, Math.ceil(longest / LIMIT_LENGTH_STEP_ARCSEC) * LIMIT_LENGTH_STEP_ARCSEC, widthArcsec, s);
  const q = g.galaxy.axisRatio, slope = Math.max(Math.sqrt(q), 1 / Math.sqrt(q));
  // evaluateSlot's own test with a further 0.1 % against the bisection's tolerance.
  return Math.min(s.maxRe, ((limit * 1.001 + 1e-6) * 1.001 + 0.5 * longest * slope) / g.galaxy.reArcsec);
}

/** A position on a slot's line: mask x, circularised radius (Re and arcsec) and galaxy-frame offset (u, v) arcsec. */
interface Spot { x: number; rRe: number; rArcsec: number; u: number; v: number }

/**
 * Evaluate one slot: the outermost position that still reaches the S/N goal within starlightReachRe (starlight),
 * and the outermost position where the galaxy is skyContrastMag fainter than the sky (sky). Positions lie on an
 * x grid of `stepArcsec`; the footprint test (the costly one) is made only for a position that would be chosen.
 */
export function evaluateSlot(g: GalaxyOnMask, rules: EligibilityRules, slot: Span, s: StarlightSettings, samples = 3, stepArcsec = 6): { starlight: SlotChoice | null; options: SlotChoice[]; sky: SlotChoice | null } {
  const xs = slotPositions(rules, stepArcsec);
  const len = slot.hi - slot.lo, yc = 0.5 * (slot.lo + slot.hi), hw = rules.widthArcsec / 2, half = 0.5 * len;
  const re = g.galaxy.reArcsec, n = g.galaxy.sersicN;
  // R >= sqrt(q) x (distance to the galaxy centre) >= sqrt(q) |yc - gy|: slots whose line stays beyond the reach hold no starlight.
  const lineCanReach = s.reachRe > 0 && Math.sqrt(g.galaxy.axisRatio) * Math.abs(yc - g.gyArcsec) <= s.maxRe * re;
  const wantSky = s.skyPerMask > 0;
  // Nothing to choose on a line beyond the reach when no sky slit is wanted (most slots of the search's estimate).
  if (!lineCanReach && !wantSky) return { starlight: null, options: [], sky: null };
  // The centre surface brightness is needed for one-sample starlight and for the sky slot chosen; sky positions
  // are told by radius (skyRadiusTest), the surface brightness computed only where the radius cannot tell.
  const muAt = (rArcsec: number) => sersicMuMagPerArcsec2(rArcsec, re, n, g.galaxy.muE, g.bn);
  const skyMuMin = wantSky ? skySlitMuThreshold(g.galaxy, g.bn, s) : Infinity;
  const skyAt = wantSky ? skyRadiusTest(g, skyMuMin, muAt) : null;
  // Positions with their galaxy-frame offset: the azimuth (an arctangent) is computed only for a position chosen.
  const reachable: Spot[] = [], skyOk: Spot[] = [];
  for (const x of xs) {
    const { u, v } = maskOffsetToGalaxy(g, x, yc);
    const rArcsec = circularisedRadiusArcsec(u, v, g.galaxy.axisRatio);
    const rRe = rArcsec / re;
    if (lineCanReach && rRe <= s.maxRe) reachable.push({ x, rRe, rArcsec, u, v });
    if (skyAt && skyAt(rArcsec)) skyOk.push({ x, rRe, rArcsec, u, v });
  }
  // Outermost first; per radial bin the first position that reaches the S/N goal and fits the footprint. The mean
  // surface brightness, the S/N and the footprint test (the costly parts) are computed only until a bin is settled,
  // which gives the same choices as testing every position first.
  const fits = (p: Spot) => centredRectFits(rules, p.x, yc, hw, half);
  const byR = (a: Spot, b: Spot) => b.rRe - a.rRe || a.x - b.x;
  const choice = (p: Spot, snPerA: number, muMagPerArcsec2: number): SlotChoice => ({ y0: slot.lo, y1: slot.hi, xArcsec: p.x, rRe: p.rRe, azimuthDeg: galaxyAzimuthDeg(p.u, p.v), snPerA, muMagPerArcsec2 });
  const options: SlotChoice[] = [];
  const binsDone = new Set<number>();
  // No point of the slit lies closer to the centre than R - half x (largest gradient of R in the mask frame, 1/sqrt(q)
  // for q <= 1): beyond the S/N limit radius (with a 0.1 % margin against rounding) the slot cannot reach the goal.
  const q = g.galaxy.axisRatio, slope = Math.max(Math.sqrt(q), 1 / Math.sqrt(q));
  // The limit of the slot's length rounded up to a 0.25" step: the S/N at a given surface brightness never falls as
  // the slit lengthens (signal and every noise term grow with it, the sky estimate's n_B fixed), so that limit lies at
  // or beyond this slot's own and prunes only positions this slot's own limit prunes; one bisection serves all the
  // slots of a step.
  const limitArcsec = reachable.length ? snLimitRadiusArcsec(g, Math.ceil(len / LIMIT_LENGTH_STEP_ARCSEC) * LIMIT_LENGTH_STEP_ARCSEC, rules.widthArcsec, s) * 1.001 + 1e-6 : Infinity;
  for (const p of reachable.sort(byR)) {
    const bin = Math.floor(p.rRe);
    if (binsDone.has(bin)) continue;
    if (p.rRe * re - half * slope > limitArcsec) continue;
    const mu = samples === 1 ? muAt(p.rArcsec) : slitMeanMu(g, p.x, slot.lo, slot.hi, samples);
    const sn = starlightSignalToNoise(mu, len, rules.widthArcsec, s);
    if (!(sn >= s.targetSnPerA)) continue;
    if (!fits(p)) continue;
    binsDone.add(bin);
    options.push(choice(p, sn, mu));
  }
  const skySpot = skyOk.sort(byR).find(fits);
  const sky = skySpot ? choice(skySpot, 0, muAt(skySpot.rArcsec)) : undefined;
  return { starlight: options[0] ?? null, options, sky: sky ?? null };
}

/**
 * Whether a position at circularised radius r (arcsec) is faint enough for a sky slit (Sérsic mu(r) >= skyMuMin),
 * the same answer as comparing mu(r) itself: mu grows with r, so a radius clearly (1e-7 relative, far beyond the
 * last-bit differences of the power function) inside or outside the radius where mu reaches skyMuMin settles it
 * without mu; only near that radius, or without one, is mu computed and compared.
 */
function skyRadiusTest(g: GalaxyOnMask, skyMuMin: number, muAt: (rArcsec: number) => number): (rArcsec: number) => boolean {
  const gal = g.galaxy;
  const rMu = sersicRadiusAtMuArcsec(skyMuMin, gal.reArcsec, gal.sersicN, gal.muE, g.bn);
  if (!(rMu > 0 && Number.isFinite(rMu))) return (r) => muAt(r) >= skyMuMin;
  const inner = rMu * (1 - 1e-7), outer = rMu * (1 + 1e-7);
  return (r) => (r <= inner ? false : r >= outer ? true : muAt(r) >= skyMuMin);
}

/** Coverage cell of a starlight slit: radial bin of 1 Re and 45-degree sector from the major axis. */
export const starlightCell = (rRe: number, azimuthDeg: number) => `${Math.floor(rRe)}:${sectorOf(azimuthDeg)}`;

/**
 * Starlight windows of a mask: every free slot, and runs of neighbouring slots of one free stretch joined into one
 * longer slit up to maxSlitLengthArcsec (a longer slit reaches the S/N target farther out). `slots` are the base
 * slot indices a window uses.
 */
export function starlightWindows(slots: readonly Span[], gapArcsec: number, maxLengthArcsec: number): { span: Span; slots: number[] }[] {
  const out: { span: Span; slots: number[] }[] = slots.map((sp, i) => ({ span: sp, slots: [i] }));
  for (let i = 0; i < slots.length; i++) {
    for (let j = i + 1; j < slots.length; j++) {
      // Same stretch: the next slot starts one gap (plus the rounding margins) after the previous one ends.
      if (slots[j].lo - slots[j - 1].hi > gapArcsec + 4 * MARGIN + 1e-9) break;
      if (slots[j].hi - slots[i].lo > maxLengthArcsec + 1e-9) break;
      const run: number[] = [];
      for (let k = i; k <= j; k++) run.push(k);
      out.push({ span: { lo: slots[i].lo, hi: slots[j].hi }, slots: run });
    }
  }
  return out;
}

/**
 * New rows chosen for one mask: starlight slits (new (bin, sector) cells first, then outermost; a joined, longer
 * window is taken where it reaches farther, each extra slot it uses costing 0.25 Re of radius in the ranking), then
 * sky slits (faintest first) in the slots left.
 */
export function chooseSlots(g: GalaxyOnMask, rules: EligibilityRules, slots: readonly Span[], s: StarlightSettings, cellsTaken: Set<string>, samples = 3, stepArcsec = 6, gapArcsec = 0): { starlight: SlotChoice[]; sky: SlotChoice[] } {
  const evals = slots.map((slot) => evaluateSlot(g, rules, slot, s, samples, stepArcsec));
  const windows = s.maxSlitLengthArcsec > s.slitLengthArcsec && s.reachRe > 0 ? starlightWindows(slots, gapArcsec, s.maxSlitLengthArcsec) : slots.map((sp, i) => ({ span: sp, slots: [i] }));
  const noSky = withoutSkySlits(s);
  const options = windows.map((w) => (w.slots.length === 1 ? evals[w.slots[0]].options : evaluateSlot(g, rules, w.span, noSky, samples, stepArcsec).options));
  const used = new Uint8Array(slots.length);
  const starlight: SlotChoice[] = [];
  while (starlight.length < s.maxPerMask) {
    let best = -1, bestScore = -Infinity, bestC: SlotChoice | null = null;
    for (let i = 0; i < windows.length; i++) {
      const w = windows[i];
      let free = true;
      for (const k of w.slots) if (used[k]) { free = false; break; }
      if (!free) continue;
      for (const o of options[i]) {
        const score = (cellsTaken.has(starlightCell(o.rRe, o.azimuthDeg)) ? 0 : 1000) + o.rRe - 0.25 * (w.slots.length - 1);
        if (score > bestScore) { bestScore = score; best = i; bestC = o; }
      }
    }
    if (best < 0 || !bestC) break;
    for (const k of windows[best].slots) used[k] = 1;
    const c: SlotChoice = bestC;
    cellsTaken.add(starlightCell(c.rRe, c.azimuthDeg));
    starlight.push(c);
  }
  if (s.skyPerMask === 0) return { starlight, sky: [] };
  const skyOrder = evals.map((e, i) => ({ e, i })).filter(({ e, i }) => e.sky && !used[i]).sort((a, b) => b.e.sky!.rRe - a.e.sky!.rRe || a.i - b.i);
  const sky = skyOrder.slice(0, s.skyPerMask).map(({ e }) => e.sky!);
  return { starlight, sky };
}

const noSkyCache = new WeakMap<StarlightSettings, StarlightSettings>();
/** The settings with skyPerMask 0 (no sky slit chosen; the S/N's sky estimate unchanged): s itself when it has none, else one copy per settings object. */
export function withoutSkySlits(s: StarlightSettings): StarlightSettings {
  if (s.skyPerMask === 0) return s;
  let t = noSkyCache.get(s);
  if (!t) noSkyCache.set(s, (t = { ...s, skyPerMask: 0 }));
  return t;
}

/** Trim rows lengthened into the new slits' space (never below minLength/2 per side), keeping the gap rule. */
export function trimAround(slits: Slit[], added: readonly SlotChoice[], gapArcsec: number, minHalf: number): Slit[] {
  return slits.map((sl) => {
    if (sl.role === 'alignment') return sl;
    let below = sl.lenBelowArcsec, above = sl.lenAboveArcsec;
    for (const a of added) {
      if (a.y0 >= sl.yArcsec) above = Math.min(above, Math.max(minHalf, a.y0 - gapArcsec - MARGIN - sl.yArcsec));
      else if (a.y1 <= sl.yArcsec) below = Math.min(below, Math.max(minHalf, sl.yArcsec - (a.y1 + gapArcsec + MARGIN)));
    }
    return below === sl.lenBelowArcsec && above === sl.lenAboveArcsec ? sl : { ...sl, lenBelowArcsec: below, lenAboveArcsec: above };
  });
}

export interface StarlightResult {
  masks: MaskSolution[];
  warnings: string[];
}

/** Rows for chosen slots on one mask, ids `sl-<mask>-NNN` / `sky-<mask>-NNN` numbered from firstNumber; y is the slot centre, symmetric halves. */
export function slotRows(mask: MaskSolution['mask'], choices: readonly SlotChoice[], role: 'starlight' | 'sky', widthArcsec: number, firstNumber = 1): Slit[] {
  return choices.map((c, i) => {
    const id = `${role === 'starlight' ? 'sl' : 'sky'}-${mask.id}-${String(i + firstNumber).padStart(3, '0')}`;
    const y = 0.5 * (c.y0 + c.y1), half = 0.5 * (c.y1 - c.y0);
    const sky = maskPointToSkyDeg(mask, c.xArcsec, y);
    return {
      maskId: mask.id, slitId: id, objectId: id, role, raDeg: sky.raDeg, decDeg: sky.decDeg, xArcsec: c.xArcsec, yArcsec: y,
      lenBelowArcsec: half, lenAboveArcsec: half, widthArcsec, tiltDeg: 0, priority: 0, mag: null,
    };
  });
}

/**
 * How the objective values a starlight slit against tracer weight (solver/objective.ts): a starlight slit in a new
 * radial bin is worth aStarlightBin x unitWeight, and raising the starlight reach by dR is worth
 * aStarlightReach x unitWeight x dR / starlightReachRe.
 */
export interface StarlightTrade {
  unitWeight: number;
  aStarlightBin: number;
  aStarlightReach: number;
  /** Worth of a starlight slit in a new 45-degree sector (default 0). */
  aStarlightSector?: number;
}

/** Per-mask working state of the stage. */
interface MaskWork {
  ms: MaskSolution;
  g: GalaxyOnMask;
  base: Slit[];
  starlight: SlotChoice[];
  sky: SlotChoice[];
  displaced: Slit[];
}

/** What the stage needs on every mask: settings, eligibility rules, the Sérsic b_n and the trade (all independent of where a mask points). */
export interface StarlightStage {
  galaxy: GalaxyModel;
  s: StarlightSettings;
  rules: EligibilityRules;
  bn: number;
  gapArcsec: number;
  /** The trade of tracers for starlight slits, or null when it is off (no trade given, displaceTracers false, no starlight). */
  trade: StarlightTrade | null;
}

/** Prepare the stage once for a plan (reused for every mask and, in the editor, for every drag update). */
export function starlightStage(galaxy: GalaxyModel, profile: InstrumentProfile, plan: Pick<PlanFile, 'goals' | 'galaxy' | 'starlight'>, trade?: StarlightTrade): StarlightStage {
  const s = starlightSettings(plan.starlight as StarlightRules | undefined, profile, plan);
  const rules = eligibilityRules(profile, plan.goals.linesA, galaxy.vsysKms, lineWindowSettings(plan.goals));
  const displace = !!trade && (plan.starlight as StarlightRules | undefined)?.displaceTracers !== false && s.reachRe > 0 && s.maxPerMask > 0;
  return { galaxy, s, rules, bn: sersicBn(galaxy.sersicN), gapArcsec: profile.slits.gapArcsec, trade: displace ? trade! : null };
}

/** Coverage the other masks already give: starlight cells (starlightCell), radial bins (floor of R/Re) and the reach (R/Re). */
export interface StarlightTaken {
  cells: ReadonlySet<string>;
  bins: ReadonlySet<number>;
  /** Sectors (0..7, 45 degrees from the major axis) holding a starlight slit. */
  sectors?: ReadonlySet<number>;
  reachRe: number;
}

/** First step on one mask: starlight and sky slits in the free space (cells filled here are added to `cells`). */
function freeSpaceWork(st: StarlightStage, ms: MaskSolution, cells: Set<string>): MaskWork {
  const g = galaxyOnMask(ms.mask, st.galaxy, st.bn);
  const base = ms.slits.filter((r) => r.role === 'tracer' || r.role === 'alignment');
  const slots = freeSlots(base, st.rules, st.gapArcsec, st.s.slitLengthArcsec);
  const { starlight, sky } = chooseSlots(g, st.rules, slots, st.s, cells, 3, 6, st.gapArcsec);
  return { ms, g, base, starlight, sky, displaced: [] };
}

/** Last step on one mask: its rows (neighbours trimmed, new slits added, sorted by y) and its warnings. */
function finishWork(st: StarlightStage, w: MaskWork, warnings: string[]): MaskSolution {
  const { s, rules, gapArcsec: gap } = st;
  if (w.sky.length < s.skyPerMask) warnings.push(`mask ${w.ms.mask.id}: ${w.sky.length} of ${s.skyPerMask} sky slits placed (free space where the galaxy is ${s.skyContrastMag} mag fainter than in the faintest starlight slit is short)`);
  if (w.displaced.length) warnings.push(`mask ${w.ms.mask.id}: ${w.displaced.length} tracer slit(s) (weight ${w.displaced.reduce((a, d) => a + d.priority, 0).toFixed(2)}) gave way to starlight slits that raise the objective more (${w.displaced.map((d) => d.objectId).join(', ')})`);
  const added = [...w.starlight, ...w.sky];
  const kept = trimAround(w.base, added, gap, rules.minLengthArcsec / 2);
  const starlightRows = [...w.starlight].sort((a, b) => a.y0 - b.y0);
  const rows = [...kept, ...slotRows(w.ms.mask, starlightRows, 'starlight', rules.widthArcsec), ...slotRows(w.ms.mask, w.sky, 'sky', rules.widthArcsec)];
  rows.sort((a, b) => a.yArcsec - b.yArcsec);
  return { ...w.ms, slits: rows };
}

/**
 * Add starlight and sky slits to every mask (see the module comment). `reachRe` 0 turns starlight off (sky slits
 * are still placed). First every mask gets slits in its free space (masks in order; cells filled by an earlier mask
 * count as taken, so slits spread over the galaxy). Then, when `trade` is given and `starlight.displaceTracers` is
 * not false, a mask may give up tracer slits for a starlight slit where that raises the objective: the slit's value
 * (a new radial bin, more reach; see StarlightTrade) must exceed the summed weight of the tracers it displaces.
 */
export function placeStarlightAndSky(masks: readonly MaskSolution[], galaxy: GalaxyModel, profile: InstrumentProfile, plan: Pick<PlanFile, 'goals' | 'galaxy' | 'starlight'>, trade?: StarlightTrade): StarlightResult {
  const st = starlightStage(galaxy, profile, plan, trade);
  const cells = new Set<string>();
  const warnings: string[] = [];
  const work = masks.map((ms) => freeSpaceWork(st, ms, cells));
  if (st.trade) {
    const bins = new Set<number>(), sectors = new Set<number>();
    let reach = 0;
    for (const w of work) for (const c of w.starlight) { bins.add(Math.floor(c.rRe)); sectors.add(sectorOf(c.azimuthDeg)); reach = Math.max(reach, c.rRe); }
    for (const w of work) displaceForStarlight(w, st.rules, st.s, st.trade, st.gapArcsec, bins, sectors, () => reach, (r) => (reach = Math.max(reach, r)));
  }
  return { masks: work.map((w) => finishWork(st, w, warnings)), warnings };
}

/**
 * Starlight and sky slits on one mask, by the same steps as placeStarlightAndSky, with the coverage the other
 * masks already give counted as taken (`taken`; nothing taken: exactly placeStarlightAndSky of this mask alone).
 * The editor re-solves a dragged mask with this, reusing one StarlightStage for the whole drag.
 */
export function placeStarlightOnMask(st: StarlightStage, ms: MaskSolution, taken: StarlightTaken = { cells: new Set(), bins: new Set(), reachRe: 0 }): { mask: MaskSolution; warnings: string[] } {
  const cells = new Set(taken.cells);
  const w = freeSpaceWork(st, ms, cells);
  if (st.trade) {
    const bins = new Set(taken.bins), sectors = new Set(taken.sectors ?? []);
    let reach = taken.reachRe;
    for (const c of w.starlight) { bins.add(Math.floor(c.rRe)); sectors.add(sectorOf(c.azimuthDeg)); reach = Math.max(reach, c.rRe); }
    displaceForStarlight(w, st.rules, st.s, st.trade, st.gapArcsec, bins, sectors, () => reach, (r) => (reach = Math.max(reach, r)));
  }
  const warnings: string[] = [];
  return { mask: finishWork(st, w, warnings), warnings };
}

/** The coverage a set of finished masks gives to the starlight stage (their starlight slits' cells, bins and reach). */
export function starlightTaken(st: StarlightStage, masks: readonly MaskSolution[]): StarlightTaken {
  const cells = new Set<string>(), bins = new Set<number>(), sectors = new Set<number>();
  let reachRe = 0;
  for (const ms of masks) {
    const rows = ms.slits.filter((r) => r.role === 'starlight');
    if (!rows.length) continue;
    const g = galaxyOnMask(ms.mask, st.galaxy, st.bn);
    for (const r of rows) {
      const { rArcsec, azimuthDeg } = galaxyRadiusAt(g, r.xArcsec, r.yArcsec);
      const rRe = rArcsec / st.galaxy.reArcsec;
      cells.add(starlightCell(rRe, azimuthDeg));
      bins.add(Math.floor(rRe));
      sectors.add(sectorOf(azimuthDeg));
      reachRe = Math.max(reachRe, rRe);
    }
  }
  return { cells, bins, sectors, reachRe };
}

/**
 * The spans (y, arcsec) that break the gap rule with a window [lo, hi]: near(lo, hi) lists, in the spans' own order,
 * the indices i with neither span.hi + gap + MARGIN <= lo nor span.lo - gap - MARGIN >= hi (the direct test, the
 * same sums). The spans are sorted by their lower edge with a running maximum of the upper edge, so a query looks only
 * at the spans about the window, not at every row of the mask.
 */
export function spanOverlaps(spans: readonly Span[], gapArcsec: number): (lo: number, hi: number) => number[] {
  const n = spans.length;
  const los = new Float64Array(n);
  for (let i = 0; i < n; i++) los[i] = spans[i].lo;
  const order = orderOf(los);
  const loR = new Float64Array(n), hiR = new Float64Array(n), maxHi = new Float64Array(n);
  order.forEach((i, k) => {
    loR[k] = spans[i].lo - gapArcsec - MARGIN;
    hiR[k] = spans[i].hi + gapArcsec + MARGIN;
    maxHi[k] = k ? Math.max(maxHi[k - 1], hiR[k]) : hiR[k];
  });
  return (lo, hi) => {
    // a: the number of spans whose lower reach starts below hi (the lower reaches grow with k).
    let a = 0, b = n;
    while (a < b) { const m = (a + b) >> 1; if (loR[m] < hi) a = m + 1; else b = m; }
    const out: number[] = [];
    for (let k = a - 1; k >= 0 && maxHi[k] > lo; k--) if (hiR[k] > lo) out.push(order[k]);
    return out.sort((x, y) => x - y);
  };
}

/** Greedy trade of tracer slits for starlight slits on one mask (see placeStarlightAndSky). */
function displaceForStarlight(w: MaskWork, rules: EligibilityRules, s: StarlightSettings, trade: StarlightTrade, gap: number, bins: Set<number>, sectors: Set<number>, reachNow: () => number, raiseReach: (r: number) => void): void {
  const minHalf = rules.minLengthArcsec / 2;
  const re = w.g.galaxy.reArcsec, sq = Math.sqrt(w.g.galaxy.axisRatio);
  const aSector = trade.aStarlightSector ?? 0;
  const maxGain = trade.unitWeight * (trade.aStarlightBin + aSector + trade.aStarlightReach);
  // Two window lengths: the full starlight slit, and half of it (enough S/N in the inner parts, fewer tracers displaced).
  const lengths = [...new Set([s.slitLengthArcsec, Math.max(rules.minLengthArcsec, s.slitLengthArcsec / 2)])];
  const windows: Span[] = [];
  for (const L of lengths) {
    const from = Math.max(rules.bounds.minY, w.g.gyArcsec - (s.maxRe * re) / sq - L), to = Math.min(rules.bounds.maxY - L, w.g.gyArcsec + (s.maxRe * re) / sq);
    for (let a = from; a <= to; a += L / 2) windows.push({ lo: a, hi: a + L });
  }
  // Starlight options of each window (the galaxy model does not change while tracers are traded), computed when first needed.
  const options = new Map<number, SlotChoice[]>();
  const noSky = withoutSkySlits(s);
  const nBins = Math.ceil(s.reachRe - 1e-12);
  while (w.starlight.length < s.maxPerMask) {
    // Nothing left to gain once every starlight bin is filled and the goal radius is reached.
    let maxOpenBin = -1;
    for (let b = 0; b < nBins; b++) if (!bins.has(b)) maxOpenBin = b;
    const reachDone = reachNow() >= s.reachRe;
    if (maxOpenBin < 0 && reachDone && (aSector === 0 || sectors.size >= 8)) return;
    const occupied: { r: Slit | null; span: Span }[] = w.base.map((r) => ({ r, span: coreSpan(r, minHalf) }));
    for (const c of w.starlight) occupied.push({ r: null, span: { lo: c.y0, hi: c.y1 } });
    for (const c of w.sky) occupied.push({ r: null, span: { lo: c.y0, hi: c.y1 } });
    let best: { net: number; c: SlotChoice; blockers: Slit[] } | null = null;
    const reach = reachNow();
    const near = spanOverlaps(occupied.map((o) => o.span), gap);
    for (let k = 0; k < windows.length; k++) {
      const { lo, hi } = windows[k];
      const blockers: Slit[] = [];
      let blocked = false, cost = 0;
      for (const i of near(lo, hi)) {
        const o = occupied[i];
        if (!o.r || o.r.role !== 'tracer') { blocked = true; break; }
        blockers.push(o.r);
        cost += o.r.priority;
      }
      if (blocked || !blockers.length || cost >= maxGain) continue;
      // R >= sqrt(q) x (distance along y to the galaxy centre): a window that cannot reach an open bin gains nothing.
      const dy = Math.max(0, lo - w.g.gyArcsec, w.g.gyArcsec - hi);
      if (reachDone && aSector === 0 && (sq * dy) / re >= maxOpenBin + 1) continue;
      let opts = options.get(k);
      if (!opts) options.set(k, (opts = evaluateSlot(w.g, rules, windows[k], noSky, 3, 10).options));
      for (const c of opts) {
        const newSector = aSector > 0 && c.rRe < nBins + 1 && !sectors.has(sectorOf(c.azimuthDeg));
        const gain = trade.unitWeight * ((bins.has(Math.floor(c.rRe)) ? 0 : trade.aStarlightBin) + (newSector ? aSector : 0) + (trade.aStarlightReach * Math.max(0, Math.min(c.rRe, s.reachRe) - Math.min(reach, s.reachRe))) / s.reachRe);
        const net = gain - cost;
        if (net > 1e-9 && (!best || net > best.net)) best = { net, c, blockers };
      }
    }
    if (!best) return;
    const gone = new Set(best.blockers);
    w.base = w.base.filter((r) => !gone.has(r));
    w.displaced.push(...best.blockers);
    w.starlight.push(best.c);
    bins.add(Math.floor(best.c.rRe));
    sectors.add(sectorOf(best.c.azimuthDeg));
    raiseReach(best.c.rRe);
  }
}
