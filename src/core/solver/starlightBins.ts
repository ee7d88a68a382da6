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
import type { GalaxyModel } from '../plan/schema';
import { galaxyOnMask, galaxyRadiusAt, slitMeanMu } from './starlight';
import { ccdTermsPerA, electronsPerAFromSurfaceBrightness, skyEstimateFactor } from '../spectro/signalToNoise';
import { pointExtractionArcsec, type ExposureModel } from './exposure';
import { sersicBn } from '../sky/sersic';

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
  met: boolean;
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

/** Bins (1 Re x 45 deg) holding galaxy light in any spectrum, with their co-added S/N per A; ordered by radius then sector. */
export function starlightBins(masks: readonly MaskSolution[], galaxy: GalaxyModel, m: ExposureModel, b: StarlightBinSettings, bn = sersicBn(galaxy.sersicN)): StarlightBin[] {
  const f = b.skySystematicFraction ?? DEFAULT_SKY_SYSTEMATIC_FRACTION;
  const ab = m.catalogToAbMag ?? 0, t = m.exposureTimeS;
  const bins = new Map<string, { fromRe: number; sectorDeg: number; parts: { signalE: number; varianceE2: number; skyE: number }[]; starlight: number; tracer: number }>();
  const extraction = pointExtractionArcsec(m.seeingFwhmArcsec);
  for (const ms of masks) {
    const g = galaxyOnMask(ms.mask, galaxy, bn);
    const skySlitsArcsec = ms.slits.filter((s) => s.role === 'sky').reduce((a, s) => a + s.lenBelowArcsec + s.lenAboveArcsec, 0);
    const add = (x: number, y0: number, y1: number, width: number, kind: 'starlight' | 'tracer') => {
      const skyLengthArcsec = skySlitsArcsec;
      const len = y1 - y0;
      if (!(len > 0)) return;
      const { rArcsec, azimuthDeg } = galaxyRadiusAt(g, x, 0.5 * (y0 + y1));
      const rRe = rArcsec / galaxy.reArcsec;
      if (kind === 'tracer' && rRe > b.reachRe) return;
      const mu = slitMeanMu(g, x, y0, y1) + ab;
      const terms = ccdTermsPerA({ sourceEPerAPerS: electronsPerAFromSurfaceBrightness(mu, len * width, m.setup, 1), extractionArcsec: len, slitWidthArcsec: width, skyMagPerArcsec2: m.skyMagPerArcsec2, skyLengthArcsec }, m.setup, t);
      const k = skyEstimateFactor(terms.nPix, terms.skyPixels);
      if (!Number.isFinite(k)) return;
      const fromRe = Math.floor(rRe), sectorDeg = 45 * Math.floor((((azimuthDeg % 360) + 360) % 360) / 45);
      const key = `${fromRe}:${sectorDeg}`;
      const bin = bins.get(key) ?? { fromRe, sectorDeg, parts: [], starlight: 0, tracer: 0 };
      bin.parts.push({
        signalE: terms.sourceE,
        varianceE2: terms.sourceE + terms.nPix * k * (terms.skyEPerPixel + terms.darkEPerPixel + terms.readNoiseE * terms.readNoiseE),
        skyE: terms.nPix * terms.skyEPerPixel,
      });
      if (kind === 'starlight') bin.starlight++; else bin.tracer++;
      bins.set(key, bin);
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
  }
  return [...bins.values()]
    .sort((a, c) => a.fromRe - c.fromRe || a.sectorDeg - c.sectorDeg)
    .map((x) => {
      const sn = coaddedSignalToNoise(x.parts, f);
      return { fromRe: x.fromRe, toRe: x.fromRe + 1, sectorDeg: x.sectorDeg, starlightSlits: x.starlight, tracerSkyParts: x.tracer, snPerA: sn.sn, snPerAWithoutFloor: sn.snWithoutFloor, met: sn.sn >= b.targetSnPerA };
    });
}

/** Plain-text lines for the summary: one line per radial bin, each sector's co-added S/N per A against the target. */
export function starlightBinLines(bins: readonly StarlightBin[], targetSnPerA: number, skySystematicFraction: number): string[] {
  if (bins.length === 0) return [];
  const out = [`Integrated starlight, co-added per 1 Re x 45 deg bin (starlight slits and tracer sky parts; sky floor ${(100 * skySystematicFraction).toFixed(1)} %; target S/N ${targetSnPerA} per A):`];
  const radii = [...new Set(bins.map((x) => x.fromRe))];
  for (const r of radii) {
    const row = bins.filter((x) => x.fromRe === r);
    const met = row.filter((x) => x.met).length;
    out.push(`  ${r}-${r + 1} Re: ${met} of ${row.length} sectors reach it; ${row.map((x) => `${x.sectorDeg}-${x.sectorDeg + 45} deg S/N ${x.snPerA.toFixed(1)}`).join(', ')}`);
  }
  return out;
}
