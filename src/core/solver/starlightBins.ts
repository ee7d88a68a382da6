/**
 * Integrated starlight that can be measured: per bin of 1 Re in circularised radius and 45 degrees of azimuth from the
 * major axis (towards +v, not folded), the co-added S/N per Angstrom of every spectrum holding galaxy light there —
 * starlight slits (the galaxy over the whole slit) and, inside the starlight goal radius, the sky parts of tracer slits
 * (the slit less the tracer's extraction). The sky of every such spectrum is estimated from the mask's sky slits
 * (a slit's own other part holds galaxy light too, and subtracting it would remove the signal). Co-adding sums the electrons and the variances of the CCD equation (Howell
 * 2006, with the sky-estimate term); a systematic sky-subtraction error of a fraction f of the co-added sky adds
 * (f N_sky)^2 to the variance, which caps what co-adding can reach at about N_gal / (f N_sky).
 */
import type { MaskSolution } from '../geometry/maskSolution';
import type { GalaxyModel, PlanFile } from '../plan/schema';
import { galaxyOnMask, galaxyRadiusAt, slitMeanMu, starlightSettings, type GalaxyOnMask } from '../solver/starlight';
import { type StarlightRules } from '../plan/starlightSection';
import { ccdTermsPerA, ccdVarianceE2, electronsPerAFromSurfaceBrightness } from '../spectro/signalToNoise';
import { exposureModelOf, pointExtractionArcsec, type ExposureModel } from './exposure';
import { resolveObservingSettings } from '../observe/observingSettings';
import type { ObservingSection } from '../plan/observingSection';
import type { InstrumentProfile } from '../profile/schema';
import { sersicBn, sersicMuMagPerArcsec2 } from '../sky/sersic';
import { PMath } from '../numeric/portableMath';

/** Default systematic sky-subtraction floor: 1 % of the sky (common practice for slit spectra near 8500 A, adjustable). */
export const DEFAULT_SKY_SYSTEMATIC_FRACTION = 0.01;

export interface StarlightBin {
  fromRe: number;
  toRe: number;
  /** Sector start, degrees from the major axis towards +v; the sector is 45 degrees wide. */
  sectorDeg: number;
  starlightSlits: number;
  tracerSkyParts: number;
  /** Co-added S/N per A, with the systematic floor, and without it (photon and detector noise only). */
  snPerA: number;
  snPerAWithoutFloor: number;
  /** Largest R/Re of a spectrum co-added in the bin. */
  reachRe: number;
  /** The S/N per A aimed at (starlight.targetSnPerA). */
  targetSnPerA: number;
  met: boolean;
  /** The most co-adding can reach here with the systematic floor (floorCapSnPerA); null when unbounded (central bin, no floor). */
  floorCapSnPerA: number | null;
}

export interface StarlightBinSettings {
  /** Starlight goal radius in Re (tracer sky parts count inside it). */
  reachRe: number;
  targetSnPerA: number;
  /** Systematic sky-subtraction error as a fraction of the sky (default DEFAULT_SKY_SYSTEMATIC_FRACTION). */
  skySystematicFraction?: number;
}

/** Co-added S/N per A of a list of (signal, variance, sky) electron sums with a systematic sky floor f. */
export function coaddedSignalToNoise(parts: readonly { signalE: number; varianceE2: number; skyE: number }[], skySystematicFraction: number): { sn: number; snWithoutFloor: number } {
  let s = 0, v = 0, sky = 0;
  for (const p of parts) { s += p.signalE; v += p.varianceE2; sky += p.skyE; }
  const floor = skySystematicFraction * sky;
  return { sn: v > 0 ? s / Math.sqrt(v + floor * floor) : 0, snWithoutFloor: v > 0 ? s / Math.sqrt(v) : 0 };
}

/** One spectrum's electrons per A for co-adding: galaxy signal, variance (CCD equation with the sky-estimate term), sky. */
export interface SpectrumPart { signalE: number; varianceE2: number; skyE: number }

/** One spectrum holding galaxy light: its bin (1 Re x 45 deg), radius, kind and electrons. */
export interface BinnedSpectrum { fromRe: number; sectorDeg: number; rRe: number; kind: 'starlight' | 'tracer'; part: SpectrumPart }

/** Bin key of a radius (Re) and an azimuth (degrees from the major axis towards +v): `fromRe:sectorDeg`. */
export function binOf(rRe: number, azimuthDeg: number): { fromRe: number; sectorDeg: number; key: string } {
  const fromRe = Math.floor(rRe), sectorDeg = 45 * Math.floor((((azimuthDeg % 360) + 360) % 360) / 45);
  return { fromRe, sectorDeg, key: `${fromRe}:${sectorDeg}` };
}

/**
 * Electrons per A of a spectrum of galaxy light of mean surface brightness muAb (AB mag/arcsec^2) over `lengthArcsec`
 * x `widthArcsec`, its sky estimated from `skyLengthArcsec` of sky slit (Howell's 1 + n_pix/n_B); null without a sky estimate.
 */
export function spectrumPart(muAbMagPerArcsec2: number, lengthArcsec: number, widthArcsec: number, skyLengthArcsec: number, m: ExposureModel): SpectrumPart | null {
  const terms = ccdTermsPerA({ sourceEPerAPerS: electronsPerAFromSurfaceBrightness(muAbMagPerArcsec2, lengthArcsec * widthArcsec, m.setup, 1), extractionArcsec: lengthArcsec, slitWidthArcsec: widthArcsec, skyMagPerArcsec2: m.skyMagPerArcsec2, skyLengthArcsec }, m.setup, m.exposureTimeS);
  const varianceE2 = ccdVarianceE2(terms);
  if (!Number.isFinite(varianceE2)) return null;
  return { signalE: terms.sourceE, varianceE2, skyE: terms.nPix * terms.skyEPerPixel };
}

/** Total length (arcsec) of a mask's sky slits: where its starlight spectra's sky is estimated from. */
export function skySlitLengthArcsec(ms: MaskSolution): number {
  return ms.slits.filter((s) => s.role === 'sky').reduce((a, s) => a + s.lenBelowArcsec + s.lenAboveArcsec, 0);
}

/**
 * Every spectrum of one mask holding galaxy light (see the module comment): its starlight slits and, inside `reachRe`,
 * the two sky parts of each tracer slit beside the tracer's extraction. None when the mask has no sky slit.
 */
export function maskSpectra(ms: MaskSolution, g: GalaxyOnMask, m: ExposureModel, reachRe: number): BinnedSpectrum[] {
  const out: BinnedSpectrum[] = [];
  const ab = m.catalogToAbMag ?? 0, re = g.galaxy.reArcsec;
  const skyLengthArcsec = skySlitLengthArcsec(ms);
  const extraction = pointExtractionArcsec(m.seeingFwhmArcsec);
  const add = (x: number, y0: number, y1: number, width: number, kind: 'starlight' | 'tracer') => {
    const len = y1 - y0;
    if (!(len > 0)) return;
    const { rArcsec, azimuthDeg } = galaxyRadiusAt(g, x, 0.5 * (y0 + y1));
    const rRe = rArcsec / re;
    if (kind === 'tracer' && rRe > reachRe) return;
    const part = spectrumPart(slitMeanMu(g, x, y0, y1) + ab, len, width, skyLengthArcsec, m);
    if (!part) return;
    const b = binOf(rRe, azimuthDeg);
    out.push({ fromRe: b.fromRe, sectorDeg: b.sectorDeg, rRe, kind, part });
  };
  for (const s of ms.slits) {
    if (s.role === 'starlight') add(s.xArcsec, s.yArcsec - s.lenBelowArcsec, s.yArcsec + s.lenAboveArcsec, s.widthArcsec, 'starlight');
    else if (s.role === 'tracer') {
      // Both sky parts of the tracer slit, beside its extraction.
      const lo = s.yArcsec - s.lenBelowArcsec, hi = s.yArcsec + s.lenAboveArcsec, e0 = s.yArcsec - extraction / 2, e1 = s.yArcsec + extraction / 2;
      add(s.xArcsec, lo, Math.max(lo, e0), s.widthArcsec, 'tracer');
      add(s.xArcsec, Math.min(hi, e1), hi, s.widthArcsec, 'tracer');
    }
  }
  return out;
}

/**
 * Largest co-added S/N per A any number of spectra in a bin starting at fromRe can reach with the floor f: the galaxy
 * over the sky at the bin's brightest point (its inner radius; signal and sky fill the same pixels), divided by f.
 * Infinity for the central bin or f = 0.
 */
export function floorCapSnPerA(fromRe: number, galaxy: GalaxyModel, m: ExposureModel, f: number, bn = sersicBn(galaxy.sersicN)): number {
  if (fromRe <= 0 || f <= 0) return Infinity;
  const muAb = sersicMuMagPerArcsec2(fromRe * galaxy.reArcsec, galaxy.reArcsec, galaxy.sersicN, galaxy.muE, bn) + (m.catalogToAbMag ?? 0);
  return PMath.pow(10, -0.4 * (muAb - m.skyMagPerArcsec2)) / f;
}

/**
 * Bins (1 Re x 45 deg) holding galaxy light in any spectrum, with their co-added S/N per A; ordered by radius then
 * sector. `model` may differ per mask (several spectrographs).
 */
export function starlightBins(masks: readonly MaskSolution[], galaxy: GalaxyModel, model: ExposureModel | ((ms: MaskSolution) => ExposureModel), b: StarlightBinSettings, bn = sersicBn(galaxy.sersicN)): StarlightBin[] {
  const f = b.skySystematicFraction ?? DEFAULT_SKY_SYSTEMATIC_FRACTION;
  const modelOf = typeof model === 'function' ? model : () => model;
  const bins = new Map<string, { fromRe: number; sectorDeg: number; parts: SpectrumPart[]; starlight: number; tracer: number; reachRe: number }>();
  let capModel: ExposureModel | null = null;
  for (const ms of masks) {
    const m = modelOf(ms);
    capModel ??= m;
    for (const sp of maskSpectra(ms, galaxyOnMask(ms.mask, galaxy, bn), m, b.reachRe)) {
      const key = `${sp.fromRe}:${sp.sectorDeg}`;
      const bin = bins.get(key) ?? { fromRe: sp.fromRe, sectorDeg: sp.sectorDeg, parts: [], starlight: 0, tracer: 0, reachRe: 0 };
      bin.parts.push(sp.part);
      bin.reachRe = Math.max(bin.reachRe, sp.rRe);
      if (sp.kind === 'starlight') bin.starlight++; else bin.tracer++;
      bins.set(key, bin);
    }
  }
  return [...bins.values()]
    .sort((a, c) => a.fromRe - c.fromRe || a.sectorDeg - c.sectorDeg)
    .map((x) => {
      const sn = coaddedSignalToNoise(x.parts, f);
      const cap = capModel ? floorCapSnPerA(x.fromRe, galaxy, capModel, f, bn) : Infinity;
      return {
        fromRe: x.fromRe, toRe: x.fromRe + 1, sectorDeg: x.sectorDeg, starlightSlits: x.starlight, tracerSkyParts: x.tracer, reachRe: x.reachRe,
        snPerA: sn.sn, snPerAWithoutFloor: sn.snWithoutFloor, targetSnPerA: b.targetSnPerA, met: sn.sn >= b.targetSnPerA,
        floorCapSnPerA: Number.isFinite(cap) ? cap : null,
      };
    });
}

/**
 * The exposure model and bin settings a plan's starlight bins are measured with (the same as the observing report's):
 * the starlight section's spectrograph setup and sky (with the plan's Moon), the observing section's seeing and
 * exposure time (falling back to starlight.exposureS), the starlight target S/N and observing.skySystematicFraction.
 */
export function starlightBinModel(plan: PlanFile, profile: InstrumentProfile): { model: ExposureModel; settings: Required<StarlightBinSettings> } {
  const starlight = starlightSettings(plan.starlight as StarlightRules | undefined, profile, plan);
  const observing = plan.observing as ObservingSection | undefined;
  const settings = resolveObservingSettings(observing, profile, { exposureTimeS: starlight.exposureS });
  return {
    model: exposureModelOf(starlight, settings),
    settings: { reachRe: plan.goals.starlightReachRe, targetSnPerA: starlight.targetSnPerA, skySystematicFraction: observing?.skySystematicFraction ?? DEFAULT_SKY_SYSTEMATIC_FRACTION },
  };
}

/** Per-bin starlight of coverage.json (key `starlightBins`): the measure's settings and every bin, S/N to 0.01. */
export interface StarlightBinsFile {
  measure: string;
  targetSnPerA: number;
  skySystematicFraction: number;
  goalRe: number;
  bins: StarlightBin[];
}

/** The co-added bins as written into coverage.json. */
export function starlightBinsForFile(r: { bins: readonly StarlightBin[]; targetSnPerA: number; skySystematicFraction: number; reachRe: number }): StarlightBinsFile {
  const r2 = (v: number) => Math.round(v * 100) / 100;
  return {
    measure: 'co-added S/N per A per bin of 1 Re (circularised) x 45 deg from the major axis towards +v (not folded): starlight slits and, inside the goal radius, the sky parts of tracer slits; CCD equation with the sky-estimate term and a systematic sky-subtraction floor',
    targetSnPerA: r.targetSnPerA, skySystematicFraction: r.skySystematicFraction, goalRe: r.reachRe,
    bins: r.bins.map((b) => ({ ...b, reachRe: Math.round(b.reachRe * 1e4) / 1e4, snPerA: r2(b.snPerA), snPerAWithoutFloor: r2(b.snPerAWithoutFloor), floorCapSnPerA: b.floorCapSnPerA === null ? null : r2(b.floorCapSnPerA) })),
  };
}

/** Plain-text lines for the summary: one line per radial bin, each sector's co-added S/N per A against the target. */
export function starlightBinLines(bins: readonly StarlightBin[], targetSnPerA: number, skySystematicFraction: number): string[] {
  if (bins.length === 0) return [];
  const out = [`Integrated starlight, co-added per 1 Re x 45 deg bin (starlight slits and tracer sky parts; sky floor ${(100 * skySystematicFraction).toFixed(1)} %; target S/N ${targetSnPerA} per A):`];
  const radii = [...new Set(bins.map((x) => x.fromRe))];
  for (const r of radii) {
    const row = bins.filter((x) => x.fromRe === r);
    const met = row.filter((x) => x.met).length;
    const cell = (x: StarlightBin) => `${x.sectorDeg}-${x.sectorDeg + 45} deg S/N ${x.snPerA.toFixed(1)} (${x.starlightSlits} starlight + ${x.tracerSkyParts} tracer-sky spectra${x.floorCapSnPerA !== null && x.floorCapSnPerA < x.targetSnPerA ? `; floor caps it at ${x.floorCapSnPerA.toFixed(1)}` : ''})`;
    out.push(`  ${r}-${r + 1} Re: ${met} of ${row.length} sectors reach it; ${row.map(cell).join(', ')}`);
  }
  return out;
}
