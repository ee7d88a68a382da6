/**
 * The observing report of a plan whose masks may use different spectrographs: each mask's refraction rows,
 * hour-angle window and exposure estimates at its own profile's site (latitude, air) and with its own telescope
 * and detector (pipeline/refractionReport.ts per profile, merged back in mask order). Hour angles in hours.
 */
import type { GalaxyModel, PlanFile } from '../plan/schema';
import type { InstrumentProfile } from '../profile/schema';
import type { AllocationContext } from '../solver/allocateMasks';
import { contextFor, withContextSections } from '../solver/maskContext';
import type { MaskSolution } from '../geometry/maskSolution';
import { observingReportForPlan, type ObservingReport } from './refractionReport';
import type { ObservingSettings } from '../observe/observingSettings';
import type { StarlightBinsResult } from '../coverage/goals';

/** One spectrograph's part of a mixed plan's report: its profile id and label, its site, settings and masks. */
export interface InstrumentObservingPart {
  instrument: string;
  label: string;
  site: InstrumentProfile['site'];
  settings: ObservingSettings;
  maskIds: string[];
}

/** An observing report that may span several spectrographs (`instruments` present when it does). */
export interface InstrumentsObservingReport extends ObservingReport {
  instruments?: InstrumentObservingPart[];
}

/**
 * The observing report of solved masks, each at its own profile's site (see the module comment); `measured`, the
 * masks' co-added starlight bins from measureStarlightBins (pipeline.ts), is reused by a one-spectrograph report.
 */
export function observingReportForMasks(plan: PlanFile, ctx: AllocationContext, galaxy: GalaxyModel, masks: MaskSolution[], measured?: StarlightBinsResult): InstrumentsObservingReport {
  if (!ctx.byInstrument) return observingReportForPlan(plan, ctx.profile, galaxy, masks, measured);
  const groups = new Map<string, { profile: InstrumentProfile; plan: PlanFile; masks: MaskSolution[] }>();
  for (const ms of masks) {
    const own = contextFor(ctx, ms.mask), profile = own.profile;
    // Each spectrograph's own observing settings (instruments[].observing over the plan's).
    const g = groups.get(profile.id) ?? { profile, plan: withContextSections(own, plan), masks: [] };
    g.masks.push(ms);
    groups.set(profile.id, g);
  }
  const parts = [...groups.values()].map((g) => ({ g, report: observingReportForPlan(g.plan, g.profile, galaxy, g.masks) }));
  const order = new Map(masks.map((m, i) => [m.mask.id, i]));
  const byOrder = <T extends { maskId: string }>(rows: T[]) => rows.sort((a, b) => order.get(a.maskId)! - order.get(b.maskId)!);
  return {
    galaxyId: galaxy.id,
    settings: parts[0].report.settings,
    masks: byOrder(parts.flatMap((p) => p.report.masks)),
    exposures: byOrder(parts.flatMap((p) => p.report.exposures ?? [])),
    instruments: parts.map(({ g, report }) => ({ instrument: g.profile.id, label: g.profile.label, site: g.profile.site, settings: report.settings, maskIds: g.masks.map((m) => m.mask.id) })),
  };
}
