/**
 * The editor's document: the plan being edited and the instrument profile it names.
 * Everything an undoable command may change lives here; loaded data (the catalog, an image backdrop)
 * and view state (camera, selection) live outside it. Values are immutable: commands return new objects.
 */
import type { PlanFile, PlanMask } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';

export interface EditorDoc {
  plan: PlanFile;
  profile: InstrumentProfile;
}

/** Per-target override as the plan file stores it (`targetOverrides[id]`). */
export type TargetOverride = NonNullable<PlanFile['targetOverrides']>[string];

/** Index of the mask with `maskId` in the plan, or -1. */
export function maskIndex(plan: PlanFile, maskId: string): number {
  return (plan.masks ?? []).findIndex((m) => m.id === maskId);
}

/** The mask with `maskId`, or undefined. */
export function findMask(plan: PlanFile, maskId: string): PlanMask | undefined {
  return (plan.masks ?? []).find((m) => m.id === maskId);
}
