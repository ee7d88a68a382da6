/**
 * Full-plan benchmark (issue: pointing search, weighting, starlight): on the demo and on invented scenarios of
 * 3 000 and 20 000 candidates with four masks, the time of a full plan (weights, pointing search, joint allocation,
 * starlight and sky slits, lengthening, coverage; the observing report is skipped as it is not part of this goal),
 * and the search against the naive cross layout solved by the same engine: objective, tracer weighted yield,
 * tracer reach and starlight reach.
 */
import { readFileSync } from 'node:fs';
import { medianMs, printTable, type BenchRow } from './harness';
import { demoScenario, generateScenario, scenarioCatalog, type Scenario } from '../src/core/scenario/generator';
import { parsePlan } from '../src/core/plan/validate';
import { parseProfile } from '../src/core/profile/load';
import { solvePlan, type PlanInputs } from '../src/core/pipeline/pipeline';

const profile = parseProfile(JSON.parse(readFileSync(new URL('../instrument-profiles/ridge10-narrow.json', import.meta.url), 'utf8')), 'ridge10-narrow');

function inputs(s: Scenario, searchEnabled: boolean): PlanInputs {
  const plan = parsePlan({ ...s.plan, search: { ...(s.plan.search as object), enabled: searchEnabled } });
  return { plan, profile, catalog: scenarioCatalog(s) };
}

/** Largest R/Re of any usable tracer candidate (what the catalog allows). */
function catalogReachRe(sol: ReturnType<typeof solvePlan>): number {
  return Math.max(0, ...sol.weighting.targets.filter((t) => t.role === 'tracer').map((t) => t.radiusRe));
}

export default async function run(): Promise<void> {
  const cases: [string, Scenario, number][] = [
    ['demo', demoScenario(), 300],
    ['3 000 candidates', generateScenario({ seed: 3000, candidates: 3000, alignmentMagRange: profile.alignment.magRange }), 300],
    ['20 000 candidates', generateScenario({ seed: 20000, candidates: 20000, alignmentMagRange: profile.alignment.magRange }), 2000],
  ];
  const rows: BenchRow[] = [];
  for (const [name, s, goalMs] of cases) {
    const searched = inputs(s, true), naive = inputs(s, false);
    const ms = await medianMs(() => solvePlan(searched, { skipObservingReport: true }), name.startsWith('20') ? 3 : 5);
    const a = solvePlan(searched, { skipObservingReport: true }), b = solvePlan(naive, { skipObservingReport: true });
    const goals = s.plan.goals as { tracerReachRe: number; starlightReachRe: number };
    const msNaive = await medianMs(() => solvePlan(naive, { skipObservingReport: true }), name.startsWith('20') ? 3 : 5);
    rows.push({ name: `${name}: full plan`, value: ms, unit: 'ms', goal: goalMs, lowerIsBetter: true });
    // CPU time of this process per plan (user + system), less sensitive than wall time to other work on a shared machine.
    const reps = name.startsWith('20') ? 3 : 5;
    const c0 = process.cpuUsage();
    for (let i = 0; i < reps; i++) solvePlan(searched, { skipObservingReport: true });
    const c1 = process.cpuUsage(c0);
    rows.push({ name: `${name}: full plan, CPU time (mean of ${reps})`, value: (c1.user + c1.system) / 1000 / reps, unit: 'cpu ms', goal: goalMs, lowerIsBetter: true });
    rows.push({ name: `${name}: full plan without the search (naive layout: one joint allocation)`, value: msNaive, unit: 'ms' });
    rows.push({ name: `${name}: objective, search / naive cross`, value: a.search.objective.total / b.search.objective.total, unit: 'x', goal: 1.0000001, lowerIsBetter: false, note: `${a.search.objective.total.toFixed(1)} vs ${b.search.objective.total.toFixed(1)}` });
    rows.push({ name: `${name}: tracer weighted yield, search / naive`, value: a.search.objective.yieldWeight / b.search.objective.yieldWeight, unit: 'x', note: `${a.search.objective.yieldWeight.toFixed(1)} vs ${b.search.objective.yieldWeight.toFixed(1)}; ${a.coverage.roles.tracer.count} vs ${b.coverage.roles.tracer.count} tracer slits` });
    const reachGoal = Math.min(0.9 * goals.tracerReachRe, catalogReachRe(a));
    rows.push({ name: `${name}: tracer reach (search)`, value: a.coverage.roles.tracer.maxReachRe, unit: 'Re', goal: Number(reachGoal.toFixed(2)), lowerIsBetter: false, note: `naive ${b.coverage.roles.tracer.maxReachRe.toFixed(2)} Re; goal 0.9 x ${goals.tracerReachRe} Re` });
    const emptyA = a.coverage.roles.tracer.emptyBinsFromRe.length, emptyB = b.coverage.roles.tracer.emptyBinsFromRe.length;
    rows.push({ name: `${name}: empty tracer goal bins (search)`, value: emptyA, unit: 'bins', goal: 0, lowerIsBetter: true, note: `naive ${emptyB}` });
    rows.push({ name: `${name}: starlight reach (search)`, value: a.coverage.roles.starlight.maxReachRe, unit: 'Re', goal: goals.starlightReachRe, lowerIsBetter: false, note: `${a.coverage.roles.starlight.count} starlight, ${a.coverage.roles.sky.count} sky slits; naive ${b.coverage.roles.starlight.maxReachRe.toFixed(2)} Re` });
    rows.push({ name: `${name}: search evaluations`, value: a.search.evaluations, unit: 'evals', note: `${a.search.acceptedMoves} moves kept` });
  }
  await printTable('Full plan: pointing search against the naive cross layout (ridge10-narrow, four masks)', rows);
}
