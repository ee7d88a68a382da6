/**
 * Likelihood fits against textbook limits (references.md, "Leads for revision 2"; values marked derived were computed
 * from the cited formula): the dispersion of n normal velocities is known to sigma/sqrt(2n) (Kendall & Stuart), the
 * Fisher error with measurement errors, and the rotation amplitude error sigma_t sqrt(2/N) for uniform azimuths.
 */
import { describe, expect, it } from 'vitest';
import { dispersionFisherErrorKms, fitDispersion, fitRotation } from '../../src/core/forecast/likelihood';
import { makeRng } from '../../src/core/numeric/random';
import { meanAndStd } from '../../src/core/forecast/mocks';

/** -ln L of a dispersion model, evaluated directly (for a brute-force maximum). */
function negLogL(v: number[], e: number[], mean: number, sigma: number): number {
  return v.reduce((s, x, i) => s + 0.5 * (Math.log(sigma * sigma + e[i] * e[i]) + ((x - mean) ** 2) / (sigma * sigma + e[i] * e[i])), 0);
}

describe('dispersion fit', () => {
  it('is the maximum of the likelihood (against a brute-force grid)', () => {
    const rng = makeRng(11);
    const e = Array.from({ length: 40 }, () => rng.uniform(5, 60));
    const v = e.map((ei) => rng.normal(1000, Math.hypot(120, ei)));
    const fit = fitDispersion(v, e);
    let best = { l: Infinity, m: 0, s: 0 };
    for (let m = fit.meanKms - 20; m <= fit.meanKms + 20; m += 0.25)
      for (let s = Math.max(0, fit.sigmaKms - 30); s <= fit.sigmaKms + 30; s += 0.25) {
        const l = negLogL(v, e, m, s);
        if (l < best.l) best = { l, m, s };
      }
    expect(Math.abs(best.m - fit.meanKms)).toBeLessThan(0.3);
    expect(Math.abs(best.s - fit.sigmaKms)).toBeLessThan(0.3);
    expect(negLogL(v, e, fit.meanKms, fit.sigmaKms)).toBeLessThanOrEqual(best.l + 1e-6);
  });

  it('n = 100, sigma = 200 km/s, no errors: scatter 14.14 km/s = sigma/sqrt(2n) (Kendall & Stuart; references.md derived)', () => {
    const rng = makeRng(5);
    const fits: number[] = [];
    const e = new Array(100).fill(0);
    for (let t = 0; t < 3000; t++) fits.push(fitDispersion(e.map(() => rng.normal(0, 200)), e).sigmaKms);
    const st = meanAndStd(fits);
    console.log(`dispersion scatter ${st.std.toFixed(2)} km/s (limit 14.14), mean ${st.mean.toFixed(2)}`);
    // 3000 trials measure the scatter to 1.3 %; 4 % allows 3 sigma.
    expect(Math.abs(st.std / 14.142 - 1)).toBeLessThan(0.04);
    // Maximum likelihood with a fitted mean is biased low by about 3/(4n) (0.75 % here; normal-sample c4 and the
    // (n-1)/n of the variance): within 1.5 %.
    expect(Math.abs(st.mean / 200 - 1)).toBeLessThan(0.015);
  });

  it('with 15 km/s errors: Fisher error 14.22 km/s (references.md, derived), and the mocks agree', () => {
    const e = new Array(100).fill(15);
    expect(dispersionFisherErrorKms(200, e)).toBeCloseTo(14.22, 2);
    const rng = makeRng(6);
    const fits: number[] = [];
    for (let t = 0; t < 3000; t++) fits.push(fitDispersion(e.map(() => rng.normal(0, 200) + rng.normal(0, 15)), e).sigmaKms);
    const st = meanAndStd(fits);
    console.log(`dispersion scatter with 15 km/s errors ${st.std.toFixed(2)} km/s (Fisher 14.22)`);
    expect(Math.abs(st.std / 14.22 - 1)).toBeLessThan(0.04);
  });
});

describe('rotation fit', () => {
  const n = 200, sigma = 100, err = 20;
  const sigmaT = Math.hypot(sigma, err);
  const pa = Array.from({ length: n }, (_, i) => (360 * i) / n);
  const c = pa.map((p) => Math.cos((p * Math.PI) / 180)), s = pa.map((p) => Math.sin((p * Math.PI) / 180));
  const e = new Array(n).fill(err);

  function mocks(amplitude: number, paKin: number, trials: number, seed: number) {
    const rng = makeRng(seed);
    const out = [];
    for (let t = 0; t < trials; t++) {
      const v = pa.map((p) => 500 + amplitude * Math.cos(((p - paKin) * Math.PI) / 180) + rng.normal(0, sigma) + rng.normal(0, err));
      out.push(fitRotation(v, e, c, s)!);
    }
    return out;
  }

  it('uniform azimuths: amplitude error sigma_t sqrt(2/N) (references.md, derived), centred on the injected amplitude', () => {
    const fits = mocks(60, 120, 2000, 8);
    const st = meanAndStd(fits.map((f) => f.amplitudeKms));
    const want = sigmaT * Math.sqrt(2 / n);
    console.log(`amplitude scatter ${st.std.toFixed(2)} km/s (limit ${want.toFixed(2)}), mean ${st.mean.toFixed(2)}`);
    expect(Math.abs(st.std / want - 1)).toBeLessThan(0.06);
    expect(Math.abs(st.mean - 60)).toBeLessThan(0.15 * want + 3 * st.std / Math.sqrt(2000));
    // The kinematic PA error is the amplitude error over the amplitude (small-angle, radians).
    const paSt = meanAndStd(fits.map((f) => ((f.kinematicPaDeg - 120 + 540) % 360) - 180));
    expect(Math.abs(paSt.std / ((want / 60) * (180 / Math.PI)) - 1)).toBeLessThan(0.1);
  });

  it('no rotation: the fitted amplitude is biased up to the Rayleigh mean 1.25 sigma_A (references.md, derived)', () => {
    const fits = mocks(0, 0, 2000, 9);
    const st = meanAndStd(fits.map((f) => f.amplitudeKms));
    // Each component (A cos PAkin, A sin PAkin) has error sigma_t sqrt(2/N) for uniform azimuths (sum cos^2 = N/2);
    // the length of a 2-D normal vector has the Rayleigh mean sqrt(pi/2) sigma = 1.2533 sigma.
    const sigmaA = sigmaT * Math.sqrt(2 / n);
    expect(Math.abs(st.mean / (Math.sqrt(Math.PI / 2) * sigmaA) - 1)).toBeLessThan(0.05);
  });

  it('returns null with fewer than four velocities', () => {
    expect(fitRotation([1, 2, 3], [1, 1, 1], [1, 0, -1], [0, 1, 0])).toBeNull();
  });
});
