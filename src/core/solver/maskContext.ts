/**
 * A mask's own allocation context in a plan with several spectrographs (solver/instrumentContexts.ts builds them):
 * the lookup by the mask's `instrument` (profile id), and what a tracer is worth on that mask. Type-only imports,
 * so the allocation modules can use it without depending on how the contexts are built.
 */
import type { AllocationContext } from './allocateMasks';
import type { InstrumentContext } from './instrumentContexts';
import type { MaskPointing } from '../geometry/maskSolution';

/** The context of a mask's own profile (its `instrument` id), or the plan's context when it has only one. */
export function contextFor(ctx: AllocationContext, mask: Pick<MaskPointing, 'instrument'>): AllocationContext {
  return (mask.instrument !== undefined ? ctx.byInstrument?.get(mask.instrument) : undefined) ?? ctx;
}

/** The plan with the observing and starlight sections of a context's own profile (instruments[].observing); the plan itself with one profile. */
export function withContextSections<P extends object>(ctx: AllocationContext, plan: P): P {
  const own = (ctx as Partial<InstrumentContext>).sections;
  return own ? { ...plan, ...own } : plan;
}

/** Per-candidate values of object indices on a mask of this context (weight x value factor), or undefined in a single-profile plan. */
export function candidateValues(ctx: AllocationContext, objects: ArrayLike<number>): Float64Array | undefined {
  const f = (ctx as Partial<InstrumentContext>).valueFactor;
  if (!f) return undefined;
  const out = new Float64Array(objects.length);
  for (let k = 0; k < objects.length; k++) out[k] = ctx.weights[objects[k]] * f[objects[k]];
  return out;
}

/** Value of a finished tracer row on a mask of this context: its weight (priority) x the value factor of its magnitude. */
export function tracerRowValue(ctx: AllocationContext, priority: number, mag: number | null): number {
  const f = (ctx as Partial<InstrumentContext>).valueFactorOfMag;
  return f && mag !== null ? priority * f(mag) : priority;
}
