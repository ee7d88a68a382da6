/**
 * Yield per spectrograph of a solved plan (masks grouped by their `instrument` profile id): masks, tracer slits and
 * their summed weight, starlight slits, and, from the observing report, the tracers reaching the target S/N per A in
 * the planned exposure and each site. For the plan summary and the editor's yield panel.
 */
import type { MaskSolution } from '../geometry/maskSolution';
import type { InstrumentsObservingReport } from './instrumentsReport';

export interface InstrumentYield {
  instrument: string;
  maskIds: string[];
  tracerSlits: number;
  tracerWeight: number;
  starlightSlits: number;
  /** Tracer slits reaching the target S/N per A (null without an observing report). */
  tracersReachingTarget: number | null;
  /** Latitude and longitude (degrees, East positive) of the site, when the report gives it. */
  site: { latDeg: number; lonDeg: number } | null;
}

/** Yield of each instrument in the order of first use; masks without `instrument` count under `defaultInstrument`. */
export function instrumentYields(masks: readonly MaskSolution[], report: InstrumentsObservingReport | undefined, defaultInstrument: string): InstrumentYield[] {
  const out = new Map<string, InstrumentYield>();
  const reaching = new Map((report?.exposures ?? []).map((e) => [e.maskId, e.tracersReachingTarget]));
  for (const ms of masks) {
    const id = ms.mask.instrument ?? defaultInstrument;
    let y = out.get(id);
    if (!y) {
      const part = report?.instruments?.find((p) => p.instrument === id);
      out.set(id, (y = { instrument: id, maskIds: [], tracerSlits: 0, tracerWeight: 0, starlightSlits: 0, tracersReachingTarget: report?.exposures ? 0 : null, site: part ? { latDeg: part.site.latDeg, lonDeg: part.site.lonDeg } : null }));
    }
    y.maskIds.push(ms.mask.id);
    for (const s of ms.slits) {
      if (s.role === 'tracer') { y.tracerSlits++; y.tracerWeight += s.priority; } else if (s.role === 'starlight') y.starlightSlits++;
    }
    if (y.tracersReachingTarget !== null) y.tracersReachingTarget += reaching.get(ms.mask.id) ?? 0;
  }
  return [...out.values()];
}

/** Plain-text lines: one per instrument (masks, site, slits, weight, tracers reaching the target S/N). */
export function instrumentYieldLines(yields: readonly InstrumentYield[]): string[] {
  return ['yield per instrument:', ...yields.map((y) => {
    const site = y.site ? ` at latitude ${y.site.latDeg.toFixed(2)}, longitude ${y.site.lonDeg.toFixed(2)}` : '';
    const sn = y.tracersReachingTarget === null ? '' : `, ${y.tracersReachingTarget} reaching the target S/N`;
    return `  ${y.instrument} (masks ${y.maskIds.join(', ')}${site}): ${y.tracerSlits} tracer slits (weight ${y.tracerWeight.toFixed(2)}${sn}), ${y.starlightSlits} starlight slits`;
  })];
}
