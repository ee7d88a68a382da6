/**
 * Chance that a candidate is a globular cluster rather than a foreground star or background galaxy, from its
 * magnitude, colour and radius (docs/forecast.md, "Contamination"). Odds model: contaminants over clusters
 *   k = k0 (R/Rp)^(gamma - 1) 10^(kappa dm) exp(dm^2 / 2 s^2) exp(dc^2 / 2 sc^2),
 * with k0 = f/(1 - f) the odds at the pivot radius Rp, the turnover and the mean colour; clusters follow a projected
 * power law R^-(gamma - 1) (gamma the 3-D slope), a Gaussian luminosity function (turnover m0, width s; Harris 1991,
 * ARA&A 29, 543) and a Gaussian colour distribution; contaminants are flat in radius and colour and rise in number
 * as 10^(kappa m). dm = m - m0, dc = colour - mean. P(cluster) = 1/(1 + k).
 */
import { PMath } from '../numeric/portableMath';
import type { ContaminationSettings } from './settings';

/** Distance modulus of a distance in Mpc: 5 log10(d / 10 pc). */
export function distanceModulus(distanceMpc: number): number {
  return 5 * PMath.log10(distanceMpc * 1e5);
}

/** Probability (0..1) that a candidate of magnitude mag (colour or null) at radiusRe (circularised R/Re) is a cluster. */
export function clusterProbability(mag: number | null, colour: number | null, radiusRe: number, distanceMpc: number, c: ContaminationSettings, tracerDensitySlope: number): number {
  if (c.fractionAtPivot <= 0) return 1;
  let logOdds = PMath.log(c.fractionAtPivot / (1 - c.fractionAtPivot));
  logOdds += (tracerDensitySlope - 1) * PMath.log(Math.max(radiusRe, 1e-3) / c.pivotRe);
  if (mag !== null) {
    const dm = mag - (c.turnoverAbsMag + distanceModulus(distanceMpc));
    logOdds += c.countSlope * dm * Math.LN10 + (dm * dm) / (2 * c.luminositySigmaMag * c.luminositySigmaMag);
  }
  if (colour !== null && c.colourMean !== null && c.colourSigma !== null) {
    const dc = colour - c.colourMean;
    logOdds += (dc * dc) / (2 * c.colourSigma * c.colourSigma);
  }
  if (logOdds > 700) return 0;
  return 1 / (1 + PMath.exp(logOdds));
}
