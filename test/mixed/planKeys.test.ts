/** Plan keys of several spectrographs (contract revision 2): validation and the share-out of masks between profiles. */
import { describe, expect, it } from 'vitest';
import { parsePlan } from '../../src/core/plan/validate';
import { InputError } from '../../src/core/result';
import { maskInstrumentRefs, planMaskIds, planProfiles, planWithMaskInstruments } from '../../src/core/plan/instruments';
import { shippedProfile } from './mixedCase';

const base = {
  format: 'haloweave.plan/1',
  galaxy: { id: 'g', ra: 150, dec: -20, reArcsec: 40, axisRatio: 0.8, paDeg: 30, distanceMpc: 15, vsysKms: 1200, sersicN: 4, muE: 21 },
  catalog: 'c.csv',
  goals: { masks: 4, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498, 8542.1, 8662.1] },
};
const instruments = [{ profile: 'ridge10-narrow', masks: 1 }, { profile: 'broad65-wide', masks: 3 }];
const problems = (json: unknown): string[] => {
  try {
    parsePlan(json, 'p.plan.json');
  } catch (e) {
    if (e instanceof InputError) return e.problems.map((p) => `${p.where}: ${p.what}`);
    throw e;
  }
  return [];
};
const profiles = { 'ridge10-narrow': shippedProfile('ridge10-narrow'), 'broad65-wide': shippedProfile('broad65-wide') };

describe('plan keys instrument / instruments', () => {
  it('accepts either key, and the single instrument keeps working', () => {
    expect(problems({ ...base, instrument: 'ridge10-narrow' })).toEqual([]);
    expect(problems({ ...base, instruments })).toEqual([]);
  });

  it('reports both keys, neither, a repeated profile and counts that do not add up to goals.masks, naming the key', () => {
    expect(problems({ ...base, instrument: 'x', instruments })[0]).toMatch(/p\.plan\.json: instruments: .*both "instrument" and "instruments"/);
    expect(problems({ ...base })[0]).toMatch(/p\.plan\.json: instrument: no spectrograph named/);
    expect(problems({ ...base, instruments: [...instruments, { profile: 'ridge10-narrow', masks: 0 }] }).join('\n')).toMatch(/instruments\.2\.profile: "ridge10-narrow" is listed twice/);
    expect(problems({ ...base, instruments: [{ profile: 'a', masks: 2 }, { profile: 'b', masks: 1 }] })[0]).toMatch(/take 2 \+ 1 = 3 masks but goals\.masks is 4/);
  });

  it('gives masks their own instrument first, then fills each instrument\'s count in order', () => {
    const plan = parsePlan({ ...base, instruments, masks: [{ id: 'a', instrument: 'ridge10-narrow' }, { id: 'b' }] });
    expect(planMaskIds(plan)).toEqual(['a', 'b', 'm1', 'm2']);
    expect(maskInstrumentRefs(plan, planMaskIds(plan), profiles)).toEqual(['ridge10-narrow', 'broad65-wide', 'broad65-wide', 'broad65-wide']);
    // A mask may name its profile by the profile's id when the plan names the profile by a path.
    const byPath = parsePlan({ ...base, instruments: [{ profile: './narrow.json', masks: 1 }, { profile: 'broad65-wide', masks: 3 }], masks: [{ id: 'z', instrument: 'broad65-wide' }, { id: 'y', instrument: 'ridge10-narrow' }] });
    const refs = { './narrow.json': profiles['ridge10-narrow'], 'broad65-wide': profiles['broad65-wide'] };
    expect(maskInstrumentRefs(byPath, planMaskIds(byPath), refs)).toEqual(['broad65-wide', './narrow.json', 'broad65-wide', 'broad65-wide']);
    const full = planWithMaskInstruments(byPath, refs);
    expect(full.masks!.map((m) => `${m.id}:${m.instrument}`)).toEqual(['z:broad65-wide', 'y:ridge10-narrow', 'm1:broad65-wide', 'm2:broad65-wide']);
  });

  it('refuses a mask naming an instrument the plan does not list, or more masks than an instrument takes', () => {
    const unknown = parsePlan({ ...base, instruments, masks: [{ id: 'a', instrument: 'quad8-square' }] });
    expect(() => maskInstrumentRefs(unknown, planMaskIds(unknown), profiles)).toThrow(/names "quad8-square", which is not among the plan's instruments/);
    const over = parsePlan({ ...base, instruments, masks: [{ id: 'a', instrument: 'ridge10-narrow' }, { id: 'b', instrument: 'ridge10-narrow' }] });
    expect(() => maskInstrumentRefs(over, planMaskIds(over), profiles)).toThrow(/more masks name "ridge10-narrow" than its 1 in instruments/);
  });

  it('refuses two different profile files with one id (masks.csv names profiles by id)', () => {
    const plan = parsePlan({ ...base, instruments: [{ profile: 'a.json', masks: 2 }, { profile: 'b.json', masks: 2 }] });
    const a = profiles['ridge10-narrow'];
    expect(() => planProfiles(plan, { 'a.json': a, 'b.json': { ...a, telescope: { apertureM: 4 } } })).toThrow(/two different profiles have the id "ridge10-narrow"/);
  });
});
