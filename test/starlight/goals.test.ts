/** The starlight goal's reason: the S/N at the goal radius, and a slit length and an exposure that reach the target. */
import { describe, expect, it } from 'vitest';
import { starlightShortfall, starlightSnAtRadius } from '../../src/core/coverage/goals';
import { starlightSettings } from '../../src/core/solver/starlight';
import { loadProfile } from '../search/helpers';
import type { GalaxyModel } from '../../src/core/plan/schema';

const profile = loadProfile('ridge10-narrow');
const galaxy: GalaxyModel = { id: 'Goal Test', raDeg: 10, decDeg: -20, reArcsec: 30, axisRatio: 0.7, paDeg: 20, distanceMpc: 15, vsysKms: 1500, sersicN: 4, muE: 21.5 };
const plan = { galaxy: { ...galaxy, ra: galaxy.raDeg, dec: galaxy.decDeg }, goals: { masks: 4, tracerReachRe: 10, starlightReachRe: 4, linesA: [8498, 8542.1, 8662.1] } } as never;

describe('starlight goal shortfall', () => {
  it('names the S/N at the goal radius and a slit length and exposure that reach the target there', () => {
    // Eight sky slits: with the sky estimated from a fixed length of sky slit (Howell's 1 + n_pix/n_B), a longer slit
    // gains less and less, so a length that reaches the target exists only with enough sky.
    const s = starlightSettings({ exposureS: 3600, targetSnPerA: 3, skyPerMask: 8 }, profile, plan);
    const w = profile.slits.widthArcsec, L = s.maxSlitLengthArcsec;
    const sn = starlightSnAtRadius(galaxy, 4, L, w, s);
    expect(sn).toBeLessThan(3); // at 4 Re in one hour: short of the goal
    const reason = starlightShortfall(galaxy, profile, s, L);
    expect(reason).toContain(`S/N ${sn.toFixed(2)} per A at the goal radius R = 4.00 Re`);
    expect(reason).toMatch(/a starlight slit of [\d.]+"/);
    const length = Number(/a starlight slit of ([\d.]+)"/.exec(reason)?.[1]);
    const hours = Number(/an exposure of ([\d.]+) h/.exec(reason)?.[1]);
    // The named slit length reaches the target; 5 % shorter does not (the S/N rises with the slit's area).
    expect(starlightSnAtRadius(galaxy, 4, length * 1.0001, w, s)).toBeGreaterThanOrEqual(3);
    expect(starlightSnAtRadius(galaxy, 4, length * 0.95, w, s)).toBeLessThan(3);
    // The named exposure (rounded to 0.1 h) reaches it within that rounding; 10 % less does not.
    expect(starlightSnAtRadius(galaxy, 4, L, w, { ...s, exposureS: (hours + 0.05) * 3600 })).toBeGreaterThanOrEqual(3);
    expect(starlightSnAtRadius(galaxy, 4, L, w, { ...s, exposureS: hours * 0.9 * 3600 })).toBeLessThan(3);
  });

  it('says the light allows the goal when the S/N is reached there, and points at the free space instead', () => {
    const s = starlightSettings({ exposureS: 36000, targetSnPerA: 1 }, profile, { ...(plan as object), goals: { masks: 4, tracerReachRe: 10, starlightReachRe: 1, linesA: [8542.1] } } as never);
    expect(starlightShortfall(galaxy, profile, s, s.maxSlitLengthArcsec)).toMatch(/^the light allows it .* no mask leaves free slit space/);
  });
});
