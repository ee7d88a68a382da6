/** Changing a mask's spectrograph in the editor (store/instrumentCommands.ts) and each mask's own footprint (view/maskFootprints.ts). */
import { describe, expect, it } from 'vitest';
import { setMaskInstrumentCommand } from '../../src/editor/store/instrumentCommands';
import { maskFootprint } from '../../src/editor/view/maskFootprints';
import { editorPlanSites, missingEditorProfiles } from '../../src/editor/io/planProfiles';
import type { EditorDoc } from '../../src/editor/store/document';
import { parsePlan } from '../../src/core/plan/validate';
import { shippedProfile } from '../mixed/mixedCase';

const plan = parsePlan({
  format: 'haloweave.plan/1', catalog: 'c.csv',
  galaxy: { id: 'g', ra: 150, dec: -20, reArcsec: 40, axisRatio: 0.8, paDeg: 30, distanceMpc: 15, vsysKms: 1200, sersicN: 4, muE: 21 },
  goals: { masks: 3, tracerReachRe: 10, starlightReachRe: 3, linesA: [8498, 8542.1, 8662.1] },
  instruments: [{ profile: 'ridge10-narrow', masks: 2 }, { profile: 'broad65-wide', masks: 1 }],
  masks: [{ id: 'm1', instrument: 'ridge10-narrow', raDeg: 150, decDeg: -20, paDeg: 0 }, { id: 'm2', raDeg: 150.1, decDeg: -20, paDeg: 0 }, { id: 'm3', instrument: 'broad65-wide' }],
});
const doc = { plan, profile: shippedProfile('ridge10-narrow') } as unknown as EditorDoc;

describe('a mask on another instrument', () => {
  it('moves one mask from one instrument\'s count to the other\'s, and undo restores both', () => {
    const cmd = setMaskInstrumentCommand(doc, 'm1', 'broad65-wide');
    const after = cmd.do(doc);
    expect(after.plan.masks![0].instrument).toBe('broad65-wide');
    expect(after.plan.instruments).toEqual([{ profile: 'ridge10-narrow', masks: 1 }, { profile: 'broad65-wide', masks: 2 }]);
    // The result is still a valid plan (counts add up to goals.masks).
    expect(() => parsePlan(after.plan)).not.toThrow();
    expect(cmd.undo(after).plan).toEqual(plan);
  });

  it('a mask without its own instrument leaves the one the share-out gave it (m2: ridge10-narrow)', () => {
    const after = setMaskInstrumentCommand(doc, 'm2', 'broad65-wide').do(doc);
    expect(after.plan.instruments).toEqual([{ profile: 'ridge10-narrow', masks: 1 }, { profile: 'broad65-wide', masks: 2 }]);
  });

  it('draws each mask with its own profile\'s footprint', () => {
    const narrow = shippedProfile('ridge10-narrow');
    expect(maskFootprint(narrow, undefined).points).toEqual(narrow.footprint.flat());
    expect(maskFootprint(narrow, 'broad65-wide').points).toEqual(shippedProfile('broad65-wide').footprint.flat());
    expect(maskFootprint(narrow, 'broad65-wide')).toBe(maskFootprint(narrow, 'broad65-wide'));
  });

  it('the nights panel offers each instrument\'s site', () => {
    expect(editorPlanSites(plan, doc.profile).map((x) => `${x.instrument} ${x.site.latDeg}`)).toEqual(['ridge10-narrow 28.1', 'broad65-wide -27.8']);
    const single = { ...plan, instruments: undefined, instrument: 'ridge10-narrow' };
    expect(editorPlanSites(single, doc.profile).map((x) => x.instrument)).toEqual(['ridge10-narrow']);
  });
});

describe('profiles the editor has for a plan', () => {
  it('a plan of one spectrograph needs only its own profile; a mixed plan names an instrument that is not bundled', () => {
    const single = parsePlan({ ...plan, instruments: undefined, instrument: 'ridge10-narrow', masks: [], goals: { ...plan.goals, masks: 4 } });
    expect(missingEditorProfiles(single, shippedProfile('ridge10-narrow'))).toEqual([]);
    expect(missingEditorProfiles(plan, shippedProfile('ridge10-narrow'))).toEqual([]);
    const foreign = parsePlan({ ...plan, instruments: [{ profile: 'ridge10-narrow', masks: 2 }, { profile: 'no-such-profile', masks: 1 }], masks: [] });
    expect(missingEditorProfiles(foreign, shippedProfile('ridge10-narrow'))).toEqual(['no-such-profile']);
  });
});
