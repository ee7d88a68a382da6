/**
 * Undoable edits of the editor document. A command is built from the document it will change, so it
 * captures exactly the values it replaces; `undo` puts those very values (or their absence) back.
 * Angles: PA degrees East of North in [0, 360); positions ICRS degrees.
 */
import type { PlanFile, PlanMask } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';
import { wrap360Deg } from '../../core/sky/angles';
import { maskIndex, type CatalogEntry, type EditorDoc, type TargetOverride } from './document';

export interface Command {
  /** Short text for the history list and the undo button's tooltip. */
  label: string;
  do(doc: EditorDoc): EditorDoc;
  undo(doc: EditorDoc): EditorDoc;
}

/** Replace one mask object (by id) in the plan; the mask must exist. */
function withMask(plan: PlanFile, maskId: string, mask: PlanMask): PlanFile {
  const i = maskIndex(plan, maskId);
  if (i < 0) throw new Error(`no mask "${maskId}" in the plan`);
  const masks = plan.masks!.slice();
  masks[i] = mask;
  return { ...plan, masks };
}

/** A command that replaces one mask object by `next` and restores the captured previous object on undo. */
function replaceMaskCommand(doc: EditorDoc, maskId: string, label: string, change: (m: PlanMask) => PlanMask): Command {
  const i = maskIndex(doc.plan, maskId);
  if (i < 0) throw new Error(`no mask "${maskId}" in the plan`);
  const before = doc.plan.masks![i];
  const after = change(before);
  return {
    label,
    do: (d) => ({ ...d, plan: withMask(d.plan, maskId, after) }),
    undo: (d) => ({ ...d, plan: withMask(d.plan, maskId, before) }),
  };
}

/** Move a mask centre to (raDeg, decDeg); a mask moved by hand is locked so the pointing search keeps it. */
export function moveMaskCommand(doc: EditorDoc, maskId: string, raDeg: number, decDeg: number): Command {
  return replaceMaskCommand(doc, maskId, `move mask ${maskId}`, (m) => ({ ...m, raDeg: wrap360Deg(raDeg), decDeg, locked: true }));
}

/** Set a mask's PA (degrees East of North, wrapped into [0, 360)); locks the mask like a move. */
export function rotateMaskCommand(doc: EditorDoc, maskId: string, paDeg: number): Command {
  return replaceMaskCommand(doc, maskId, `rotate mask ${maskId}`, (m) => ({ ...m, paDeg: wrap360Deg(paDeg), locked: true }));
}

/** Lock or unlock a mask (a locked mask is kept where it is by the pointing search). */
export function setMaskLockedCommand(doc: EditorDoc, maskId: string, locked: boolean): Command {
  return replaceMaskCommand(doc, maskId, `${locked ? 'lock' : 'unlock'} mask ${maskId}`, (m) => ({ ...m, locked }));
}

/** Replace the whole mask list (e.g. the placements proposed by the pointing search). */
export function setMasksCommand(doc: EditorDoc, masks: PlanMask[], label = 'place masks'): Command {
  const had = Object.prototype.hasOwnProperty.call(doc.plan, 'masks');
  const before = doc.plan.masks;
  return {
    label,
    do: (d) => ({ ...d, plan: { ...d.plan, masks } }),
    undo: (d) => {
      const plan = { ...d.plan, masks: before };
      if (!had) delete (plan as { masks?: PlanMask[] }).masks;
      return { ...d, plan };
    },
  };
}

/** What an override edit does to each target: a number sets the weight, null clears it; same for force. */
export interface OverrideChange {
  weight?: number | null;
  force?: 'in' | 'out' | null;
}

/** Apply an override change to one entry; returns undefined when nothing is left to store. */
function changedOverride(old: TargetOverride | undefined, change: OverrideChange): TargetOverride | undefined {
  const next: TargetOverride = { ...(old ?? {}) };
  if (change.weight === null) delete next.weight;
  else if (change.weight !== undefined) next.weight = change.weight;
  if (change.force === null) delete next.force;
  else if (change.force !== undefined) next.force = change.force;
  return Object.keys(next).length ? next : undefined;
}

/** Change the weight and/or forcing of one target or a selection (plan key `targetOverrides`). */
export function setOverridesCommand(doc: EditorDoc, targetIds: readonly string[], change: OverrideChange): Command {
  const hadKey = Object.prototype.hasOwnProperty.call(doc.plan, 'targetOverrides');
  const beforeMap = doc.plan.targetOverrides;
  const ids = [...new Set(targetIds)];
  const what = change.weight !== undefined ? (change.weight === null ? 'reset the weight' : `set weight ${change.weight}`)
    : change.force === null ? 'release the forcing' : change.force === 'in' ? 'force a slit' : 'force out';
  const label = `${what} for ${ids.length === 1 ? ids[0] : `${ids.length} targets`}`;
  return {
    label,
    do: (d) => {
      const map: Record<string, TargetOverride> = { ...(d.plan.targetOverrides ?? {}) };
      for (const id of ids) {
        const n = changedOverride(map[id], change);
        if (n) map[id] = n;
        else delete map[id];
      }
      return { ...d, plan: { ...d.plan, targetOverrides: map } };
    },
    undo: (d) => {
      const plan = { ...d.plan, targetOverrides: beforeMap };
      if (!hadKey) delete (plan as { targetOverrides?: unknown }).targetOverrides;
      return { ...d, plan };
    },
  };
}

type GalaxyKey = 'reArcsec' | 'axisRatio' | 'paDeg' | 'distanceMpc' | 'vsysKms' | 'sersicN' | 'muE';
type GoalKey = 'masks' | 'tracerReachRe' | 'starlightReachRe';

/** How the user calls each galaxy and goal key, with its unit (undo labels speak these words, never the key names). */
const GALAXY_WORDS: Record<GalaxyKey, [string, string]> = {
  reArcsec: ['effective radius', '″'], axisRatio: ['axis ratio b/a', ''], paDeg: ['galaxy PA', '°'], distanceMpc: ['distance', ' Mpc'],
  vsysKms: ['systemic velocity', ' km/s'], sersicN: ['Sérsic index', ''], muE: ['surface brightness at Re', ' mag/″²'],
};
const GOAL_WORDS: Record<GoalKey, [string, string]> = {
  masks: ['number of masks', ''], tracerReachRe: ['tracer reach goal', ' Re'], starlightReachRe: ['starlight reach goal', ' Re'],
};

/** Set one numeric key of the galaxy model (units as the key name says). */
export function setGalaxyFieldCommand(doc: EditorDoc, key: GalaxyKey, value: number): Command {
  const before = doc.plan.galaxy;
  const after = { ...before, [key]: value };
  return {
    label: `set ${GALAXY_WORDS[key][0]} to ${value}${GALAXY_WORDS[key][1]}`,
    do: (d) => ({ ...d, plan: { ...d.plan, galaxy: after } }),
    undo: (d) => ({ ...d, plan: { ...d.plan, galaxy: before } }),
  };
}

/** Set one numeric goal (number of masks, tracer or starlight reach in Re). */
export function setGoalCommand(doc: EditorDoc, key: GoalKey, value: number): Command {
  const before = doc.plan.goals;
  const after = { ...before, [key]: value };
  return {
    label: `set ${GOAL_WORDS[key][0]} to ${value}${GOAL_WORDS[key][1]}`,
    do: (d) => ({ ...d, plan: { ...d.plan, goals: after } }),
    undo: (d) => ({ ...d, plan: { ...d.plan, goals: before } }),
  };
}

/** Switch the instrument profile; the plan's `instrument` key names the new profile's id. */
export function setProfileCommand(doc: EditorDoc, profile: InstrumentProfile): Command {
  const beforeProfile = doc.profile;
  const beforeInstrument = doc.plan.instrument;
  return {
    label: `switch to instrument ${profile.label ?? profile.id}`,
    do: (d) => ({ ...d, plan: { ...d.plan, instrument: profile.id }, profile }),
    undo: (d) => ({ ...d, plan: { ...d.plan, instrument: beforeInstrument }, profile: beforeProfile }),
  };
}

/**
 * Open a catalog for the plan: the document holds it, and the plan's `catalog` names its file (a path the plan already
 * gives for a file of that name is kept). Undo brings back the catalog before, or none.
 */
export function openCatalogCommand(doc: EditorDoc, entry: CatalogEntry): Command {
  const before = doc.catalog ?? null;
  const beforeName = doc.plan.catalog;
  const name = beforeName.split(/[\\/]/).pop() === entry.file.name ? beforeName : entry.file.name;
  return {
    label: `open catalog ${entry.file.name}`,
    do: (d) => ({ ...d, catalog: entry, plan: { ...d.plan, catalog: name } }),
    undo: (d) => ({ ...d, catalog: before, plan: { ...d.plan, catalog: beforeName } }),
  };
}
