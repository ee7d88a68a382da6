/// <reference lib="webworker" />
/**
 * The solver worker: runs the planning pipeline off the main thread and reports its own compute time.
 * It keeps the latest catalog and profile; each solve request carries only the plan.
 */
import { maskPlaced, solvePlan } from '../../core/pipeline/pipeline';
import type { CatalogReadResult } from '../../core/catalog/types';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { PlanFile } from '../../core/plan/schema';
import type { FromWorker, SolveMode, SolveResult, ToWorker } from './protocol';
import { InputError } from '../../core/result';
import { liveSolve, resetLiveSolve } from './liveSolve';
import { elideKeptMasks } from './keptMasks';
import { editorPlanProfiles } from '../io/planProfiles';
import type { MaskSolution } from '../../core/geometry/maskSolution';

let inputs: { version: number; profile: InstrumentProfile; catalog: CatalogReadResult } | null = null;

/**
 * The plan with every placed mask locked, so the pipeline only allocates (no pointing search). When every listed mask
 * is placed but the goal asks for more, the goal is cut to the listed masks: the solve then shows the masks the
 * editor draws and lists, and the missing ones wait for the pointing search (the Search panel offers them), instead
 * of being placed afresh, unseen, by every allocation.
 */
function lockedPlan(plan: PlanFile): PlanFile {
  const masks = (plan.masks ?? []).map((m) => (maskPlaced(m) ? { ...m, locked: true } : m));
  const allPlaced = masks.length > 0 && masks.every(maskPlaced);
  const goals = allPlaced && plan.goals.masks > masks.length ? { ...plan.goals, masks: masks.length } : plan.goals;
  return { ...plan, masks, goals };
}

function post(msg: FromWorker): void {
  (self as unknown as DedicatedWorkerGlobalScope).postMessage(msg);
}

/** The masks of the last result posted (the client holds its copy of them). */
let lastPosted: MaskSolution[] | null = null;

/** Post a result, leaving out the masks that are the same objects as in the last one posted. */
function postResult(requestId: number, mode: SolveMode, result: SolveResult, computeMs: number): void {
  const { masks, kept } = elideKeptMasks(result.masks, lastPosted);
  lastPosted = result.masks;
  post({ type: 'result', requestId, mode, result: { ...result, masks: masks as MaskSolution[] }, computeMs, keptMasks: kept });
}

/** Solve and keep only cloneable data. */
function solve(plan: PlanFile, mode: SolveMode, requestId: number): void {
  if (!inputs) throw new Error('the worker has no catalog and profile yet');
  const t0 = performance.now();
  // A plan with several spectrographs: each mask with its own profile, in the full solve and in the live one.
  const profiles = editorPlanProfiles(plan, inputs.profile);
  if (mode === 'preview') {
    const result = liveSolve(lockedPlan(plan), inputs.profile, inputs.catalog, inputs, profiles);
    postResult(requestId, mode, result, performance.now() - t0);
    return;
  }
  const sol = solvePlan(
    { plan: mode !== 'plan' ? lockedPlan(plan) : plan, profile: inputs.profile, catalog: inputs.catalog, profiles },
    { onProgress: (fraction, message) => post({ type: 'progress', requestId, fraction, message }) },
  ) as unknown as Record<string, unknown>;
  const computeMs = performance.now() - t0;
  const { plan: solved, galaxy, masks, coverage, warnings, ...rest } = sol;
  const extra: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(rest)) if (typeof v !== 'function') extra[k] = v;
  const result = { plan: solved, galaxy, masks, coverage, warnings: (warnings as string[]) ?? [], extra } as SolveResult;
  postResult(requestId, mode, result, computeMs);
}

self.onmessage = (ev: MessageEvent<ToWorker>) => {
  const msg = ev.data;
  if (msg.type === 'inputs') {
    inputs = { version: msg.inputsVersion, profile: msg.profile, catalog: msg.catalog };
    resetLiveSolve();
    return;
  }
  try {
    solve(msg.plan, msg.mode, msg.requestId);
  } catch (e) {
    const problems = e instanceof InputError ? e.problems : undefined;
    post({ type: 'error', requestId: msg.requestId, message: (e as Error).message ?? String(e), problems });
  }
};
