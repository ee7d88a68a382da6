/**
 * Line-of-sight velocity of a continuum-normalised spectrum by a chi-square template fit (common practice): the
 * template is the noiseless line model (spectro/lineSpectrum.ts); chi^2(v) is evaluated on a grid of a third of the
 * line sigma over the search range, the best grid point refined by a parabola through its neighbours, then by
 * Gauss-Newton steps to the least-squares minimum (equal pixel weights: the noise is that of the continuum). Velocities
 * km/s relative to the grid's rest frame.
 */
import { SPEED_OF_LIGHT_KMS } from '../profile/wavelength';
import { lineSpectrum, type AbsorptionLine, type LineGrid } from './lineSpectrum';

export interface VelocityFit {
  velocityKms: number;
  /** Sum of squared residuals at the fitted velocity (flux units squared). */
  chi2: number;
  /** The Gauss-Newton steps settled below 1e-4 km/s. */
  converged: boolean;
}

/** Reusable buffers of one grid, so a calibration of many trials allocates once. */
export interface FitWork {
  model: Float64Array;
  deriv: Float64Array;
}

/** Buffers for fits on `grid`. */
export function fitWork(grid: LineGrid): FitWork {
  return { model: new Float64Array(grid.wavelengthA.length), deriv: new Float64Array(grid.wavelengthA.length) };
}

function chi2At(grid: LineGrid, lines: readonly AbsorptionLine[], sigmaA: number, flux: ArrayLike<number>, v: number, w: FitWork): number {
  lineSpectrum(grid, lines, sigmaA, v, w.model);
  let c = 0;
  for (let p = 0; p < flux.length; p++) {
    const r = flux[p] - w.model[p];
    c += r * r;
  }
  return c;
}

/** Best-fitting velocity (km/s) within [loKms, hiKms] of the lines of sigma sigmaA to `flux` on `grid`. */
export function fitVelocity(grid: LineGrid, lines: readonly AbsorptionLine[], sigmaA: number, flux: ArrayLike<number>, loKms: number, hiKms: number, work = fitWork(grid)): VelocityFit {
  const meanRestA = lines.reduce((s, l) => s + l.restA, 0) / lines.length;
  const stepKms = ((sigmaA / meanRestA) * SPEED_OF_LIGHT_KMS) / 3;
  const n = Math.max(3, Math.ceil((hiKms - loKms) / stepKms) + 1);
  const h = (hiKms - loKms) / (n - 1);
  let best = 0, bestChi = Infinity;
  const chis = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    chis[i] = chi2At(grid, lines, sigmaA, flux, loKms + i * h, work);
    if (chis[i] < bestChi) { bestChi = chis[i]; best = i; }
  }
  let v = loKms + best * h;
  if (best > 0 && best < n - 1) {
    const a = chis[best - 1], b = chis[best], c = chis[best + 1];
    const den = a - 2 * b + c;
    if (den > 0) v += (0.5 * h * (a - c)) / den;
  }
  // Gauss-Newton on the one parameter: dv = sum(r J) / sum(J^2), J = dF/dv; kept within the bracketing grid cells.
  let converged = false;
  const vGrid = loKms + best * h;
  for (let it = 0; it < 12; it++) {
    lineSpectrum(grid, lines, sigmaA, v, work.model, work.deriv);
    let num = 0, den = 0;
    for (let p = 0; p < flux.length; p++) {
      num += (flux[p] - work.model[p]) * work.deriv[p];
      den += work.deriv[p] * work.deriv[p];
    }
    if (!(den > 0)) break;
    const dv = num / den;
    v = Math.min(Math.max(v + dv, vGrid - h, loKms), vGrid + h, hiKms);
    if (Math.abs(dv) < 1e-4) { converged = true; break; }
  }
  return { velocityKms: v, chi2: chi2At(grid, lines, sigmaA, flux, v, work), converged };
}
