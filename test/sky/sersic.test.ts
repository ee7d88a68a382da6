import { describe, expect, it } from 'vitest';
import {
  lnGamma,
  regularisedLowerGamma,
  sersicBn,
  sersicBnSeries,
  sersicMuMagPerArcsec2,
  sersicRadiusAtMuArcsec,
} from '../../src/core/sky/sersic';

/** Composite Simpson rule of f over [a, b] with an even number of intervals. */
function simpson(f: (x: number) => number, a: number, b: number, intervals: number): number {
  const h = (b - a) / intervals;
  let s = f(a) + f(b);
  for (let i = 1; i < intervals; i++) s += (i % 2 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

/**
 * P(a, x) by direct numerical integration of the incomplete gamma integrand t^(a-1) e^(-t), written
 * out here independently of the library (no lnGamma, no series): the ratio of the integral over [0, x]
 * to the integral over [0, T], T far in the tail. The substitution t = u^4 keeps the integrand smooth at 0.
 */
function lowerGammaRatioByQuadrature(a: number, x: number): number {
  const g = (u: number) => 4 * Math.pow(u, 4 * a - 1) * Math.exp(-(u ** 4));
  const tail = a + 60 + 20 * Math.sqrt(a);
  return simpson(g, 0, Math.pow(x, 0.25), 20000) / simpson(g, 0, Math.pow(tail, 0.25), 40000);
}

describe('Sérsic b_n', () => {
  it('Graham & Driver (2005), PASA 22, 118: b_1 ~= 1.678 and b_4 ~= 7.669', () => {
    expect(sersicBn(1)).toBeCloseTo(1.678, 3);
    expect(sersicBn(4)).toBeCloseTo(7.669, 3);
  });

  it('closed forms: b_0.5 = ln 2 and b_1 solves 1 - e^-b (1 + b) = 1/2', () => {
    // P(1, x) = 1 - e^-x, so P(1, b) = 1/2 gives b = ln 2 exactly (closed-form derivation).
    expect(Math.abs(sersicBn(0.5) - Math.LN2)).toBeLessThan(1e-13);
    // P(2, x) = 1 - e^-x (1 + x): solve by Newton here, independently of the library.
    let b = 1.7;
    for (let i = 0; i < 50; i++) b -= (1 - Math.exp(-b) * (1 + b) - 0.5) / (b * Math.exp(-b));
    expect(Math.abs(sersicBn(1) - b)).toBeLessThan(1e-13);
    // P(8, x) = 1 - e^-x sum_{k<8} x^k/k! for n = 4, by bisection here.
    const p8 = (x: number) => {
      let term = 1, sum = 1;
      for (let k = 1; k < 8; k++) sum += (term *= x / k);
      return 1 - Math.exp(-x) * sum;
    };
    let lo = 7, hi = 8;
    for (let i = 0; i < 100; i++) (p8((lo + hi) / 2) < 0.5 ? (lo = (lo + hi) / 2) : (hi = (lo + hi) / 2));
    expect(Math.abs(sersicBn(4) - lo)).toBeLessThan(1e-12);
  });

  it('P(2n, b_n) = 1/2 by an independent numerical integration of t^(2n-1) e^-t', () => {
    for (const n of [0.5, 0.6, 0.8, 1, 1.7, 2.5, 4, 6.3, 10]) {
      const b = sersicBn(n);
      expect(Math.abs(lowerGammaRatioByQuadrature(2 * n, b) - 0.5)).toBeLessThan(1e-9);
      // and the library's own P agrees with the quadrature away from the root too
      expect(Math.abs(regularisedLowerGamma(2 * n, 0.7 * b) - lowerGammaRatioByQuadrature(2 * n, 0.7 * b))).toBeLessThan(1e-9);
      expect(Math.abs(regularisedLowerGamma(2 * n, 1.6 * b + 2) - lowerGammaRatioByQuadrature(2 * n, 1.6 * b + 2))).toBeLessThan(1e-9);
    }
  });

  it('lnGamma matches factorials and Gamma(1/2) = sqrt(pi)', () => {
    let f = 1;
    for (let k = 1; k <= 25; k++) {
      f *= k;
      expect(Math.abs(lnGamma(k + 1) - Math.log(f))).toBeLessThan(1e-12 * Math.max(1, Math.log(f)));
    }
    expect(Math.abs(lnGamma(0.5) - 0.5 * Math.log(Math.PI))).toBeLessThan(1e-14);
  });

  // Ciotti & Bertin (1999), A&A 352, 447: b_n ~= 2n - 1/3 + 4/(405n) + 46/(25515n^2), an asymptotic
  // series in 1/n. Observed |series - exact| on this implementation (the bound asserted is ~1.3x that):
  const observedSeriesError: [number, number][] = [
    [0.5, 4.84e-4],
    [0.6, 1.99e-4],
    [0.75, 5.35e-5],
    [1, 9.2e-7], // a lucky near-cancellation of the n^-3 remainder at n = 1
    [1.5, 8.01e-6],
    [2, 5.10e-6],
    [2.5, 3.14e-6],
    [3, 2.02e-6],
    [4, 9.61e-7],
    [5, 5.25e-7],
    [6, 3.16e-7],
    [8, 1.40e-7],
    [10, 7.37e-8],
  ];
  it.each(observedSeriesError)('series vs exact root at n = %s: |difference| ~ %s', (n, observed) => {
    const diff = Math.abs(sersicBnSeries(n) - sersicBn(n));
    expect(diff).toBeLessThan(1.3 * observed);
    expect(diff).toBeGreaterThan(0.7 * observed); // the figure stated above is the real one
  });

  it('the series remainder falls as n^-3, with the coefficient of the next term', () => {
    // n^3 (b_exact - series) tends to the n^-3 coefficient of the expansion. Extrapolated from n = 20 and
    // 40 (Richardson, remainder c3 + c4/n): c3 ~= 8.158e-5. That is 281/3444525, the a^-3 coefficient
    // 2248/3444525 of the known median series of the gamma distribution (from memory) with a = 2n;
    // confirmed outside the test by a 60-digit root of P(2n, b) = 1/2 for n up to 400 (Python decimal).
    // A fifth term 131/(1148175 n^3) once used here from memory (1.141e-4) is not borne out, so the
    // library keeps the four terms above.
    const r = (n: number) => n ** 3 * (sersicBn(n) - sersicBnSeries(n));
    expect(r(10)).toBeGreaterThan(0);
    expect(r(10)).toBeLessThan(r(20));
    expect(r(20)).toBeLessThan(r(40));
    const c3 = 2 * r(40) - r(20);
    expect(Math.abs(c3 - 281 / 3444525) / (281 / 3444525)).toBeLessThan(0.01);
  });
});

describe('Sérsic surface brightness', () => {
  it('mu(Re) = muE for any n', () => {
    for (const n of [0.5, 1, 2.5, 4, 8]) expect(sersicMuMagPerArcsec2(45, 45, n, 21.5)).toBeCloseTo(21.5, 12);
  });

  it('mu(R) = muE + 2.5 b_n / ln 10 ((R/Re)^(1/n) - 1); the central value for n = 4 is muE - 8.327 mag', () => {
    const b4 = sersicBn(4);
    expect(sersicMuMagPerArcsec2(0, 30, 4, 20)).toBeCloseTo(20 - (2.5 * b4) / Math.LN10, 12);
    // 2.5 * 7.669249 / ln 10 = 8.32683 mag (computed by hand from the closed form).
    expect(20 - sersicMuMagPerArcsec2(0, 30, 4, 20)).toBeCloseTo(8.3268, 3);
    // At 3 Re for n = 1: 2.5 b_1 (3 - 1) / ln 10.
    expect(sersicMuMagPerArcsec2(90, 30, 1, 20) - 20).toBeCloseTo((2.5 * sersicBn(1) * 2) / Math.LN10, 12);
    // Fainter (larger mu) outward.
    expect(sersicMuMagPerArcsec2(60, 30, 4, 20)).toBeGreaterThan(sersicMuMagPerArcsec2(31, 30, 4, 20));
  });

  it('half of the total light falls inside Re (the definition of b_n), by numerical integration of I(R) 2 pi R', () => {
    for (const n of [0.5, 1, 2, 4]) {
      const b = sersicBn(n);
      // With R = Re s^n: I R dR is proportional to s^(2n-1) e^(-b s) ds; integrate in s to avoid the cusp.
      const f = (s: number) => Math.pow(s, 2 * n - 1) * Math.exp(-b * s);
      const inside = simpson((u) => 4 * u ** 3 * f(u ** 4), 0, 1, 20000);
      const total = simpson((u) => 4 * u ** 3 * f(u ** 4), 0, Math.pow((2 * n + 80) / b, 0.25), 80000);
      expect(Math.abs(inside / total - 0.5)).toBeLessThan(1e-8);
    }
  });

  it('sersicRadiusAtMuArcsec inverts mu(R)', () => {
    for (const n of [0.5, 1, 4, 10]) {
      for (const rArcsec of [0.5, 10, 45, 300, 2000]) {
        const mu = sersicMuMagPerArcsec2(rArcsec, 45, n, 21.5);
        expect(Math.abs(sersicRadiusAtMuArcsec(mu, 45, n, 21.5) / rArcsec - 1)).toBeLessThan(1e-10);
      }
    }
    expect(sersicRadiusAtMuArcsec(21.5, 45, 4, 21.5)).toBeCloseTo(45, 12);
    // Brighter than the centre: no radius reaches it.
    expect(sersicRadiusAtMuArcsec(10, 45, 4, 21.5)).toBe(0);
  });

  it('rejects a non-positive index', () => {
    expect(() => sersicBn(0)).toThrow(/must be positive/);
    expect(() => sersicBn(-1)).toThrow(/must be positive/);
  });
});
