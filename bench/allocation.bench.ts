/**
 * Allocation benchmark (issue 4): invented scenarios of 3 000 and 20 000 candidates (src/core/scenario/generator.ts,
 * fixed seeds) with four masks in the naive cross layout on the long-field profile. Figures: full allocation
 * (projection, eligibility, alignment boxes, joint allocation, slit rows), re-solving one moved mask, tracer yield
 * of the fast path against the exact integer optimum from HiGHS (the highs npm package) and against greedy
 * mask-by-mask allocation. Goals: one-mask re-solve of 3 000 under 5 ms; full allocation of 20 000 under 1 s;
 * yield ratio at least 0.995.
 */
import { readFileSync } from 'node:fs';
import { resolve, dirname } from 'node:path';
import { fileURLToPath } from 'node:url';
import highsLoader from 'highs';
import { medianMs, printTable, type BenchRow } from './harness';
import { generateScenario, scenarioCatalog } from '../src/core/scenario/generator';
import { parsePlan, galaxyModel } from '../src/core/plan/validate';
import { parseProfileText } from '../src/core/profile/load';
import { targetWeights } from '../src/core/pipeline/pipeline';
import { allocateForPointings, allocationContext, jointProblemOf, reallocateOneMask } from '../src/core/solver/allocateMasks';
import { allocateGreedyMaskByMask } from '../src/core/solver/jointAllocation';
import { solveJointExact, type HighsLike } from '../src/core/solver/jointIlp';
import { naiveCrossLayout } from '../src/core/solver/pointingSearch';

const here = dirname(fileURLToPath(import.meta.url));

/** Mean CPU time (user + system, ms) of this process per run of `fn`: less sensitive than wall time to other work on a shared machine. */
function cpuMsPerRun(fn: () => unknown, reps: number): number {
  const c0 = process.cpuUsage();
  for (let i = 0; i < reps; i++) fn();
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / 1000 / reps;
}

export default async function allocationBench(): Promise<void> {
  const highs = (await highsLoader()) as unknown as HighsLike;
  const profile = parseProfileText(readFileSync(resolve(here, '../instrument-profiles/ridge10-narrow.json'), 'utf8'), 'ridge10-narrow');
  const rows: BenchRow[] = [];
  for (const n of [3000, 20000]) {
    const s = generateScenario({ seed: `alloc-bench-${n}`, candidates: n, alignmentMagRange: profile.alignment.magRange as [number, number], instrument: profile.id });
    const plan = parsePlan(s.plan);
    const galaxy = galaxyModel(plan);
    const catalog = scenarioCatalog(s);
    const weights = targetWeights(plan, catalog.targets, []);
    const ctx = allocationContext(profile, galaxy, plan.goals.linesA, catalog.targets, weights);
    const pointings = naiveCrossLayout({ ...plan, masks: [] }, galaxy, profile).map((p) => ({ ...p, locked: true }));
    const full = allocateForPointings(ctx, pointings);
    const candidates = full.prepared.reduce((a, p) => a + p.candidates.objects.length, 0);
    rows.push({ name: `${n} candidates: full allocation, 4 masks`, value: await medianMs(() => allocateForPointings(ctx, pointings), 7), unit: 'ms', goal: n === 20000 ? 1000 : undefined, note: `${candidates} eligible mask-candidates, ${full.joint.chosen.reduce((a, c) => a + c.length, 0)} tracer slits` });
    rows.push({ name: `${n} candidates: full allocation, CPU time (mean of 7)`, value: cpuMsPerRun(() => allocateForPointings(ctx, pointings), 7), unit: 'cpu ms', goal: n === 20000 ? 1000 : undefined });
    // One mask moved by 3 arcsec (a drag step), re-prepared and re-solved with the others fixed.
    let k = 0;
    rows.push({ name: `${n} candidates: re-solve one moved mask`, value: await medianMs(() => {
      const m = k++ % 4;
      const p = pointings[m];
      return reallocateOneMask(ctx, full, m, { ...p, decDeg: p.decDeg + (3 / 3600) * ((k % 2) * 2 - 1) });
    }, 41), unit: 'ms', goal: n === 3000 ? 5 : undefined, note: 'median of 41 drags' });
    rows.push({ name: `${n} candidates: re-solve one moved mask, CPU time (mean of 41)`, value: cpuMsPerRun(() => {
      const m = k++ % 4;
      const p = pointings[m];
      return reallocateOneMask(ctx, full, m, { ...p, decDeg: p.decDeg + (3 / 3600) * ((k % 2) * 2 - 1) });
    }, 41), unit: 'cpu ms', goal: n === 3000 ? 5 : undefined });
    const problem = jointProblemOf(ctx, full.prepared);
    const greedy = allocateGreedyMaskByMask(problem);
    const t0 = performance.now();
    const exact = solveJointExact(highs, problem, 120);
    const highsMs = performance.now() - t0;
    rows.push({ name: `${n} candidates: yield / HiGHS optimum`, value: full.joint.objective / exact.objective, unit: 'ratio', goal: 0.995, lowerIsBetter: false, note: `fast ${full.joint.objective.toFixed(2)}, HiGHS ${exact.objective.toFixed(2)} (${exact.status}, ${highsMs.toFixed(0)} ms), Lagrangian bound ${full.joint.upperBound.toFixed(2)}` });
    rows.push({ name: `${n} candidates: yield / greedy mask-by-mask`, value: full.joint.objective / greedy.objective, unit: 'ratio', note: `greedy ${greedy.objective.toFixed(2)}` });
  }
  await printTable('Slit allocation (issue 4)', rows);
}
