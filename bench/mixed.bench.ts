/**
 * Mixed-instrument benchmark: a 2 + 2 plan (two masks on the 10-m narrow field, two on the 6.5-m wide field) of
 * 20 000 candidates, the full plan (weights, pointing search, joint allocation with per-telescope values, starlight
 * and sky slits, lengthening, coverage; the observing report skipped as in plan.bench.ts) against a goal of 2 s,
 * and the same plan with one instrument (four narrow-field masks) as a same-run reference of the mixed overhead.
 * Then the editor's live update while a mask of the mixed example (examples/mixed) is dragged (worker/liveSolve.ts,
 * one moved mask re-solved), against the full solve of the same locked plan that each update would otherwise cost,
 * and against the live update of the same catalog planned on one instrument.
 */
import { readFileSync } from 'node:fs';
import { medianMs, printTable, type BenchRow } from './harness';
import { parsePlan } from '../src/core/plan/validate';
import { parseProfile } from '../src/core/profile/load';
import { solvePlan, type PlanInputs } from '../src/core/pipeline/pipeline';
import { scenarioCatalog } from '../src/core/scenario/generator';
import { mixedExampleScenario, mixedScenario } from '../src/core/scenario/mixedScenario';
import { liveSolve, resetLiveSolve } from '../src/editor/worker/liveSolve';
import type { PlanFile } from '../src/core/plan/schema';
import type { InstrumentProfile } from '../src/core/profile/schema';

const load = (id: string) => parseProfile(JSON.parse(readFileSync(new URL(`../instrument-profiles/${id}.json`, import.meta.url), 'utf8')), id);

export default async function run(): Promise<void> {
  const narrow = load('ridge10-narrow'), wide = load('broad65-wide');
  const options = { seed: 20000, candidates: 20000, galaxy: { reArcsec: 75 }, fieldHalfSizeRe: 16, alignmentStars: 800 };
  const mixed = mixedScenario(options, [{ profile: narrow, masks: 2 }, { profile: wide, masks: 2 }]);
  const single = mixedScenario(options, [{ profile: narrow, masks: 4 }]);
  const inputs = (s: typeof mixed, profiles: Record<string, typeof narrow>): PlanInputs => ({ plan: parsePlan(s.plan), profile: narrow, catalog: scenarioCatalog(s), profiles });
  const a = inputs(mixed, { [narrow.id]: narrow, [wide.id]: wide }), b = inputs(single, { [narrow.id]: narrow });
  const rows: BenchRow[] = [];
  const msMixed = await medianMs(() => solvePlan(a, { skipObservingReport: true }), 3);
  const msSingle = await medianMs(() => solvePlan(b, { skipObservingReport: true }), 3);
  const c0 = process.cpuUsage();
  const sol = solvePlan(a, { skipObservingReport: true });
  const c1 = process.cpuUsage(c0);
  const c2 = process.cpuUsage();
  solvePlan(b, { skipObservingReport: true });
  const c3 = process.cpuUsage(c2);
  const perInstrument = new Map<string, number>();
  for (const m of sol.masks) perInstrument.set(m.mask.instrument ?? '', (perInstrument.get(m.mask.instrument ?? '') ?? 0) + m.slits.filter((s) => s.role === 'tracer').length);
  rows.push({ name: '2 + 2 mixed plan, 20 000 candidates: full plan', value: msMixed, unit: 'ms', goal: 2000, lowerIsBetter: true });
  rows.push({ name: '2 + 2 mixed plan: full plan, CPU time (one run)', value: (c1.user + c1.system) / 1000, unit: 'cpu ms', goal: 2000, lowerIsBetter: true });
  rows.push({ name: 'same catalog, 4 masks of one instrument: full plan', value: msSingle, unit: 'ms' });
  rows.push({ name: 'same catalog, 4 masks of one instrument: CPU time (one run)', value: (c3.user + c3.system) / 1000, unit: 'cpu ms' });
  rows.push({ name: 'mixed / single-instrument time (wall; CPU)', value: msMixed / msSingle, unit: 'x', note: `CPU ${((c1.user + c1.system) / (c3.user + c3.system)).toFixed(2)} x` });
  rows.push({ name: '2 + 2 mixed plan: tracer slits', value: sol.coverage.roles.tracer.count, unit: 'slits', note: [...perInstrument].map(([k, v]) => `${k} ${v}`).join(', ') });
  rows.push({ name: '2 + 2 mixed plan: joint allocation gap to its Lagrangian bound', value: 100 * (1 - sol.stats.tracerWeight / sol.stats.tracerWeightUpperBound), unit: '%', goal: 0.5, lowerIsBetter: true });
  rows.push({ name: '2 + 2 mixed plan: search evaluations', value: sol.search.evaluations, unit: 'evals', note: `${sol.search.acceptedMoves} moves kept` });
  await printTable('Mixed plan: two spectrographs (ridge10-narrow x 2 + broad65-wide x 2), 20 000 candidates', rows);
  await liveRows(narrow, wide);
}

/** Median and worst time of one live update along a 24-step drag of each mask in turn, and the full locked solve. */
function dragTimes(s: ReturnType<typeof mixedScenario>, profile: InstrumentProfile, profiles: Record<string, InstrumentProfile>) {
  const catalog = scenarioCatalog(s);
  const solved = solvePlan({ plan: parsePlan(s.plan), profile, catalog, profiles }, { skipObservingReport: true }).plan;
  const locked: PlanFile = { ...solved, masks: solved.masks!.map((m) => ({ ...m, locked: true })) };
  const t0 = performance.now();
  solvePlan({ plan: locked, profile, catalog, profiles }, { skipObservingReport: true });
  const fullMs = performance.now() - t0;
  resetLiveSolve();
  const inputs = {};
  liveSolve(locked, profile, catalog, inputs, profiles);
  const times: number[] = [];
  for (let k = 0; k < locked.masks!.length; k++) {
    const m0 = locked.masks![k];
    for (let step = 1; step <= 24; step++) {
      const masks = locked.masks!.map((m, i) => (i === k ? { ...m, raDeg: m0.raDeg! + 0.0008 * step, decDeg: m0.decDeg! + 0.0005 * step, paDeg: (m0.paDeg! + step) % 360 } : m));
      const t = performance.now();
      liveSolve({ ...locked, masks }, profile, catalog, inputs, profiles);
      times.push(performance.now() - t);
    }
  }
  times.sort((a, b) => a - b);
  return { medianMs: times[Math.floor(times.length / 2)], worstMs: times[times.length - 1], fullMs, updates: times.length };
}

async function liveRows(narrow: InstrumentProfile, wide: InstrumentProfile): Promise<void> {
  const example = mixedExampleScenario(narrow, wide);
  const mixed = dragTimes(example, narrow, { [narrow.id]: narrow, [wide.id]: wide });
  const { instruments: _i, ...singlePlan } = example.plan as Record<string, unknown>;
  const single = dragTimes({ ...example, plan: { ...singlePlan, instrument: narrow.id } }, narrow, {});
  const rows: BenchRow[] = [
    { name: 'mixed example: live update of one dragged mask, median', value: mixed.medianMs, unit: 'ms', note: `${mixed.updates} updates` },
    { name: 'mixed example: live update, worst', value: mixed.worstMs, unit: 'ms' },
    { name: 'mixed example: full solve of the locked plan (one run)', value: mixed.fullMs, unit: 'ms' },
    { name: 'live update / full locked solve (mixed)', value: mixed.medianMs / mixed.fullMs, unit: 'x' },
    { name: 'same catalog, 4 masks of one instrument: live update, median', value: single.medianMs, unit: 'ms', note: `full locked solve ${single.fullMs.toFixed(0)} ms` },
    { name: 'mixed / single-instrument live update', value: mixed.medianMs / single.medianMs, unit: 'x' },
  ];
  await printTable('Editor live update while dragging a mask: mixed example (ridge10-narrow x 2 + broad65-wide x 2, 5 000 candidates)', rows);
}
