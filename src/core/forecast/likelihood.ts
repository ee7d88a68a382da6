/**
 * Maximum-likelihood fits of discrete velocities with individual errors (docs/forecast.md, "Fits"):
 *   -ln L = 1/2 sum [ ln(sigma^2 + e_i^2) + (v_i - model_i)^2 / (sigma^2 + e_i^2) ].
 * The dispersion fit has a free mean; the rotation fit has model_i = v0 + a cos(PA_i) + b sin(PA_i), so the
 * amplitude is sqrt(a^2 + b^2) and the kinematic PA atan2(b, a) (the receding side, degrees East of North).
 * For fixed sigma the means are weighted least squares; sigma is then the root of d(-ln L)/d sigma = 0, that is
 * sum w_i^2 [r_i^2 - sigma^2 - e_i^2] = 0 with w_i = 1/(sigma^2 + e_i^2) (safeguarded Newton); the two steps alternate.
 */
import { PMath } from '../numeric/portableMath';

export interface DispersionFit {
  meanKms: number;
  sigmaKms: number;
}

export interface RotationFit {
  v0Kms: number;
  amplitudeKms: number;
  /** Receding side, degrees East of North in [0, 360). */
  kinematicPaDeg: number;
  sigmaKms: number;
}

/**
 * Root in sigma (km/s, >= 0) of the likelihood equation for residuals r and errors e (both km/s): safeguarded
 * Newton from `start` inside a shrinking bracket [lo, hi], bisection whenever a step leaves it.
 */
function solveSigma(r: ArrayLike<number>, e: ArrayLike<number>, n: number, start = 0): number {
  let hi = 0;
  for (let i = 0; i < n; i++) hi = Math.max(hi, Math.abs(r[i]));
  hi = hi * 2 + 1;
  let lo = 0;
  let s = Math.min(Math.max(start, 0), hi);
  for (let it = 0; it < 100; it++) {
    let f = 0, df = 0;
    for (let i = 0; i < n; i++) {
      const v = s * s + e[i] * e[i];
      const r2 = r[i] * r[i];
      if (v === 0) { f += r2 > 0 ? Infinity : 0; continue; }
      f += (r2 - v) / (v * v);
      df += 2 * s * (1 / (v * v) - (2 * r2) / (v * v * v));
    }
    if (f > 0) lo = s;
    else hi = s;
    if (s === 0 && f <= 0) return 0;
    let next = df < 0 && Number.isFinite(f) ? s - f / df : NaN;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    if (Math.abs(next - s) < 1e-7 * (1 + s) || hi - lo < 1e-7 * (1 + s)) return next;
    s = next;
  }
  return s;
}

/** Maximum-likelihood mean and dispersion (km/s) of velocities v with errors e (first n entries). */
export function fitDispersion(v: ArrayLike<number>, e: ArrayLike<number>, n = v.length): DispersionFit {
  const r = new Float64Array(n);
  let mean = 0;
  for (let i = 0; i < n; i++) mean += v[i];
  mean /= n;
  let sigma = 0;
  for (let it = 0; it < 30; it++) {
    for (let i = 0; i < n; i++) r[i] = v[i] - mean;
    const next = solveSigma(r, e, n, sigma || undefined);
    let sw = 0, swv = 0;
    for (let i = 0; i < n; i++) {
      const w = 1 / (next * next + e[i] * e[i] + 1e-12);
      sw += w;
      swv += w * v[i];
    }
    const nextMean = swv / sw;
    const done = Math.abs(next - sigma) < 1e-4 && Math.abs(nextMean - mean) < 1e-4;
    sigma = next;
    mean = nextMean;
    if (done) break;
  }
  return { meanKms: mean, sigmaKms: sigma };
}

/** Solve the 3x3 symmetric system m x = y (Cramer's rule); null when singular. */
function solve3(m: number[], y: number[]): number[] | null {
  const [a, b, c, d, e, f, g, h, k] = m;
  const det = a * (e * k - f * h) - b * (d * k - f * g) + c * (d * h - e * g);
  if (Math.abs(det) < 1e-12 * Math.max(1, Math.abs(a * e * k))) return null;
  return [
    (y[0] * (e * k - f * h) - b * (y[1] * k - f * y[2]) + c * (y[1] * h - e * y[2])) / det,
    (a * (y[1] * k - f * y[2]) - y[0] * (d * k - f * g) + c * (d * y[2] - y[1] * g)) / det,
    (a * (e * y[2] - y[1] * h) - b * (d * y[2] - y[1] * g) + y[0] * (d * h - e * g)) / det,
  ];
}

/**
 * Maximum-likelihood rotation fit: velocities v (km/s), errors e, position angles (cosPa, sinPa precomputed, PA East
 * of North); null with fewer than 4 velocities or azimuths that cannot constrain a cosine.
 */
export function fitRotation(v: ArrayLike<number>, e: ArrayLike<number>, cosPa: ArrayLike<number>, sinPa: ArrayLike<number>, n = v.length): RotationFit | null {
  if (n < 4) return null;
  let sigma = 0;
  let x: number[] | null = null;
  const r = new Float64Array(n);
  let s2 = 0;
  for (let i = 0; i < n; i++) s2 += v[i];
  const mean0 = s2 / n;
  s2 = 0;
  for (let i = 0; i < n; i++) s2 += (v[i] - mean0) * (v[i] - mean0);
  sigma = Math.sqrt(s2 / n);
  for (let it = 0; it < 30; it++) {
    const m = [0, 0, 0, 0, 0, 0, 0, 0, 0], y = [0, 0, 0];
    for (let i = 0; i < n; i++) {
      const w = 1 / (sigma * sigma + e[i] * e[i] + 1e-12);
      const c = cosPa[i], s = sinPa[i];
      m[0] += w; m[1] += w * c; m[2] += w * s;
      m[4] += w * c * c; m[5] += w * c * s; m[8] += w * s * s;
      y[0] += w * v[i]; y[1] += w * c * v[i]; y[2] += w * s * v[i];
    }
    m[3] = m[1]; m[6] = m[2]; m[7] = m[5];
    const nx = solve3(m, y);
    if (!nx) return null;
    for (let i = 0; i < n; i++) r[i] = v[i] - nx[0] - nx[1] * cosPa[i] - nx[2] * sinPa[i];
    const next = solveSigma(r, e, n, sigma);
    const done = x !== null && Math.abs(next - sigma) < 1e-4 && Math.abs(nx[1] - x[1]) < 1e-4 && Math.abs(nx[2] - x[2]) < 1e-4;
    x = nx;
    sigma = next;
    if (done) break;
  }
  const [v0, a, b] = x!;
  const pa = (PMath.atan2(b, a) * 180) / Math.PI;
  return { v0Kms: v0, amplitudeKms: Math.sqrt(a * a + b * b), kinematicPaDeg: (pa + 360) % 360, sigmaKms: sigma };
}

/** Fisher (Cramer-Rao) error of a dispersion sigmaKms from n velocities with errors e: [sum 2 sigma^2/(sigma^2+e^2)^2]^-1/2. */
export function dispersionFisherErrorKms(sigmaKms: number, e: ArrayLike<number>): number {
  let info = 0;
  for (let i = 0; i < e.length; i++) {
    const v = sigmaKms * sigmaKms + e[i] * e[i];
    info += (2 * sigmaKms * sigmaKms) / (v * v);
  }
  return 1 / Math.sqrt(info);
}
