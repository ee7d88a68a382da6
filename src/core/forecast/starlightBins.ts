/**
 * Integrated-starlight forecast: starlight slits grouped in radius-and-sector bins (radius circularised, in Re;
 * sectors from the major axis, galaxy frame, counter-clockwise from +u towards +v, not folded, so the two sides
 * of the rotation stay apart). A bin co-adds its slits' spectra: S/N per Angstrom adds in quadrature (independent
 * spectra, optimal weights). Its velocity and dispersion errors follow from that S/N (velocityError.ts) with the
 * lines broadened by the model dispersion; the spin parameter profile and its error come from mocks of the bins.
 */
import { PMath } from '../numeric/portableMath';
import { makeRng } from '../numeric/random';
import type { SlitSample } from './samples';
import { C_KMS, dispersionErrorKms, lineSigmaA, velocityErrorKms, type LineSampling } from './velocityError';
import { modelSigmaKms, rotationVelocityKms } from './kinematicModel';
import { spinParameter, type SpinBin } from './spin';
import { binIndex, meanAndStd } from './mocks';
import type { ForecastSettings } from './settings';

export interface StarlightBin {
  fromRe: number;
  toRe: number;
  /** Start of the sector, degrees from the major axis; the sector spans sectorWidthDeg. */
  sectorDeg: number;
  sectorWidthDeg: number;
  slits: number;
  /** Co-added S/N per Angstrom. */
  snPerA: number;
  /** Expected errors of the bin's mean velocity and dispersion, km/s (null below the S/N threshold). */
  velocityErrorKms: number | null;
  sigmaErrorKms: number | null;
  /** Model values at the bin (flux-weighted): radius, rotation velocity and dispersion, and the flux weight. */
  radiusRe: number;
  modelVKms: number;
  modelSigmaKms: number;
  flux: number;
}

export interface SpinPoint {
  withinRe: number;
  lambdaR: number | null;
  /** Scatter of lambda_R over the mocks, and its mean (noise biases |V| upwards). */
  error: number | null;
  meanMock: number | null;
}

/** The starlight bins with slits, in order of radius then sector. */
export function starlightBins(samples: readonly SlitSample[], s: ForecastSettings, line: { instrumentalOf: (maskId: string) => LineSampling; linesA: readonly number[]; vsysKms: number }): StarlightBin[] {
  const edges = s.starlightBinsRe, width = 360 / s.starlightSectors;
  const groups = new Map<number, SlitSample[]>();
  for (const x of samples) {
    const r = binIndex(edges, x.radiusRe);
    if (r < 0) continue;
    const key = r * s.starlightSectors + Math.min(s.starlightSectors - 1, Math.floor(x.azimuthDeg / width));
    groups.set(key, [...(groups.get(key) ?? []), x]);
  }
  const meanLineA = line.linesA.reduce((a, b) => a + b, 0) / line.linesA.length;
  const k = s.kinematics;
  return [...groups.entries()].sort((a, b) => a[0] - b[0]).map(([key, list]) => {
    const r = Math.floor(key / s.starlightSectors), sector = key % s.starlightSectors;
    let sn2 = 0, flux = 0, fr = 0, fv = 0, inst = 0, disp = 0;
    for (const x of list) {
      sn2 += x.snPerA * x.snPerA;
      // Slits of several spectrographs in one bin: their instrumental width and sampling weighted by S/N squared.
      const own = line.instrumentalOf(x.maskId);
      inst += x.snPerA * x.snPerA * own.sigmaLineA;
      disp += x.snPerA * x.snPerA * own.dispersionAPerPixel;
      const f = x.muMagPerArcsec2 === null ? x.areaArcsec2 : PMath.pow(10, -0.4 * x.muMagPerArcsec2) * x.areaArcsec2;
      flux += f;
      fr += f * x.radiusRe;
      fv += f * rotationVelocityKms(x.paDeg, k.starlightRotationKms, k.kinematicPaDeg);
    }
    const sn = Math.sqrt(sn2), radiusRe = fr / flux, sigma = modelSigmaKms(radiusRe, k);
    const first = line.instrumentalOf(list[0].maskId);
    const lineA = lineSigmaA(sn2 > 0 ? inst / sn2 : first.sigmaLineA, s.velocityErrors.intrinsicLineSigmaA, sigma, meanLineA);
    const sampling = { sigmaLineA: lineA, dispersionAPerPixel: sn2 > 0 ? disp / sn2 : first.dispersionAPerPixel };
    const ev = velocityErrorKms(sn, sampling, line.linesA, line.vsysKms, s.velocityErrors);
    const finite = Number.isFinite(ev);
    return {
      fromRe: edges[r], toRe: edges[r + 1], sectorDeg: sector * width, sectorWidthDeg: width, slits: list.length, snPerA: sn,
      velocityErrorKms: finite ? ev : null,
      sigmaErrorKms: finite ? dispersionErrorKms(ev, (lineA / meanLineA) * C_KMS, sigma) : null,
      radiusRe, modelVKms: fv / flux, modelSigmaKms: sigma, flux,
    };
  });
}

/** Spin parameter lambda_R within each outer edge of the starlight radial bins: model value and mock scatter. */
export function spinProfile(bins: readonly StarlightBin[], edgesRe: readonly number[], trials: number, seed: number | string): SpinPoint[] {
  const usable = bins.filter((b) => b.velocityErrorKms !== null);
  const model: SpinBin[] = usable.map((b) => ({ flux: b.flux, radiusRe: b.radiusRe, vKms: b.modelVKms, sigmaKms: b.modelSigmaKms }));
  const rng = makeRng(seed);
  const mocks: SpinBin[][] = [];
  for (let t = 0; t < trials; t++) {
    mocks.push(usable.map((b) => ({
      flux: b.flux, radiusRe: b.radiusRe,
      vKms: b.modelVKms + rng.normal(0, b.velocityErrorKms!),
      sigmaKms: Math.max(0, b.modelSigmaKms + rng.normal(0, b.sigmaErrorKms!)),
    })));
  }
  return edgesRe.slice(1).filter((edge) => usable.some((b) => b.fromRe < edge)).map((edge) => {
    const stats = meanAndStd(mocks.map((m) => spinParameter(m, edge) ?? NaN));
    return { withinRe: edge, lambdaR: spinParameter(model, edge), error: Number.isFinite(stats.std) ? stats.std : null, meanMock: Number.isFinite(stats.mean) ? stats.mean : null };
  });
}
