/**
 * The science forecast of a solved plan (contract revision 2, `forecast.json`): expected cluster velocities, the
 * 1-sigma errors of the dispersion profile, rotation and tracer mass from Monte Carlo mocks of the plan's own
 * sampling, the starlight bins with their spin-parameter profile, and the telescope time. Radii are circularised
 * (R/Re) and also in kpc at the forecast distance; PAs degrees East of North; velocities km/s.
 */
import type { GalaxyModel, PlanFile } from '../plan/schema';
import { PMath } from '../numeric/portableMath';
import type { InstrumentProfile } from '../profile/schema';
import type { MaskSolution } from '../geometry/maskSolution';
import { resolveForecastSettings, type ForecastSettings } from './settings';
import { slitSamples } from './samples';
import { clusterProbability } from './contamination';
import { instrumentalSigmaA, velocityErrorModel, type LineSampling } from './velocityError';
import { mixedPlanExposures, planMaskHours, siteHours, tracerLineSampling, tracerTargetSn, type TargetSnSource } from './planExposures';
import { modelSigmaKms } from './kinematicModel';
import { angleScatterDeg, binIndex, meanAndStd, runTracerMocks, type MockTracer } from './mocks';
import { kpcPerArcsec } from './tracerMass';
import { spinProfile, starlightBins, type SpinPoint, type StarlightBin } from './starlightBins';
import { fastRotatorThreshold } from './spin';
import { nightsNeeded, nightsOfSites, type MaskHours, type NightsEstimate, type SiteNights } from './hours';

/** The `format` of forecast.json (interface contract, revision 2). */
export const FORECAST_FORMAT = 'haloweave.forecast/1';

/** Relative precision of a standard deviation estimated from N trials: 1/sqrt(2(N - 1)) (normal samples). */
export function trialPrecision(trials: number): number {
  return 1 / Math.sqrt(2 * Math.max(1, trials - 1));
}

/** Fewest trials whose quoted errors are good to `precision` (relative): 1 + ceil(1 / (2 precision^2)). */
export function trialsForPrecision(precision: number): number {
  return 1 + Math.ceil(1 / (2 * precision * precision));
}

/** Default trials: errors good to 5 %. */
export const DEFAULT_TRIALS = trialsForPrecision(0.05);

export interface TracerForecast {
  maskId: string;
  slitId: string;
  objectId: string;
  radiusRe: number;
  paDeg: number;
  snPerA: number;
  /** Expected velocity error, km/s; null when the S/N is below the threshold. */
  velocityErrorKms: number | null;
  clusterProbability: number;
}

export interface DispersionBin {
  fromRe: number;
  toRe: number;
  fromKpc: number;
  toKpc: number;
  /** Expected cluster velocities in the bin (sum of cluster probabilities of the slits that give a velocity). */
  n: number;
  /** Model dispersion of the bin (km/s), its 1-sigma error (km/s and fractional) and the mean fitted bias. */
  sigmaKms: number;
  sigmaErrorKms: number | null;
  sigmaFracError: number | null;
  biasFrac: number | null;
  /** The textbook limit 1/sqrt(2n) for negligible velocity errors, for comparison. */
  idealFracError: number | null;
  /** Mean radius of the bin's expected velocities (Re), where the bin's point is drawn and the slope is fitted. */
  meanRadiusRe: number;
}

/**
 * Logarithmic slope of the dispersion profile, d ln sigma / d ln R, fitted per mock (unweighted least squares over
 * the bins at their mean radii): the model slope, the mean fitted and the 1-sigma error.
 */
export function slopeOfBins(radiiRe: readonly number[], sigmas: ArrayLike<number>): number {
  let n = 0, sx = 0, sy = 0, sxx = 0, sxy = 0;
  for (let i = 0; i < radiiRe.length; i++) {
    if (!(sigmas[i] > 0) || !(radiiRe[i] > 0)) continue;
    const x = PMath.log(radiiRe[i]), y = PMath.log(sigmas[i]);
    n++; sx += x; sy += y; sxx += x * x; sxy += x * y;
  }
  const d = n * sxx - sx * sx;
  return n >= 2 && d > 0 ? (n * sxy - sx * sy) / d : NaN;
}

export interface Forecast {
  format: typeof FORECAST_FORMAT;
  galaxyId: string;
  trials: number;
  seed: number | string;
  /** Relative precision of every quoted error from the number of trials. */
  errorPrecision: number;
  distanceMpc: number;
  kpcPerRe: number;
  settings: ForecastSettings;
  tracerSlits: number;
  /** Tracer slits expected to give a velocity of a cluster (after contamination and S/N). */
  expectedVelocities: number;
  /** Tracer slits above the S/N threshold (cluster or not), and the median error of their velocities. */
  slitsWithVelocity: number;
  medianVelocityErrorKms: number | null;
  dispersionProfile: DispersionBin[];
  dispersionSlope: { slope: number; slopeError: number | null; meanFittedSlope: number | null };
  rotation: {
    amplitudeKms: number; kinematicPaDeg: number; amplitudeErrorKms: number | null; kinematicPaErrorDeg: number | null; meanFittedAmplitudeKms: number | null;
    /** Fraction of mocks whose fitted amplitude exceeds 3 times the amplitude error: the chance to detect the rotation. */
    detectionFraction: number | null;
  };
  mass: {
    estimator: string;
    radiusKpc: number;
    radiusRe: number;
    massMsun: number | null;
    fracError: number | null;
    /** fracError with the distance error added in quadrature (M scales as the distance). */
    fracErrorWithDistance: number | null;
    alpha: number; beta: number; gamma: number;
  };
  starlightBins: StarlightBin[];
  spinProfile: SpinPoint[];
  fastRotatorThresholdLambda: number;
  hours: { perMask: number[]; maskIds: string[]; total: number; masks: MaskHours[]; plannedExposureHours: number; targetSnPerA: number; targetSnSource: TargetSnSource; completeness: number; overheadHoursPerMask: number; nights: NightsEstimate | null;
    /** Plans observed at several sites: hours and nights per site (the sites observe in parallel); null for one site. */
    sites: SiteNights[] | null;
    /** Hours per observing site (one entry for a plan of one site): what a nights estimate needs besides the nights. */
    siteHours: Omit<SiteNights, 'nights'>[] };
  tracers: TracerForecast[];
  notes: string[];
}

export interface ForecastInput {
  plan: PlanFile;
  profile: InstrumentProfile;
  galaxy: GalaxyModel;
  masks: readonly MaskSolution[];
  /** Catalog colours by object id, when the catalog has a colour column. */
  colours?: ReadonlyMap<string, number>;
  /** Observable dark hours per night of the semester (observe/night.ts), with the semester's first and last night. */
  nights?: { rows: readonly { date: string; darkHours: number }[]; from: string; to: string } | null;
  /** Several sites (a plan with spectrographs on different telescopes): each profile id's semester nights at its site. */
  nightsOfProfile?: ReadonlyMap<string, { rows: readonly { date: string; darkHours: number }[]; from: string; to: string }>;
  /** The profile of each mask of a plan with several spectrographs (mask id to profile); masks absent use `profile`. */
  maskProfiles?: ReadonlyMap<string, InstrumentProfile>;
  /** The plan's profile references (ids or file paths, plan key `instruments`) to their profiles, to find each one's own `observing` keys. */
  profilesByRef?: Readonly<Record<string, InstrumentProfile>>;
  trials?: number;
  seed?: number | string;
}

/** Radial bin edges from the settings up to the outermost tracer, merging bins short of minPerBin expected velocities. */
export function dispersionBinEdges(edgesRe: readonly number[], tracers: readonly { radiusRe: number; weight: number }[], minPerBin: number): number[] {
  const maxR = Math.max(0, ...tracers.map((t) => t.radiusRe));
  const edges = [...edgesRe.filter((e) => e < maxR)];
  edges.push(edgesRe.find((e) => e >= maxR) ?? maxR * (1 + 1e-9) + 1e-9);
  const count = (lo: number, hi: number) => tracers.reduce((s, t) => s + (t.radiusRe >= lo && t.radiusRe < hi ? t.weight : 0), 0);
  const out = [edges[0]];
  for (let i = 1; i < edges.length; i++) if (count(out[out.length - 1], edges[i]) >= minPerBin || i === edges.length - 1) out.push(edges[i]);
  // A short last bin joins the one before.
  if (out.length > 2 && count(out[out.length - 2], out[out.length - 1]) < minPerBin) out.splice(out.length - 2, 1);
  return out;
}

/** Forecast of a solved plan (pure; the same seed and trials give the same numbers). */
export function forecastPlan(input: ForecastInput): Forecast {
  const { plan, profile, galaxy } = input;
  const trials = input.trials ?? DEFAULT_TRIALS, seed = input.seed ?? 1;
  const s = resolveForecastSettings(plan.forecast, galaxy, plan.goals.linesA);
  const profileOf = (maskId: string): InstrumentProfile => input.maskProfiles?.get(maskId) ?? profile;
  const known = mixedPlanExposures(plan, galaxy, input.masks, profileOf, input.profilesByRef);
  const { exposures } = known;
  const { tracers, starlight } = slitSamples(galaxy, input.masks, exposures);
  const kpcPerRe = kpcPerArcsec(s.distanceMpc) * galaxy.reArcsec;
  const linesA = plan.goals.linesA, meanLineA = linesA.reduce((a, b) => a + b, 0) / linesA.length;
  const notes: string[] = [];

  // Each mask's slits with their own spectrograph's resolution, sampling and velocity-error relation.
  const errorModels = new Map<InstrumentProfile, (snPerA: number) => number>();
  const errorAt = (maskId: string): ((snPerA: number) => number) => {
    const p = profileOf(maskId);
    let m = errorModels.get(p);
    if (!m) errorModels.set(p, (m = velocityErrorModel(tracerLineSampling(p, s.velocityErrors.intrinsicLineSigmaA, meanLineA), linesA, galaxy.vsysKms, s.velocityErrors)));
    return m;
  };
  const tf: TracerForecast[] = tracers.map((t) => {
    const err = errorAt(t.maskId)(t.snPerA);
    return {
      maskId: t.maskId, slitId: t.slitId, objectId: t.objectId, radiusRe: t.radiusRe, paDeg: t.paDeg, snPerA: t.snPerA,
      velocityErrorKms: Number.isFinite(err) ? err : null,
      clusterProbability: clusterProbability(t.mag, input.colours?.get(t.objectId) ?? null, t.radiusRe, s.distanceMpc, s.contamination, s.kinematics.tracerDensitySlope),
    };
  });
  const usable = tf.filter((t) => t.velocityErrorKms !== null);
  const mockTracers: MockTracer[] = usable.map((t) => ({ radiusRe: t.radiusRe, radiusKpc: t.radiusRe * kpcPerRe, paDeg: t.paDeg, errorKms: t.velocityErrorKms!, clusterProbability: t.clusterProbability }));
  const expected = usable.reduce((a, t) => a + t.clusterProbability, 0);
  const errs = usable.map((t) => t.velocityErrorKms!).sort((a, b) => a - b);

  const edges = dispersionBinEdges(s.radialBinsRe, usable.map((t) => ({ radiusRe: t.radiusRe, weight: t.clusterProbability })), s.minPerBin);
  const fits = mockTracers.length ? runTracerMocks(mockTracers, edges, s, trials, seed) : [];
  const k = s.kinematics;
  const dispersionProfile: DispersionBin[] = [];
  for (let b = 0; b + 1 < edges.length && mockTracers.length; b++) {
    let n = 0, s2 = 0, sr = 0;
    for (const t of mockTracers) {
      if (binIndex(edges, t.radiusRe) !== b) continue;
      n += t.clusterProbability;
      sr += t.clusterProbability * t.radiusRe;
      s2 += t.clusterProbability * modelSigmaKms(t.radiusRe, k) * modelSigmaKms(t.radiusRe, k);
    }
    const sigma = n > 0 ? Math.sqrt(s2 / n) : modelSigmaKms((edges[b] + edges[b + 1]) / 2, k);
    const st = meanAndStd(fits.map((f) => f.binSigmaKms[b]));
    const enough = st.n >= 0.5 * trials && Number.isFinite(st.std);
    dispersionProfile.push({
      fromRe: edges[b], toRe: edges[b + 1], fromKpc: edges[b] * kpcPerRe, toKpc: edges[b + 1] * kpcPerRe, n, sigmaKms: sigma,
      sigmaErrorKms: enough ? st.std : null, sigmaFracError: enough ? st.std / sigma : null, biasFrac: enough ? st.mean / sigma - 1 : null,
      idealFracError: n > 0 ? 1 / Math.sqrt(2 * n) : null, meanRadiusRe: n > 0 ? sr / n : (edges[b] + edges[b + 1]) / 2,
    });
    if (!enough) notes.push(`radial bin ${edges[b]}-${edges[b + 1]} Re has fewer than 3 velocities in most mocks: no dispersion error quoted`);
  }

  const radii = dispersionProfile.map((b) => b.meanRadiusRe);
  const slopes = meanAndStd(fits.map((f) => slopeOfBins(radii, f.binSigmaKms)));
  const amp = meanAndStd(fits.map((f) => f.amplitudeKms));
  const detected = Number.isFinite(amp.std) ? fits.filter((f) => f.amplitudeKms > 3 * amp.std).length / fits.length : null;
  const paErr = angleScatterDeg(fits.map((f) => f.kinematicPaDeg), k.kinematicPaDeg);
  if (k.rotationKms === 0) notes.push('model without rotation: the kinematic PA is undefined and its scatter is that of noise');
  const mass = meanAndStd(fits.map((f) => f.massMsun));
  const rOut = Math.max(0, ...mockTracers.filter((t) => t.clusterProbability > 0).map((t) => t.radiusRe));
  const massFrac = Number.isFinite(mass.std) && mass.mean > 0 ? mass.std / mass.mean : null;
  const distFrac = s.distanceErrorMpc / s.distanceMpc;

  const sampling = (maskId: string): LineSampling => {
    const p = profileOf(maskId);
    return { sigmaLineA: instrumentalSigmaA(p.slits.widthArcsec, p.detector.xArcsecPerPixel, p.detector.dispersionAPerPixel), dispersionAPerPixel: p.detector.dispersionAPerPixel };
  };
  const sBins = starlightBins(starlight, s, { instrumentalOf: sampling, linesA, vsysKms: galaxy.vsysKms });
  const spin = spinProfile(sBins, s.starlightBinsRe, trials, `${seed}:starlight`);

  const masksH = planMaskHours(plan, profile, galaxy, input.masks, known);
  const target = tracerTargetSn(plan);
  if (target.source === 'default') notes.push(`no tracer S/N target in the plan: the hours assume the default S/N ${target.snPerA} per A (set goals.tracerSnPerA to choose one)`);
  const total = masksH.reduce((a, m) => a + m.hours, 0);
  const sites = siteHours(input.masks, masksH, profileOf);
  let nights = input.nights ? nightsNeeded(total, input.nights.rows, input.nights.from, input.nights.to) : null;
  let siteNights: SiteNights[] | null = null;
  if (sites.length > 1 && input.nightsOfProfile) {
    const bySite = nightsOfSites(sites, (id) => input.nightsOfProfile!.get(id)!);
    siteNights = bySite.sites;
    nights = bySite.overall;
  } else if (sites.length > 1 && input.nights) notes.push('masks at several sites: nights estimated from the first site only');
  if (!input.nights && !input.nightsOfProfile) notes.push('no semester given (forecast.semesterFrom/semesterTo in the plan, or --from/--to): nights not estimated');

  return {
    format: FORECAST_FORMAT, galaxyId: galaxy.id, trials, seed, errorPrecision: trialPrecision(trials), distanceMpc: s.distanceMpc, kpcPerRe, settings: s,
    tracerSlits: tf.length, expectedVelocities: expected, slitsWithVelocity: usable.length,
    medianVelocityErrorKms: errs.length ? errs[Math.floor((errs.length - 1) / 2)] : null,
    dispersionProfile,
    dispersionSlope: { slope: k.sigmaSlope, slopeError: Number.isFinite(slopes.std) ? slopes.std : null, meanFittedSlope: Number.isFinite(slopes.mean) ? slopes.mean : null },
    rotation: {
      amplitudeKms: k.rotationKms, kinematicPaDeg: k.kinematicPaDeg,
      amplitudeErrorKms: Number.isFinite(amp.std) ? amp.std : null, kinematicPaErrorDeg: Number.isFinite(paErr) ? paErr : null,
      meanFittedAmplitudeKms: Number.isFinite(amp.mean) ? amp.mean : null, detectionFraction: detected,
    },
    mass: {
      estimator: 'Watkins, Evans & An (2010), line-of-sight velocities and projected radii',
      radiusKpc: rOut * kpcPerRe, radiusRe: rOut, massMsun: Number.isFinite(mass.mean) ? mass.mean : null,
      fracError: massFrac, fracErrorWithDistance: massFrac === null ? null : Math.sqrt(massFrac * massFrac + distFrac * distFrac),
      alpha: s.mass.potentialSlope, beta: s.mass.anisotropy, gamma: k.tracerDensitySlope,
    },
    starlightBins: sBins, spinProfile: spin, fastRotatorThresholdLambda: fastRotatorThreshold(galaxy.axisRatio),
    hours: {
      perMask: masksH.map((m) => m.hours), maskIds: masksH.map((m) => m.maskId), total, masks: masksH,
      plannedExposureHours: known.exposureTimeS / 3600, targetSnPerA: target.snPerA, targetSnSource: target.source, completeness: s.completeness,
      overheadHoursPerMask: s.overheadHoursPerMask, nights, sites: siteNights, siteHours: sites,
    },
    tracers: tf,
    notes,
  };
}
