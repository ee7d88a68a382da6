/**
 * Exposure estimates per slit with the CCD equation (Howell, Handbook of CCD Astronomy, 2nd ed. 2006), on the
 * same model as the integrated-starlight slits (spectro/signalToNoise.ts; solver/starlight.ts settings: throughput,
 * sky brightness, detector scales, read noise, dark, wavelength). Per Angstrom of spectrum at the setup's wavelength.
 * Tracers are point sources of their catalog magnitude (made AB by the plan's photometry offset) seen through the
 * slit width in Gaussian seeing and extracted over 2 FWHM along the slit; the galaxy's own light under the tracer
 * adds to the background, and the sky is estimated from the rest of the tracer's slit (Howell's 1 + n_pix/n_B term).
 * Starlight slits take the Sérsic model's flux-mean surface brightness over the whole slit length, their sky
 * estimated from the mask's sky slits. Sky and alignment rows get no estimate.
 */
import type { MaskSolution, Slit } from '../geometry/maskSolution';
import type { GalaxyModel } from '../plan/schema';
import { electronsPerAFromMag, electronsPerAFromSurfaceBrightness, exposureForSignalToNoiseS, signalToNoisePerA, type SlitObservation, type SpectroSetup } from '../spectro/signalToNoise';
import { galaxyOnMask, slitMeanMu } from './starlight';
import { sersicBn } from '../sky/sersic';
import { erf, FWHM_PER_SIGMA, slitTransmission } from '../observe/slitLoss';
import { rememberLast } from '../numeric/rememberLast';

/** Extraction length along the slit for a point source, in units of the seeing FWHM (common practice 1.5-2.5). */
export const POINT_EXTRACTION_FWHM = 2;

export interface ExposureModel {
  setup: SpectroSetup;
  skyMagPerArcsec2: number;
  seeingFwhmArcsec: number;
  exposureTimeS: number;
  targetSnPerA: number;
  /** Added to catalog magnitudes and the galaxy's surface brightness to make them AB (plan/photometry.ts; default 0). */
  catalogToAbMag?: number;
}

/**
 * The exposure model of a plan's settings: the starlight section's spectrograph setup, dark sky (AB mag/arcsec^2) and
 * catalog-to-AB offset, with the observing section's seeing, exposure time and target S/N; `skyMagPerArcsec2` replaces
 * the dark sky (e.g. brightened by the Moon). One place for the observing report, the forecast and the tracer values.
 */
export function exposureModelOf(
  starlight: { setup: SpectroSetup; skyMagPerArcsec2: number; catalogToAbMag: number },
  settings: { seeingFwhmArcsec: number; exposureTimeS: number; targetSnPerA: number },
  skyMagPerArcsec2 = starlight.skyMagPerArcsec2,
): ExposureModel {
  return {
    setup: starlight.setup, skyMagPerArcsec2, seeingFwhmArcsec: settings.seeingFwhmArcsec,
    exposureTimeS: settings.exposureTimeS, targetSnPerA: settings.targetSnPerA, catalogToAbMag: starlight.catalogToAbMag,
  };
}

/** Where a slit's sky estimate comes from and what lies under it (optional parts of an estimate). */
export interface SlitBackground {
  /** Length (arcsec) of slit the sky is estimated from; absent: the sky is known without error. */
  skyLengthArcsec?: number;
  /** Galaxy surface brightness under the source, catalog band mag/arcsec^2; absent: none. */
  galaxyMuMagPerArcsec2?: number;
}

export interface SlitExposure {
  slitId: string;
  objectId: string;
  role: 'tracer' | 'starlight';
  mag: number | null;
  muMagPerArcsec2: number | null;
  /** Fraction of a point source's light inside the slit width and the extraction length (tracers). */
  apertureFraction: number | null;
  /** S/N per Angstrom reached in exposureTimeS. */
  snPerA: number;
  /** Exposure in seconds that reaches targetSnPerA (null when there is no signal to reach it with). */
  timeForTargetSnS: number | null;
}

export interface MaskExposureReport {
  maskId: string;
  exposureTimeS: number;
  targetSnPerA: number;
  wavelengthA: number;
  slits: SlitExposure[];
  /** Tracer slits reaching targetSnPerA in exposureTimeS, and the median tracer S/N per A (null without tracers). */
  tracersReachingTarget: number;
  medianTracerSnPerA: number | null;
}

// Every tracer slit of a mask asks the same.
const lastApertureFraction = rememberLast((widthArcsec: number, extractionArcsec: number, seeingFwhmArcsec: number) => {
  const sigmaRoot2 = (seeingFwhmArcsec / FWHM_PER_SIGMA) * Math.SQRT2;
  return slitTransmission(0, widthArcsec, seeingFwhmArcsec) * erf(extractionArcsec / 2 / sigmaRoot2);
});

/** Fraction of a Gaussian point source (FWHM) through a slit of widthArcsec and inside an extraction of extractionArcsec along it. */
export function pointSourceApertureFraction(widthArcsec: number, extractionArcsec: number, seeingFwhmArcsec: number): number {
  return lastApertureFraction(widthArcsec, extractionArcsec, seeingFwhmArcsec);
}

/** Estimate for one observation: S/N per A in the planned time and the time to the target S/N. */
function estimate(o: SlitObservation, m: ExposureModel) {
  const t = exposureForSignalToNoiseS(o, m.setup, m.targetSnPerA);
  return { snPerA: signalToNoisePerA(o, m.setup, m.exposureTimeS), timeForTargetSnS: Number.isFinite(t) ? t : null };
}

/** Extraction length (arcsec) of a point source along its slit: POINT_EXTRACTION_FWHM seeing FWHM. */
export function pointExtractionArcsec(seeingFwhmArcsec: number): number {
  return POINT_EXTRACTION_FWHM * seeingFwhmArcsec;
}

/** Exposure estimate of a tracer slit (point source of catalog magnitude mag), with its sky estimate and the galaxy under it. */
export function tracerExposure(slit: Pick<Slit, 'slitId' | 'objectId' | 'widthArcsec'>, mag: number, m: ExposureModel, bg: SlitBackground = {}): SlitExposure {
  const extraction = pointExtractionArcsec(m.seeingFwhmArcsec);
  const fraction = pointSourceApertureFraction(slit.widthArcsec, extraction, m.seeingFwhmArcsec);
  const ab = m.catalogToAbMag ?? 0;
  const o: SlitObservation = {
    sourceEPerAPerS: electronsPerAFromMag(mag + ab, m.setup, 1, fraction),
    extractionArcsec: extraction, slitWidthArcsec: slit.widthArcsec, skyMagPerArcsec2: m.skyMagPerArcsec2,
    skyLengthArcsec: bg.skyLengthArcsec,
    galaxyMagPerArcsec2: bg.galaxyMuMagPerArcsec2 === undefined ? undefined : bg.galaxyMuMagPerArcsec2 + ab,
  };
  return { slitId: slit.slitId, objectId: slit.objectId, role: 'tracer', mag, muMagPerArcsec2: null, apertureFraction: fraction, ...estimate(o, m) };
}

/** Exposure estimate of a starlight slit of mean surface brightness mu (catalog band mag/arcsec^2) over its full length. */
export function starlightExposure(slit: Pick<Slit, 'slitId' | 'objectId' | 'widthArcsec' | 'lenBelowArcsec' | 'lenAboveArcsec'>, muMagPerArcsec2: number, m: ExposureModel, bg: SlitBackground = {}): SlitExposure {
  const length = slit.lenBelowArcsec + slit.lenAboveArcsec;
  const o: SlitObservation = {
    sourceEPerAPerS: electronsPerAFromSurfaceBrightness(muMagPerArcsec2 + (m.catalogToAbMag ?? 0), length * slit.widthArcsec, m.setup, 1),
    extractionArcsec: length, slitWidthArcsec: slit.widthArcsec, skyMagPerArcsec2: m.skyMagPerArcsec2,
    skyLengthArcsec: bg.skyLengthArcsec,
  };
  return { slitId: slit.slitId, objectId: slit.objectId, role: 'starlight', mag: null, muMagPerArcsec2, apertureFraction: null, ...estimate(o, m) };
}

/** Exposure estimates of every tracer and starlight slit of a mask (sky and alignment rows are skipped). */
export function maskExposureReport(ms: MaskSolution, galaxy: GalaxyModel, m: ExposureModel, bn = sersicBn(galaxy.sersicN)): MaskExposureReport {
  const g = galaxyOnMask(ms.mask, galaxy, bn);
  const slits: SlitExposure[] = [];
  const extraction = pointExtractionArcsec(m.seeingFwhmArcsec);
  // Starlight slits are filled with galaxy light: their sky comes from the mask's sky slits (none: no sky estimate).
  const skySlitsArcsec = ms.slits.filter((s) => s.role === 'sky').reduce((a, s) => a + s.lenBelowArcsec + s.lenAboveArcsec, 0);
  for (const s of ms.slits) {
    if (s.role === 'tracer' && s.mag !== null) {
      const bg = {
        skyLengthArcsec: Math.max(0, s.lenBelowArcsec + s.lenAboveArcsec - extraction),
        galaxyMuMagPerArcsec2: slitMeanMu(g, s.xArcsec, s.yArcsec - extraction / 2, s.yArcsec + extraction / 2),
      };
      slits.push(tracerExposure(s, s.mag, m, bg));
    } else if (s.role === 'starlight') {
      slits.push(starlightExposure(s, slitMeanMu(g, s.xArcsec, s.yArcsec - s.lenBelowArcsec, s.yArcsec + s.lenAboveArcsec), m, { skyLengthArcsec: skySlitsArcsec }));
    }
  }
  const tracerSn = slits.filter((s) => s.role === 'tracer').map((s) => s.snPerA).sort((a, b) => a - b);
  const median = tracerSn.length === 0 ? null : tracerSn.length % 2 ? tracerSn[(tracerSn.length - 1) / 2] : (tracerSn[tracerSn.length / 2 - 1] + tracerSn[tracerSn.length / 2]) / 2;
  return {
    maskId: ms.mask.id, exposureTimeS: m.exposureTimeS, targetSnPerA: m.targetSnPerA, wavelengthA: m.setup.wavelengthA, slits,
    tracersReachingTarget: tracerSn.filter((v) => v >= m.targetSnPerA).length,
    medianTracerSnPerA: median,
  };
}
