/**
 * Spin parameter of Emsellem et al. (2007, MNRAS 379, 401): lambda_R = sum F R |V| / sum F R sqrt(V^2 + sigma^2)
 * over the bins inside R (F flux, R radius, V mean velocity about systemic, sigma dispersion of each bin); fast
 * and slow rotators split at lambda_Re = 0.31 sqrt(ellipticity) (Emsellem et al. 2011, MNRAS 414, 888).
 */

export interface SpinBin {
  flux: number;
  radiusRe: number;
  vKms: number;
  sigmaKms: number;
}

/** lambda_R of the bins with radiusRe <= withinRe; null when none (or all of zero weight). */
export function spinParameter(bins: readonly SpinBin[], withinRe = Infinity): number | null {
  let num = 0, den = 0;
  for (const b of bins) {
    if (b.radiusRe > withinRe) continue;
    const w = b.flux * b.radiusRe;
    num += w * Math.abs(b.vKms);
    den += w * Math.sqrt(b.vKms * b.vKms + b.sigmaKms * b.sigmaKms);
  }
  return den > 0 ? num / den : null;
}

/** The fast/slow boundary lambda_Re = 0.31 sqrt(1 - q) for an axis ratio q (Emsellem et al. 2011). */
export function fastRotatorThreshold(axisRatio: number): number {
  return 0.31 * Math.sqrt(Math.max(0, 1 - axisRatio));
}
