/**
 * The candidate blocks of a survey schedule: every (mask, night, start) at which the mask's whole exposure fits
 * (survey/visibility.ts), on the slot grid of the mask's telescope. A block occupies the half-open slot range
 * [start, start + slots) of its night; two blocks of one telescope and night overlap exactly when their ranges do.
 */
import type { SiteGeodetic } from '../observe/moon';

/** The telescope a mask is observed with: masks with the same key share its nights (one block at a time). */
export interface SurveyTelescope {
  key: string;
  /** For people: the instrument profile's label or id. */
  label: string;
  site: SiteGeodetic;
}

/** One mask to schedule. */
export interface MaskRequest {
  galaxyId: string;
  maskId: string;
  /** Weight of the mask in the objective (the galaxy's priority). */
  priority: number;
  /** Hours of telescope time the mask needs (exposure plus overheads). */
  hoursNeeded: number;
  /** Galaxy centre, ICRS degrees. */
  raDeg: number;
  decDeg: number;
  /** Allowed hour angles of the mask, [start, end] hours (positive West); null when none is allowed. */
  hourAngleWindowH: [number, number] | null;
  telescope: SurveyTelescope;
}

/** One candidate block: mask index, telescope index, night index, first slot and slot count. */
export interface CandidateBlock {
  mask: number;
  telescope: number;
  night: number;
  startSlot: number;
  slots: number;
}

/** Number of slots of slotHours that hold `hours` (a block may end inside its last slot). */
export function slotsFor(hours: number, slotHours: number): number {
  return Math.max(1, Math.ceil(hours / slotHours - 1e-9));
}

/** Total priority of a set of chosen candidates. */
export function scheduleWeight(chosen: readonly number[], candidates: readonly CandidateBlock[], requests: readonly MaskRequest[]): number {
  let w = 0;
  for (const c of chosen) w += requests[candidates[c].mask].priority;
  return w;
}

/**
 * Check a set of chosen candidates: each mask at most once, no two blocks of one telescope and night sharing a slot.
 * Returns a description of the first conflict, or null.
 */
export function scheduleConflict(chosen: readonly number[], candidates: readonly CandidateBlock[]): string | null {
  const masks = new Set<number>();
  const used = new Map<string, number>();
  for (const i of chosen) {
    const c = candidates[i];
    if (masks.has(c.mask)) return `mask ${c.mask} is scheduled twice`;
    masks.add(c.mask);
    for (let s = c.startSlot; s < c.startSlot + c.slots; s++) {
      const key = `${c.telescope}/${c.night}/${s}`;
      if (used.has(key)) return `blocks ${used.get(key)} and ${i} share slot ${key}`;
      used.set(key, i);
    }
  }
  return null;
}
