/**
 * The editor's profile check (src/editor/panels/profileEdit.ts): edited numbers go through the same schema and
 * feasibility checks as `haloweave profile`, the original profile is never touched, and an edited shipped profile
 * gets an id of its own so masks.csv never names a shipped profile for other numbers.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseProfile } from '../../src/core/profile/load';
import {
  asEditedProfile, checkEditedProfile, footprintText, gapsText, numberAt, parseFootprintText, parseGapsText, planLineSettings, withFootprint, withGaps, withNumber,
} from '../../src/editor/panels/profileEdit';

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

  it('footprint corners typed one a line read back as written; a bad line is named by its number', () => {
    expect(parseFootprintText(footprintText(quad.footprint)).corners).toEqual(quad.footprint);
    expect(parseFootprintText('-10 -10\n10,-10\n\n10; 10').corners).toEqual([[-10, -10], [10, -10], [10, 10]]);
    const bad = parseFootprintText('-10 -10\n10\n10 10 4');
    expect(bad.corners).toBeNull();
    expect(bad.problems.map((p) => p.where)).toEqual(['footprint, line 2', 'footprint, line 3']);
  });

  it('a footprint of corners on one line, or a sliver, is degenerate; one lower than the minimal slit leaves no room for a slit', () => {
    // Corners on one line: the schema refuses the outline before any other check.
    const flat = checkEditedProfile(withFootprint(quad, [[-100, 0], [0, 0], [100, 0]]), lines);
    expect(flat.profile).toBeNull();
    expect(flat.problems[0].where).toBe('profile: footprint');
    // A sliver 0.01 arcsec high: a valid outline with less area than one minimal slit.
    const sliver = checkEditedProfile(withFootprint(quad, [[-100, 0], [100, 0], [100, 0.01], [-100, 0.01]]), lines);
    expect(sliver.problems[0].where).toBe('profile: footprint');
    expect(sliver.problems[0].what).toMatch(/encloses 2\.000 square arcsec, less than one minimal slit/);
    const low = checkEditedProfile(withFootprint(quad, [[-100, -2], [100, -2], [100, 2], [-100, 2]]), lines);
    expect(low.problems.map((p) => p.where)).toContain('profile: slits.minLengthArcsec');
    const none = checkEditedProfile(withFootprint(quad, []), lines);
    expect(none.profile).toBeNull();
    expect(none.problems[0].where).toBe('profile: footprint');
  });

  it('detector gaps typed as ranges; a gap over the lines everywhere makes the profile impossible', () => {
    expect(parseGapsText(gapsText([[2040, 2070], [4100, 4130]])).gaps).toEqual([[2040, 2070], [4100, 4130]]);
    expect(parseGapsText('').gaps).toEqual([]);
    expect(parseGapsText('2040-2070, 3000').problems[0].what).toBe('"3000" is not a pixel range');
    const blind = checkEditedProfile(withGaps(quad, [[0, quad.detector.pixels]]), lines);
    expect(blind.problems.map((p) => p.where)).toContain('profile: detector');
  });
});
