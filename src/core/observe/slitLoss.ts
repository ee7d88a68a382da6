/**
 * Light of a point source through a slit for Gaussian seeing. The slit is infinitely long (its length is many
 * FWHM); only its width matters. Offsets are across the slit, arcsec, from the slit's centre line.
 */
import { regularisedLowerGamma } from '../sky/sersic';
import { PMath } from '../numeric/portableMath';
import { rememberLast } from '../numeric/rememberLast';

/** Gaussian sigma for a FWHM: FWHM = 2 sqrt(2 ln 2) sigma. */
export const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/**
 * The error function erf(x). For |x| < 3 the positive-term series erf x = (2/sqrt(pi)) e^(-x^2) sum_n (2x^2)^n x / (1.3.5...(2n+1))
 * (no cancellation, ~1e-16); beyond, erf(x) = P(1/2, x^2) from the regularised lower incomplete gamma function.
 */
export function erf(x: number): number {
  const ax = Math.abs(x);
  let v: number;
  if (ax < 3) {
    const x2 = 2 * ax * ax;
    let term = ax, sum = ax;
    for (let n = 1; n < 200; n++) {
      term *= x2 / (2 * n + 1);
      sum += term;
      if (term < sum * 1e-17) break;
    }
    v = (2 / Math.sqrt(Math.PI)) * PMath.exp(-ax * ax) * sum;
  } else v = regularisedLowerGamma(0.5, ax * ax);
  return x < 0 ? -v : v;
}

/** Fraction (0..1) of a Gaussian image of FWHM seeingFwhmArcsec, centred offsetArcsec from the slit centre line, passing a slit of widthArcsec. */
export function slitTransmission(offsetArcsec: number, widthArcsec: number, seeingFwhmArcsec: number): number {
  const s = (seeingFwhmArcsec / FWHM_PER_SIGMA) * Math.SQRT2;
  const h = widthArcsec / 2;
  return 0.5 * (erf((h - offsetArcsec) / s) + erf((h + offsetArcsec) / s));
}

// Every slit of a mask has one or two widths.
const lastCentredTransmission = rememberLast((widthArcsec: number, seeingFwhmArcsec: number) => slitTransmission(0, widthArcsec, seeingFwhmArcsec));

/** slitTransmission of an image centred on the slit (offset 0), computed once for a run of the same width and seeing. */
export function centredSlitTransmission(widthArcsec: number, seeingFwhmArcsec: number): number {
  return lastCentredTransmission(widthArcsec, seeingFwhmArcsec);
}

/** Loss (0..1) relative to a centred image, from the transmission of the offset image and of the centred one. */
export function lossRelativeToCentred(transmission: number, centredTransmission: number): number {
  return centredTransmission > 0 ? Math.max(0, 1 - transmission / centredTransmission) : 0;
}

/** Extra fraction of light lost (0..1) by an image offsetArcsec off the slit centre, relative to the same image centred. */
export function relativeSlitLoss(offsetArcsec: number, widthArcsec: number, seeingFwhmArcsec: number): number {
  return lossRelativeToCentred(slitTransmission(offsetArcsec, widthArcsec, seeingFwhmArcsec), centredSlitTransmission(widthArcsec, seeingFwhmArcsec));
}

// Each mask of a plan asks for the same slit width and limit.
const lastOffsetAtLoss = rememberLast(solveOffsetAtLoss);

/** Smallest across-slit offset (arcsec) at which the loss relative to a centred image reaches maxLoss (Infinity if never). */
export function offsetAtLoss(widthArcsec: number, seeingFwhmArcsec: number, maxLoss: number): number {
  return lastOffsetAtLoss(widthArcsec, seeingFwhmArcsec, maxLoss);
}

/** offsetAtLoss by bisection, solved each time. */
function solveOffsetAtLoss(widthArcsec: number, seeingFwhmArcsec: number, maxLoss: number): number {
  const centred = centredSlitTransmission(widthArcsec, seeingFwhmArcsec);
  const loss = (x: number) => lossRelativeToCentred(slitTransmission(x, widthArcsec, seeingFwhmArcsec), centred);
  let hi = widthArcsec + 10 * seeingFwhmArcsec;
  if (!(loss(hi) >= maxLoss)) return Infinity;
  let lo = 0;
  if (loss(lo) >= maxLoss) return 0;
  for (let i = 0; i < 80 && hi - lo > 1e-13; i++) {
    const mid = (lo + hi) / 2;
    if (loss(mid) >= maxLoss) hi = mid; else lo = mid;
  }
  return hi;
}
