/// <reference lib="webworker" />
/**
 * The science forecast (src/core/forecast/forecast.ts) off the main thread: one request per layout, the reply
 * carries the forecast and its compute time; in a plan of several spectrographs each mask uses its own profile. The
 * panel keeps at most one request in flight (latest wins).
 */
import { forecastPlan, type Forecast } from '../../core/forecast/forecast';
import type { GalaxyModel, PlanFile } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { MaskSolution } from '../../core/geometry/maskSolution';
import { editorMaskProfiles } from '../io/planProfiles';

export interface ForecastRequest { id: number; plan: PlanFile; profile: InstrumentProfile; galaxy: GalaxyModel; masks: MaskSolution[]; trials: number; seed: number }
export type ForecastReply = { id: number; forecast: Forecast; computeMs: number } | { id: number; error: string };

self.onmessage = (ev: MessageEvent<ForecastRequest>) => {
  const r = ev.data;
  const t0 = performance.now();
  try {
    const maskProfiles = editorMaskProfiles(r.plan, r.profile);
    const forecast = forecastPlan({ plan: r.plan, profile: r.profile, maskProfiles, galaxy: r.galaxy, masks: r.masks, trials: r.trials, seed: r.seed });
    (self as unknown as DedicatedWorkerGlobalScope).postMessage({ id: r.id, forecast, computeMs: performance.now() - t0 } satisfies ForecastReply);
  } catch (e) {
    (self as unknown as DedicatedWorkerGlobalScope).postMessage({ id: r.id, error: (e as Error).message } satisfies ForecastReply);
  }
};
