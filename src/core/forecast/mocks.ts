/**
 * Monte Carlo mocks of the clusters' velocities at the planned positions (docs/forecast.md, "Mocks"). Each trial
 * decides which candidates are clusters (probability from the contamination model; contaminants are recognised by
 * their velocities and dropped), draws each cluster's velocity from the kinematic model plus its measurement error,
 * and fits the rotation (all clusters), the dispersion in each radial bin (after removing the fitted rotation) and
 * the tracer mass. The quoted errors are the scatter of the fitted values over the trials.
 */
import { makeRng } from '../numeric/random';
import { PMath } from '../numeric/portableMath';
import { fitDispersion, fitRotation } from './likelihood';
import { modelSigmaKms, rotationVelocityKms } from './kinematicModel';
import { tracerMassMsun } from './tracerMass';
import type { ForecastSettings } from './settings';

/** A tracer slit that can give a velocity: radius (Re and kpc), PA (deg E of N), error (km/s), cluster probability. */
export interface MockTracer {
  radiusRe: number;
  radiusKpc: number;
  paDeg: number;
  errorKms: number;
  clusterProbability: number;
}

export interface TrialFits {
  /** Per radial bin: fitted dispersion (km/s), NaN when the bin has fewer than 3 velocities in the trial. */
  binSigmaKms: Float64Array;
  amplitudeKms: number;
  kinematicPaDeg: number;
  massMsun: number;
  rOutKpc: number;
  velocities: number;
}

/** Index of the bin [edges[i], edges[i+1]) holding radiusRe, or -1 outside. */
export function binIndex(edgesRe: readonly number[], radiusRe: number): number {
  for (let i = 0; i + 1 < edgesRe.length; i++) if (radiusRe >= edgesRe[i] && radiusRe < edgesRe[i + 1]) return i;
  return -1;
}

/** Run `trials` seeded mocks of the tracers; the same seed gives the same fits. */
export function runTracerMocks(tracers: readonly MockTracer[], edgesRe: readonly number[], s: ForecastSettings, trials: number, seed: number | string): TrialFits[] {
  const rng = makeRng(seed);
  const n = tracers.length, nBins = edgesRe.length - 1;
  const k = s.kinematics;
  const cosPa = new Float64Array(n), sinPa = new Float64Array(n), sig = new Float64Array(n), rot = new Float64Array(n), bin = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const t = tracers[i];
    cosPa[i] = PMath.cos((t.paDeg * Math.PI) / 180);
    sinPa[i] = PMath.sin((t.paDeg * Math.PI) / 180);
    sig[i] = modelSigmaKms(t.radiusRe, k);
    rot[i] = rotationVelocityKms(t.paDeg, k.rotationKms, k.kinematicPaDeg);
    bin[i] = binIndex(edgesRe, t.radiusRe);
  }
  const v = new Float64Array(n), e = new Float64Array(n), c = new Float64Array(n), sn = new Float64Array(n), r = new Float64Array(n), e2 = new Float64Array(n);
  const idx = new Int32Array(n);
  const bv = new Float64Array(n), be = new Float64Array(n);
  const out: TrialFits[] = [];
  for (let t = 0; t < trials; t++) {
    let m = 0;
    for (let i = 0; i < n; i++) {
      const tr = tracers[i];
      // Draw both numbers for every tracer so that one tracer's membership does not shift the others' draws.
      const u = rng.next(), g1 = rng.normal(), g2 = rng.normal();
      if (u >= tr.clusterProbability) continue;
      v[m] = rot[i] + sig[i] * g1 + tr.errorKms * g2;
      e[m] = tr.errorKms;
      e2[m] = tr.errorKms * tr.errorKms;
      c[m] = cosPa[i];
      sn[m] = sinPa[i];
      r[m] = tr.radiusKpc;
      idx[m] = i;
      m++;
    }
    const fit = fitRotation(v, e, c, sn, m);
    const binSigma = new Float64Array(nBins).fill(NaN);
    for (let b = 0; b < nBins; b++) {
      let nb = 0;
      for (let j = 0; j < m; j++) {
        if (bin[idx[j]] !== b) continue;
        bv[nb] = v[j] - (fit ? fit.amplitudeKms * PMath.cos(((tracers[idx[j]].paDeg - fit.kinematicPaDeg) * Math.PI) / 180) : 0);
        be[nb] = e[j];
        nb++;
      }
      if (nb >= 3) binSigma[b] = fitDispersion(bv, be, nb).sigmaKms;
    }
    let rOut = 0;
    const v0 = fit ? fit.v0Kms : 0;
    for (let j = 0; j < m; j++) {
      v[j] -= v0;
      rOut = Math.max(rOut, r[j]);
    }
    out.push({
      binSigmaKms: binSigma,
      amplitudeKms: fit ? fit.amplitudeKms : NaN,
      kinematicPaDeg: fit ? fit.kinematicPaDeg : NaN,
      massMsun: m >= 3 ? tracerMassMsun(v, r, e2, s.mass.potentialSlope, s.mass.anisotropy, k.tracerDensitySlope, m) : NaN,
      rOutKpc: rOut,
      velocities: m,
    });
  }
  return out;
}

/** Mean and standard deviation (n - 1) of the finite values; NaN when fewer than 2. */
export function meanAndStd(values: readonly number[]): { mean: number; std: number; n: number } {
  const f = values.filter((x) => Number.isFinite(x));
  if (f.length < 2) return { mean: f.length ? f[0] : NaN, std: NaN, n: f.length };
  const mean = f.reduce((a, b) => a + b, 0) / f.length;
  const varSum = f.reduce((a, b) => a + (b - mean) * (b - mean), 0);
  return { mean, std: Math.sqrt(varSum / (f.length - 1)), n: f.length };
}

/** Root-mean-square of the angle differences (degrees, wrapped to (-180, 180]) of fitted PAs from trueDeg. */
export function angleScatterDeg(valuesDeg: readonly number[], trueDeg: number): number {
  const f = valuesDeg.filter((x) => Number.isFinite(x));
  if (f.length < 2) return NaN;
  let s = 0;
  for (const x of f) {
    let d = (((x - trueDeg) % 360) + 540) % 360 - 180;
    if (d === -180) d = 180;
    s += d * d;
  }
  return Math.sqrt(s / f.length);
}
