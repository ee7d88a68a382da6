/**
 * Editing an instrument profile's numbers in the editor with the same checks as `haloweave profile`: the schema
 * (every bad key by its path) and the profile's own feasibility for the plan's lines (a slit and a box fit, the lines
 * reach the detector). Pure: no React, testable in Node.
 */
import type { InstrumentProfile } from '../../core/profile/schema';
import type { Problem } from '../../core/result';
import { InputError } from '../../core/result';
import { parseProfile } from '../../core/profile/load';
import { inspectProfile, type ProfileInspection } from '../../core/profile/inspect';
import { LINE_WINDOW_DEFAULTS, type LineSettings } from '../../core/profile/lineWindows';

/** A profile number the panel edits: its place in the profile, label and unit. */
export interface EditableNumber {
  path: readonly [string, string];
  label: string;
  unit: string;
}

export const EDITABLE_PROFILE_NUMBERS: readonly EditableNumber[] = [
  { path: ['detector', 'centralWavelengthA'], label: 'central wavelength', unit: 'Å' },
  { path: ['detector', 'dispersionAPerPixel'], label: 'dispersion', unit: 'Å/px' },
  { path: ['detector', 'xArcsecPerPixel'], label: 'pixel scale along x', unit: '″/px' },
  { path: ['detector', 'pixels'], label: 'pixels along the dispersion', unit: 'px' },
  { path: ['detector', 'edgeMarginPixels'], label: 'edge margin', unit: 'px' },
  { path: ['slits', 'minLengthArcsec'], label: 'minimal slit length', unit: '″' },
  { path: ['slits', 'widthArcsec'], label: 'slit width', unit: '″' },
  { path: ['slits', 'gapArcsec'], label: 'gap between slits', unit: '″' },
  { path: ['alignment', 'boxSizeArcsec'], label: 'alignment box', unit: '″' },
];

/** The value of an editable number in a profile. */
export function numberAt(profile: InstrumentProfile, path: EditableNumber['path']): number {
  return (profile as unknown as Record<string, Record<string, number>>)[path[0]][path[1]];
}

/** A copy of the profile with one number changed (the original is not touched). */
export function withNumber(profile: InstrumentProfile, path: EditableNumber['path'], value: number): InstrumentProfile {
  const section = (profile as unknown as Record<string, Record<string, unknown>>)[path[0]];
  return { ...profile, [path[0]]: { ...section, [path[1]]: value } } as InstrumentProfile;
}

/** The plan's line settings: its velocity, lines, and the velocity range and window when it sets them. */
export function planLineSettings(plan: { galaxy: { vsysKms: number }; goals: { linesA: number[] } & Record<string, unknown> }): LineSettings {
  const g = plan.goals;
  return {
    vsysKms: plan.galaxy.vsysKms,
    linesA: g.linesA,
    velocityHalfRangeKms: typeof g.velocityHalfRangeKms === 'number' ? g.velocityHalfRangeKms : LINE_WINDOW_DEFAULTS.velocityHalfRangeKms,
    lineHalfWindowA: typeof g.lineHalfWindowA === 'number' ? g.lineHalfWindowA : LINE_WINDOW_DEFAULTS.lineHalfWindowA,
  };
}

export interface ProfileCheck {
  /** The profile when the schema accepts it, else null. */
  profile: InstrumentProfile | null;
  inspection: ProfileInspection | null;
  /** Schema problems, then impossibilities: the profile can be applied only when there are none. */
  problems: Problem[];
  warnings: string[];
}

/** Check an edited profile for the plan's lines, as `haloweave profile` does. */
export function checkEditedProfile(edited: unknown, lines: LineSettings): ProfileCheck {
  let profile: InstrumentProfile;
  try {
    profile = parseProfile(edited, 'profile');
  } catch (e) {
    if (e instanceof InputError) return { profile: null, inspection: null, problems: e.problems, warnings: [] };
    throw e;
  }
  const inspection = inspectProfile(profile, lines, 'profile');
  return { profile, inspection, problems: inspection.problems, warnings: inspection.warnings };
}

/** The profile to put in the document: an edited copy of a shipped profile gets an id and label of its own. */
export function asEditedProfile(profile: InstrumentProfile, original: InstrumentProfile, shippedIds: readonly string[]): InstrumentProfile {
  if (!shippedIds.includes(profile.id) || JSON.stringify(profile) === JSON.stringify(original)) return profile;
  return { ...profile, id: `${profile.id}-edited`, label: `${profile.label} (edited)` };
}

/** Footprint corners as the panel shows them: one corner a line, `x y` in arcsec in the mask frame. */
export function footprintText(footprint: readonly (readonly number[])[]): string {
  return footprint.map(([x, y]) => `${x} ${y}`).join('\n');
}

/** Numbers of one line of a list typed by hand: separated by spaces, commas or semicolons. */
const numbersOf = (line: string) => line.trim().split(/[\s,;]+/).filter(Boolean).map(Number);

/**
 * Footprint corners from the panel's text (one `x y` a line, arcsec, mask frame; blank lines skipped), or the problems,
 * each naming its line. The polygon itself (enough corners, an area) is checked with the rest of the profile.
 */
export function parseFootprintText(text: string): { corners: [number, number][] | null; problems: Problem[] } {
  const corners: [number, number][] = [];
  const problems: Problem[] = [];
  text.split(/\r?\n/).forEach((line, i) => {
    if (line.trim() === '') return;
    const v = numbersOf(line);
    if (v.length !== 2 || !v.every(Number.isFinite)) {
      problems.push({ where: `footprint, line ${i + 1}`, what: `"${line.trim()}" is not one corner`, fix: 'write each corner as two numbers, x and y in arcsec, e.g. -240 180' });
    } else corners.push([v[0], v[1]]);
  });
  return problems.length ? { corners: null, problems } : { corners, problems };
}

/** Detector gaps as the panel shows them: `p0-p1` pixel ranges separated by commas. */
export function gapsText(gaps: readonly (readonly number[])[]): string {
  return gaps.map(([a, b]) => `${a}-${b}`).join(', ');
}

/** Detector gaps from the panel's text (`p0-p1, p0-p1`, pixels along the dispersion; empty for none), or the problems. */
export function parseGapsText(text: string): { gaps: [number, number][] | null; problems: Problem[] } {
  const gaps: [number, number][] = [];
  const problems: Problem[] = [];
  for (const part of text.split(',').map((s) => s.trim()).filter(Boolean)) {
    const m = /^(-?[\d.]+(?:e-?\d+)?)\s*(?:-|to|\.\.)\s*(-?[\d.]+(?:e-?\d+)?)$/i.exec(part);
    const a = m ? Number(m[1]) : NaN, b = m ? Number(m[2]) : NaN;
    if (!Number.isFinite(a) || !Number.isFinite(b)) {
      problems.push({ where: 'detector gaps', what: `"${part}" is not a pixel range`, fix: 'write each gap as first-last pixel, e.g. 2040-2070, gaps separated by commas' });
    } else gaps.push([a, b]);
  }
  return problems.length ? { gaps: null, problems } : { gaps, problems };
}

/** A copy of the profile with other footprint corners (the original is not touched). */
export function withFootprint(profile: InstrumentProfile, corners: [number, number][]): InstrumentProfile {
  return { ...profile, footprint: corners };
}

/** A copy of the profile with other detector gaps (the original is not touched). */
export function withGaps(profile: InstrumentProfile, gaps: [number, number][]): InstrumentProfile {
  return { ...profile, detector: { ...profile.detector, gapsPixels: gaps } };
}
