/**
 * Sérsic surface-brightness profile I(R) = Ie exp(-b_n [(R/Re)^(1/n) - 1]), R circularised.
 * b_n is solved exactly from Gamma(2n) = 2 gamma(2n, b_n), i.e. P(2n, b_n) = 1/2 for the
 * regularised lower incomplete gamma function P.
 */
import { PMath } from '../numeric/portableMath';
import { rememberLast } from '../numeric/rememberLast';

const LN10 = PMath.log(10);

/** Natural log of the gamma function for x > 0 (Lanczos approximation, g = 7, 9 terms; ~1e-15 relative). */
export function lnGamma(x: number): number {
  const g = 7;
  const c = [
    0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
    12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
  ];
  if (x < 0.5) return PMath.log(Math.PI / PMath.sin(Math.PI * x)) - lnGamma(1 - x);
  const xx = x - 1;
  let a = c[0];
  const t = xx + g + 0.5;
  for (let i = 1; i < g + 2; i++) a += c[i] / (xx + i);
  return 0.5 * PMath.log(2 * Math.PI) + (xx + 0.5) * PMath.log(t) - t + PMath.log(a);
}

/** Regularised lower incomplete gamma P(a, x) for a > 0, x >= 0 (series below a+1, continued fraction above). */
export function regularisedLowerGamma(a: number, x: number): number {
  if (x <= 0) return 0;
  const lnPre = a * PMath.log(x) - x - lnGamma(a);
  if (x < a + 1) {
    let sum = 1 / a, term = 1 / a;
    for (let n = 1; n < 10000; n++) {
      term *= x / (a + n);
      sum += term;
      if (Math.abs(term) < Math.abs(sum) * 1e-16) break;
    }
    return PMath.exp(lnPre) * sum;
  }
  // Lentz's continued fraction for Q(a, x).
  const tiny = 1e-300;
  let b = x + 1 - a, c = 1 / tiny, d = 1 / b, h = d;
  for (let i = 1; i < 10000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return 1 - PMath.exp(lnPre) * h;
}

/**
 * Ciotti & Bertin (1999, A&A 352, 447) asymptotic series for b_n, its first four terms:
 * 2n - 1/3 + 4/(405n) + 46/(25515n^2). Good to ~5e-4 at n = 0.5 and ~1e-7 at n = 10; use sersicBn for exact values.
 */
export function sersicBnSeries(n: number): number {
  return 2 * n - 1 / 3 + 4 / (405 * n) + 46 / (25515 * n * n);
}

// A plan asks for one galaxy's n many times over.
const lastSersicBn = rememberLast(solveSersicBn);

/** Exact b_n for Sérsic index n > 0: the root of P(2n, b) = 1/2, by bracketing bisection polished with Newton. */
export function sersicBn(n: number): number {
  return lastSersicBn(n);
}

/** sersicBn, solved each time. */
function solveSersicBn(n: number): number {
  if (!(n > 0)) throw new RangeError(`Sérsic index n must be positive, got ${n}`);
  const a = 2 * n;
  const f = (b: number) => regularisedLowerGamma(a, b) - 0.5;
  let lo = 1e-8, hi = Math.max(1, 2 * a + 5);
  while (f(hi) < 0) hi *= 2;
  for (let i = 0; i < 200 && hi - lo > 1e-14 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (f(mid) < 0) lo = mid;
    else hi = mid;
  }
  let b = 0.5 * (lo + hi);
  // Newton polish: dP/dx = x^(a-1) e^-x / Gamma(a).
  for (let i = 0; i < 3; i++) {
    const deriv = PMath.exp((a - 1) * PMath.log(b) - b - lnGamma(a));
    if (deriv > 0) b -= f(b) / deriv;
  }
  return b;
}

/** Sérsic surface brightness in mag/arcsec^2 at circularised radius R: mu(R) = muE + (2.5 b_n / ln 10)[(R/Re)^(1/n) - 1]. */
export function sersicMuMagPerArcsec2(radiusArcsec: number, reArcsec: number, sersicN: number, muEMagPerArcsec2: number, bn = sersicBn(sersicN)): number {
  return muEMagPerArcsec2 + ((2.5 * bn) / LN10) * (PMath.pow(radiusArcsec / reArcsec, 1 / sersicN) - 1);
}

/** Radius in arcsec where the Sérsic profile reaches surface brightness mu (mag/arcsec^2); inverse of sersicMuMagPerArcsec2. */
export function sersicRadiusAtMuArcsec(muMagPerArcsec2: number, reArcsec: number, sersicN: number, muEMagPerArcsec2: number, bn = sersicBn(sersicN)): number {
  const t = 1 + ((muMagPerArcsec2 - muEMagPerArcsec2) * LN10) / (2.5 * bn);
  return t <= 0 ? 0 : reArcsec * PMath.pow(t, sersicN);
}
