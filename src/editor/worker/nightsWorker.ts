/// <reference lib="webworker" />
/** Observability over a date range (src/core/observe/night.ts), off the main thread: one row a night. */
import { nightTable, type NightRow } from '../../core/observe/night';

export interface NightsRequest { id: number; from: string; to: string; raDeg: number; decDeg: number; site: { latDeg: number; lonDeg: number; elevationM: number }; maxAirmass: number }
export type NightsReply = { id: number; rows: NightRow[]; computeMs: number } | { id: number; error: string };

self.onmessage = (ev: MessageEvent<NightsRequest>) => {
  const r = ev.data;
  const t0 = performance.now();
  try {
    const rows = nightTable(r.from, r.to, { raDeg: r.raDeg, decDeg: r.decDeg }, r.site, { maxAirmass: r.maxAirmass, stepMinutes: 10 });
    (self as unknown as DedicatedWorkerGlobalScope).postMessage({ id: r.id, rows, computeMs: performance.now() - t0 } satisfies NightsReply);
  } catch (e) {
    (self as unknown as DedicatedWorkerGlobalScope).postMessage({ id: r.id, error: (e as Error).message } satisfies NightsReply);
  }
};
