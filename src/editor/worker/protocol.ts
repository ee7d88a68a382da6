/**
 * Messages between the editor and its solver worker. The catalog and profile are sent once per change
 * (`inputs`); each solve sends only the plan, so a drag posts a few hundred bytes per update.
 */
import type { PlanFile } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { CatalogReadResult } from '../../core/catalog/types';
import type { MaskSolution } from '../../core/geometry/maskSolution';
import type { GalaxyModel } from '../../core/plan/schema';

/**
 * `allocate`: every placed mask kept where it is (after an edit). `plan`: the plan as given, so unlocked
 * masks are placed by the solver. `preview`: the fast one-mask re-solve while a mask is dragged.
 */
export type SolveMode = 'allocate' | 'plan' | 'preview';

export type ToWorker =
  | { type: 'inputs'; inputsVersion: number; profile: InstrumentProfile; catalog: CatalogReadResult }
  | { type: 'solve'; requestId: number; inputsVersion: number; mode: SolveMode; plan: PlanFile };

/** What the editor keeps of a pipeline solution (structured-cloneable). */
export interface SolveResult {
  /** The solved plan: every mask placed. */
  plan: PlanFile;
  galaxy: GalaxyModel;
  masks: MaskSolution[];
  /** coverage.json content as the pipeline computes it. */
  coverage: unknown;
  warnings: string[];
  /** Any further fields of the pipeline's solution (weights, observability...), passed through untouched. */
  extra: Record<string, unknown>;
}

/**
 * A result's `keptMasks` lists the indices of masks that are the very same solution as in the previous result this
 * worker posted (a drag re-solves one mask): their entries in `result.masks` are sent as null and the client puts
 * its own copy back (keptMasks.ts `restoreKeptMasks`), so a live update clones one mask's slits, not every mask's.
 */
export type FromWorker =
  | { type: 'progress'; requestId: number; fraction: number; message: string }
  | { type: 'result'; requestId: number; mode: SolveMode; result: SolveResult; computeMs: number; keptMasks?: number[] }
  | { type: 'error'; requestId: number; message: string; problems?: { where: string; what: string; fix?: string }[] };
