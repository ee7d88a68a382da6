/**
 * The editor's document: the plan being edited, the instrument profile it names and the catalog opened for it.
 * Everything an undoable command may change lives here (opening a catalog is an edit, undone like any other); other
 * loaded data (an image backdrop) and view state (camera, selection) live outside it. Values are immutable: commands
 * return new objects.
 */
import type { PlanFile, PlanMask } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { CatalogReadResult } from '../../core/catalog/types';

/** A catalog file as opened and as read (its content kept for autosave and export). */
export interface CatalogEntry {
  file: { name: string; content: string | Uint8Array };
  read: CatalogReadResult;
}

export interface EditorDoc {
  plan: PlanFile;
  profile: InstrumentProfile;
  /** The catalog opened for the plan (absent or null: none yet). */
  catalog?: CatalogEntry | null;
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
