/**
 * The editor's profile check (src/editor/panels/profileEdit.ts): edited numbers go through the same schema and
 * feasibility checks as `haloweave profile`, the original profile is never touched, and an edited shipped profile
 * gets an id of its own so masks.csv never names a shipped profile for other numbers.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseProfile } from '../../src/core/profile/load';
import { asEditedProfile, checkEditedProfile, numberAt, planLineSettings, withNumber } from '../../src/editor/panels/profileEdit';

const quad = parseProfile(JSON.parse(readFileSync(join(__dirname, '../../instrument-profiles/quad8-square.json'), 'utf8')), 'quad8-square');
const plan = JSON.parse(readFileSync(join(__dirname, '../../examples/demo/halo-demo.plan.json'), 'utf8'));
const lines = planLineSettings(plan);

describe('profile edits in the editor', () => {
  it("the plan's lines: its velocity and lines, the contract's default range and window", () => {
    expect(lines).toEqual({ vsysKms: 1180, linesA: [8498, 8542.1, 8662.1], velocityHalfRangeKms: 500, lineHalfWindowA: 10 });
    expect(planLineSettings({ ...plan, goals: { ...plan.goals, velocityHalfRangeKms: 0, lineHalfWindowA: 0 } }).velocityHalfRangeKms).toBe(0);
  });

  it('a shipped profile passes; a changed number leaves the original untouched', () => {
    expect(checkEditedProfile(quad, lines).problems).toEqual([]);
    const moved = withNumber(quad, ['detector', 'centralWavelengthA'], 8600);
    expect(numberAt(moved, ['detector', 'centralWavelengthA'])).toBe(8600);
    expect(quad.detector.centralWavelengthA).toBe(8500);
    expect(checkEditedProfile(moved, lines).problems).toEqual([]);
  });

  it('a central wavelength far from the lines is impossible, with the central wavelength that would centre them', () => {
    const r = checkEditedProfile(withNumber(quad, ['detector', 'centralWavelengthA'], 6000), lines);
    expect(r.problems).toHaveLength(1);
    expect(r.problems[0].where).toBe('profile: detector');
    expect(r.problems[0].fix).toMatch(/\d+ A would centre the lines/);
  });

  it('a schema problem is named by its key and stops the feasibility check', () => {
    const r = checkEditedProfile(withNumber(quad, ['detector', 'pixels'], 4096.5), lines);
    expect(r.profile).toBeNull();
    expect(r.problems.map((p) => p.where)).toEqual(['profile: detector.pixels']);
  });

  it('an edited shipped profile gets an id and label of its own; an unchanged one or a user profile keeps its id', () => {
    const edited = withNumber(quad, ['slits', 'widthArcsec'], 1.0);
    const named = asEditedProfile(edited, quad, ['quad8-square']);
    expect(named.id).toBe('quad8-square-edited');
    expect(named.label).toMatch(/\(edited\)$/);
    expect(asEditedProfile(quad, quad, ['quad8-square']).id).toBe('quad8-square');
    expect(asEditedProfile({ ...edited, id: 'mine' }, quad, ['quad8-square']).id).toBe('mine');
  });
});
