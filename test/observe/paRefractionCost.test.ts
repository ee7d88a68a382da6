/** Refraction cost of a mask PA over its hour-angle window. */
import { describe, expect, it } from 'vitest';
import { paRefractionCostArcsec } from '../../src/core/observe/paRefractionCost';
import { differentialRefractionArcsec } from '../../src/core/observe/refraction';
import { altitudeDeg } from '../../src/core/observe/horizon';
import { parallacticAngleDeg } from '../../src/core/observe/parallactic';
import { PMath } from '../../src/core/numeric/portableMath';

const air = { pressureHPa: 765, temperatureC: 10, relativeHumidity: 0.3 };
const base = { decDeg: 0, latDeg: 20, air, scienceRangeA: [4000, 9000] as [number, number] };

describe('PA refraction cost (Filippenko 1982, PASP 94, 715: no loss with the slit along the parallactic angle)', () => {
  it('at transit (q = 0 for an object south of the zenith, Meeus eq. 14.1 with H = 0), PA 0 costs nothing and PA 90 costs the whole spread', () => {
    const at = { ...base, windowH: [0, 0] as [number, number] };
    expect(paRefractionCostArcsec(0, at)).toBeLessThan(1e-12);
    expect(paRefractionCostArcsec(180, at)).toBeLessThan(1e-9);
    // z = lat - dec = 20 deg at transit.
    const spread = Math.abs(differentialRefractionArcsec(20, 4000, 9000, air));
    expect(spread).toBeGreaterThan(0.3); // about 0.5" between 4000 and 9000 A at z = 20 deg
    expect(paRefractionCostArcsec(90, at)).toBeCloseTo(spread, 9);
  });
  it('over a window symmetric about transit the cheapest PA is the parallactic angle at transit, and the cost grows with the window', () => {
    const w2 = { ...base, windowH: [-1, 1] as [number, number] };
    const c0 = paRefractionCostArcsec(0, w2);
    for (let pa = 5; pa < 180; pa += 5) expect(paRefractionCostArcsec(pa, w2)).toBeGreaterThan(c0);
    expect(paRefractionCostArcsec(0, { ...base, windowH: [-3, 3] })).toBeGreaterThan(c0);
  });
  it('a window in which the mask centre sets costs Infinity', () => {
    expect(paRefractionCostArcsec(0, { ...base, windowH: [5, 7] })).toBe(Infinity);
  });
});

describe('PA refraction cost: the window samples kept between calls', () => {
  /** The cost summed sample by sample, as the module comment states it (nothing kept between calls). */
  function direct(paDeg: number, decDeg: number, windowH: [number, number], a: typeof air): number {
    let sum = 0;
    for (let i = 0; i < 9; i++) {
      const haDeg = (windowH[0] + ((windowH[1] - windowH[0]) * i) / 8) * 15;
      const alt = altitudeDeg(haDeg, decDeg, base.latDeg);
      if (!(alt > 0)) return Infinity;
      const spread = Math.abs(differentialRefractionArcsec(90 - alt, 4000, 9000, a));
      sum += spread * Math.abs(PMath.sin(((parallacticAngleDeg(haDeg, decDeg, base.latDeg) - paDeg) * Math.PI) / 180));
    }
    return sum / 9;
  }
  it('gives the same bits as the direct sum whether the window was seen before or not (turns of one mask, other Decs, other air)', () => {
    const wetter = { ...air, relativeHumidity: 0.9 };
    let compared = 0;
    for (const decDeg of [-30, -0, 0, 12.5, 40])
      for (const a of [air, wetter])
        for (let pa = 0; pa < 360; pa += 37) {
          const input = { ...base, decDeg, air: a, windowH: [-1.5, 0.5] as [number, number] };
          // Every PA after the first of a (Dec, air) pair reuses that window's samples.
          expect(paRefractionCostArcsec(pa, input)).toBe(direct(pa, decDeg, input.windowH, a));
          compared++;
        }
    expect(compared).toBe(5 * 2 * 10);
    // The humidity changes the refraction: a cache that ignored the air would give the drier value.
    expect(paRefractionCostArcsec(90, { ...base, air: wetter, windowH: [-1.5, 0.5] })).not.toBe(paRefractionCostArcsec(90, { ...base, windowH: [-1.5, 0.5] }));
  });
});
