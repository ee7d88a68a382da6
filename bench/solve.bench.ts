/**
 * "Every plan solves" benchmark over the generated-galaxy suite (src/core/scenario/suite.ts, 32 invented galaxies,
 * every shipped profile): the share of valid plans (goal 100 %), the search's objective against the naive cross
 * (median and worst, over the cases where the cross is a valid layout; the others count how often it is not),
 * tracer weight and tracer reach (capped at the goal) against the cross (goal: never below 1), the search against a
 * 10x longer search (search.effort 10; goal median >= 0.98), and the full plan time for the suite's 3 000- and
 * 20 000-candidate cases (goals 0.3 s and 2 s): the full plan includes the observing report (refraction, design hour
 * angle, exposure estimates), as `haloweave plan` runs it; the time without that report is printed beside it.
 */
import { readFileSync } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { printTable, type BenchRow } from './harness';
import { suiteScenario, SUITE_SIZE } from '../src/core/scenario/suite';
import { scenarioCatalog } from '../src/core/scenario/generator';
import { parsePlan } from '../src/core/plan/validate';
import { parseProfile } from '../src/core/profile/load';
import { solvePlan } from '../src/core/pipeline/pipeline';

const PROFILE_IDS = ['ridge10-narrow', 'quad8-square', 'broad65-wide'];
const profiles = PROFILE_IDS.map((id) => parseProfile(JSON.parse(readFileSync(new URL(`../instrument-profiles/${id}.json`, import.meta.url), 'utf8')), id));

const median = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); return s.length ? s[Math.floor((s.length - 1) / 2)] : NaN; };

export default async function run(): Promise<void> {
  let valid = 0, naiveInvalid = 0, unmetCases = 0;
  const vsNaive: number[] = [], weightVsNaive: number[] = [], reachVsNaive: number[] = [], vsLong: number[] = [];
  const timeBySize = new Map<number, number[]>(), cpuBySize = new Map<number, number[]>(), noReportBySize = new Map<number, number[]>();
  const push = (m: Map<number, number[]>, n: number, v: number) => { if (!m.has(n)) m.set(n, []); m.get(n)!.push(v); };
  for (let i = 0; i < SUITE_SIZE; i++) {
    const s = suiteScenario(i, profiles);
    const profile = profiles[i % profiles.length];
    const catalog = scenarioCatalog(s);
    const plan = parsePlan(s.plan);
    const solve = (p: typeof plan) => solvePlan({ plan: p, profile, catalog }, { skipObservingReport: true });
    const full = () => solvePlan({ plan, profile, catalog });
    full(); // warm-up
    const c0 = process.cpuUsage(), t0 = performance.now();
    const sol = full();
    const ms = performance.now() - t0, c1 = process.cpuUsage(c0);
    const t1 = performance.now();
    solve(plan);
    const n = s.targets.length;
    push(noReportBySize, n, performance.now() - t1);
    push(timeBySize, n, ms);
    push(cpuBySize, n, (c1.user + c1.system) / 1000);
    if (sol.problems.length === 0) valid++;
    if (sol.goals.some((g) => !g.met)) unmetCases++;
    const naive = solve(parsePlan({ ...s.plan, search: { enabled: false } }));
    if (naive.problems.length) naiveInvalid++;
    else {
      vsNaive.push(sol.search.objective.total / naive.search.objective.total);
      weightVsNaive.push(sol.search.objective.yieldWeight / naive.search.objective.yieldWeight);
      // Reach towards the goal: beyond goals.tracerReachRe the objective does not count it, nor does the observer.
      const goal = (s.plan.goals as { tracerReachRe: number }).tracerReachRe;
      reachVsNaive.push(Math.min(sol.coverage.roles.tracer.maxReachRe, goal) / Math.min(naive.coverage.roles.tracer.maxReachRe, goal));
    }
    const long = solve(parsePlan({ ...s.plan, search: { ...(s.plan.search as object), effort: 10 } }));
    vsLong.push(sol.search.objective.total / long.search.objective.total);
    console.error(`solve bench: case ${i + 1}/${SUITE_SIZE}: ${ms.toFixed(0)} ms, vs 10x ${vsLong[vsLong.length - 1].toFixed(3)}`);
  }
  const rows: BenchRow[] = [
    { name: 'valid plans', value: (100 * valid) / SUITE_SIZE, unit: '%', goal: 100, lowerIsBetter: false, note: `${valid} of ${SUITE_SIZE}` },
    { name: 'naive cross not a valid layout (too few alignment boxes)', value: naiveInvalid, unit: 'cases' },
    { name: 'search / naive cross objective, median', value: median(vsNaive), unit: 'x', goal: 1, lowerIsBetter: false, note: `${vsNaive.length} cases with a valid cross` },
    { name: 'search / naive cross objective, worst', value: Math.min(...vsNaive), unit: 'x', goal: 1, lowerIsBetter: false },
    { name: 'search / naive cross tracer weight, median', value: median(weightVsNaive), unit: 'x' },
    { name: 'search / naive cross tracer weight, worst', value: Math.min(...weightVsNaive), unit: 'x', goal: 1, lowerIsBetter: false },
    { name: 'search / naive cross tracer reach (capped at the goal), median', value: median(reachVsNaive), unit: 'x' },
    { name: 'search / naive cross tracer reach (capped at the goal), worst', value: Math.min(...reachVsNaive), unit: 'x', goal: 1, lowerIsBetter: false },
    { name: 'search / 10x longer search (effort 10) objective, median', value: median(vsLong), unit: 'x', goal: 0.98, lowerIsBetter: false },
    { name: 'search / 10x longer search objective, worst', value: Math.min(...vsLong), unit: 'x' },
    { name: 'cases with an unmet goal (named in coverage.json and on stderr)', value: unmetCases, unit: 'cases' },
  ];
  for (const [n, goal] of [[3000, 300], [20000, 2000]] as const) {
    const t = timeBySize.get(n) ?? [], c = cpuBySize.get(n) ?? [], r = noReportBySize.get(n) ?? [];
    rows.push({ name: `full plan with observing report, ${n} candidates, median over ${t.length} cases`, value: median(t), unit: 'ms', goal, lowerIsBetter: true });
    rows.push({ name: `full plan with observing report, ${n} candidates, worst case`, value: Math.max(...t), unit: 'ms' });
    rows.push({ name: `full plan with observing report, ${n} candidates, CPU time median`, value: median(c), unit: 'cpu ms', goal, lowerIsBetter: true });
    rows.push({ name: `plan without the observing report, ${n} candidates, median`, value: median(r), unit: 'ms' });
  }
  for (const [n, t] of [...timeBySize.entries()].sort((a, b) => a[0] - b[0])) if (n !== 3000 && n !== 20000) rows.push({ name: `full plan with observing report, ${n} candidates, median over ${t.length} cases`, value: median(t), unit: 'ms' });
  await printTable('Every plan solves: the generated-galaxy suite', rows);
}
