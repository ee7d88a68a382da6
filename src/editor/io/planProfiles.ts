/**
 * Profiles of a plan with several spectrographs in the editor: the document's own profile for the reference it was
 * opened with (the plan's first), the bundled profiles for the others (io/profiles.ts).
 */
import type { PlanFile } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';
import { planInstrumentRefs } from '../../core/plan/instruments';
import { bundledProfileFor } from './profiles';

/** Every profile of a plan with `instruments`, by the plan's reference; undefined for a plan of one spectrograph. */
export function editorPlanProfiles(plan: PlanFile, profile: InstrumentProfile): Record<string, InstrumentProfile> | undefined {
  if (!plan.instruments?.length) return undefined;
  const out: Record<string, InstrumentProfile> = {};
  planInstrumentRefs(plan).forEach((ref, i) => {
    const p = i === 0 || ref === profile.id ? profile : bundledProfileFor(ref);
    if (p) out[ref] = p;
  });
  return out;
}

/** The references of a plan's instruments the editor has no profile for (beyond the first, the document's own). */
export function missingEditorProfiles(plan: PlanFile, profile: InstrumentProfile): string[] {
  const have = editorPlanProfiles(plan, profile);
  if (!have) return []; // one spectrograph: the document's own profile
  return planInstrumentRefs(plan).filter((ref) => !have[ref]);
}

/** The spectrographs of a plan with their sites, for the nights panel: the document's profile alone for a plan of one. */
export function editorPlanSites(plan: PlanFile, profile: InstrumentProfile): { instrument: string; site: InstrumentProfile['site'] }[] {
  const all = Object.values(editorPlanProfiles(plan, profile) ?? { [profile.id]: profile });
  return all.filter((p, k) => all.findIndex((q) => q.id === p.id) === k).map((p) => ({ instrument: p.id, site: p.site }));
}

/** Each mask's own profile in a plan with several spectrographs (a solved plan names it by reference or id); undefined for one. */
export function editorMaskProfiles(plan: PlanFile, profile: InstrumentProfile): Map<string, InstrumentProfile> | undefined {
  const profiles = editorPlanProfiles(plan, profile);
  if (!profiles) return undefined;
  const out = new Map<string, InstrumentProfile>();
  for (const m of plan.masks ?? []) {
    const own = m.instrument === undefined ? undefined : profiles[m.instrument] ?? Object.values(profiles).find((p) => p.id === m.instrument);
    if (own) out.set(m.id, own);
  }
  return out;
}
