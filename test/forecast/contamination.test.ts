/** Contamination model: its stated limits (docs/forecast.md) and the distance modulus (definition, common practice). */
import { describe, expect, it } from 'vitest';
import { clusterProbability, distanceModulus } from '../../src/core/forecast/contamination';
import { FORECAST_DEFAULTS } from '../../src/core/forecast/settings';

const c = { fractionAtPivot: 0.2, pivotRe: 5, turnoverAbsMag: -8.4, luminositySigmaMag: 1.3, countSlope: 0.3, colourMean: 1.0, colourSigma: 0.15 };
const turnover = -8.4 + distanceModulus(12);

describe('contamination', () => {
  it('distance modulus of 10 Mpc is 30 mag (5 log10(d / 10 pc))', () => {
    expect(distanceModulus(10)).toBeCloseTo(30, 12);
  });

  it('at the pivot radius, the turnover and the mean colour the contaminant fraction is the one set', () => {
    expect(clusterProbability(turnover, 1.0, 5, 12, c, 3.5)).toBeCloseTo(0.8, 12);
    expect(clusterProbability(null, null, 5, 12, c, 3.5)).toBeCloseTo(0.8, 12);
  });

  it('odds grow as R^(gamma-1) outward (flat contaminants, clusters R^-(gamma-1)), and away from the turnover and colour', () => {
    const odds = (p: number) => (1 - p) / p;
    expect(odds(clusterProbability(turnover, null, 10, 12, c, 3.5)) / odds(clusterProbability(turnover, null, 5, 12, c, 3.5))).toBeCloseTo(2 ** 2.5, 9);
    expect(clusterProbability(turnover + 1.5, null, 5, 12, c, 3.5)).toBeLessThan(clusterProbability(turnover, null, 5, 12, c, 3.5));
    expect(clusterProbability(turnover, 1.6, 5, 12, c, 3.5)).toBeLessThan(0.01);
    expect(clusterProbability(turnover + 9, 3, 40, 12, c, 3.5)).toBeLessThan(1e-40);
  });

  it('no contamination gives probability 1; the defaults are in range', () => {
    expect(clusterProbability(30, 5, 50, 12, { ...c, fractionAtPivot: 0 }, 3.5)).toBe(1);
    expect(FORECAST_DEFAULTS.fractionAtPivot).toBeGreaterThan(0);
  });
});
