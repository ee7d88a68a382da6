/**
 * A profile of the user's own (a profile file they opened, or a shipped profile whose numbers were edited) travels as a
 * file beside the plan: the plan's `instrument` names that file (the contract: "profile id, or a path to a profile
 * file"), so `haloweave plan` and `haloweave check` read the same numbers the editor used. A shipped profile left as it
 * is, is named by its id.
 */
import type { PlanFile } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';
import { bundledProfileFor } from './profiles';

/** The file name a profile is written under beside the plan, or null for a shipped profile unchanged (named by id). */
export function ownProfileFileName(profile: InstrumentProfile): string | null {
  const shipped = bundledProfileFor(profile.id);
  if (shipped && JSON.stringify(shipped) === JSON.stringify(profile)) return null;
  return `${profile.id.replace(/[^A-Za-z0-9_.-]+/g, '_')}.profile.json`;
}

/** The text of a profile file as the editor writes it (JSON, two-space indent). */
export function profileFileText(profile: InstrumentProfile): string {
  return JSON.stringify(profile, null, 2) + '\n';
}

/**
 * The files "Save plan" writes: the plan and, for a profile of the user's own, the profile file the plan names.
 * A plan with several spectrographs names its profiles as it was opened with and is written alone.
 */
export function savedPlanFiles(plan: PlanFile, profile: InstrumentProfile, planName: string): { name: string; content: string }[] {
  const own = plan.instruments?.length ? null : ownProfileFileName(profile);
  const planText = JSON.stringify(own ? { ...plan, instrument: own } : plan, null, 2) + '\n';
  const files = [{ name: planName, content: planText }];
  if (own) files.push({ name: own, content: profileFileText(profile) });
  return files;
}
