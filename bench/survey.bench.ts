/**
 * Survey benchmark (issue: survey mode): `haloweave survey` run in this process on invented surveys made by the
 * scenario generator: 25 galaxies of 3 000 candidates each over 184 nights (goal < 30 s), and 100 galaxies of 3 000
 * candidates each (goal < 2 min); each planned (worker threads, one per core) and scheduled. Then the same command
 * again with nothing changed (every galaxy skipped by its content hash: the schedule alone), and the schedule's
 * figures: candidate blocks, method, masks scheduled and the gap to the bound. Last, the heuristic against the
 * exact optimum (HiGHS) on invented surveys crowded in RA, so that masks compete for the same nights.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { printTable, type BenchRow } from './harness';
import { surveyScenario, SURVEY_FILE } from '../src/core/survey/exampleSurvey';
import { main } from '../src/cli/main';
import highsLoader from 'highs';
import type { HighsLike } from '../src/core/solver/jointIlp';
import { scheduleSurvey, type ScheduleSettings } from '../src/core/survey/schedule';
import type { MaskRequest } from '../src/core/survey/blocks';

const silent = { out: () => {}, err: () => {} };

/** Wall time and CPU time (user + system of this process, worker threads included) of one command. */
async function timed(argv: string[]): Promise<{ ms: number; cpuMs: number; code: number }> {
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  const code = await main(argv, silent);
  const c1 = process.cpuUsage(c0);
  return { ms: performance.now() - t0, cpuMs: (c1.user + c1.system) / 1000, code };
}

export default async function run(): Promise<void> {
  const rows: BenchRow[] = [];
  const cases: [string, number, number][] = [['25 galaxies x 3 000 candidates, 184 nights', 25, 30_000], ['100 galaxies x 3 000 candidates, 184 nights', 100, 120_000]];
  for (const [name, galaxies, goalMs] of cases) {
    const dir = mkdtempSync(join(tmpdir(), 'haloweave-survey-bench-'));
    try {
      const files = surveyScenario({ galaxies, candidates: 3000, seed: 555, from: '2027-02-01', to: '2027-08-03' });
      for (const [n, t] of Object.entries(files)) writeFileSync(join(dir, n), t);
      const argv = ['survey', join(dir, SURVEY_FILE), '--out', join(dir, 'out'), '--quiet'];
      const full = await timed(argv);
      const again = await timed(argv);
      const report = JSON.parse(readFileSync(join(dir, 'out', 'survey.json'), 'utf8'));
      const s = report.solver;
      rows.push({ name: `${name}: plan + schedule`, value: full.ms, unit: 'ms', goal: goalMs, lowerIsBetter: true, note: `exit ${full.code}, ${availableParallelism()} workers` });
      rows.push({ name: `${name}: plan + schedule, CPU time of all threads`, value: full.cpuMs, unit: 'cpu ms', note: 'less sensitive than wall time to other work on a shared machine' });
      rows.push({ name: `${name}: re-run, nothing changed (schedule only)`, value: again.ms, unit: 'ms', note: `${report.totals.unchanged} galaxies skipped` });
      rows.push({ name: `${name}: masks scheduled`, value: report.totals.masksScheduled, unit: 'masks', note: `of ${report.totals.masks}; ${s.method}, ${s.candidateBlocks} candidate blocks` });
      rows.push({ name: `${name}: gap to the bound`, value: 100 * s.gap, unit: '%', note: `priority ${s.objective} of bound ${s.bound}` });
      rows.push({ name: `${name}: main-process heap after the run`, value: process.memoryUsage().heapUsed / 2 ** 20, unit: 'MiB' });
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }
  await printTable('Survey: plan every galaxy in parallel and schedule every mask over a semester', rows);
  await printTable('Survey schedule: heuristic against the exact optimum (HiGHS) on crowded invented surveys', await heuristicAgainstExact());
}

/** Invented galaxies crowded in RA (all competing for the same hours), four masks each, at one invented site. */
function crowded(galaxies: number, hours: number): MaskRequest[] {
  const telescope = { key: 'site', label: 'invented 10 m', site: { latDeg: 28.1, lonDeg: -112.7, elevationM: 3100 } };
  const out: MaskRequest[] = [];
  for (let g = 0; g < galaxies; g++) {
    for (let k = 0; k < 4; k++) {
      out.push({
        galaxyId: `Crowd ${g}`, maskId: `m${k + 1}`, priority: 1 + (g % 3), hoursNeeded: hours,
        raDeg: 150 + (g * 37) % 40, decDeg: -5 + (g * 13) % 40, hourAngleWindowH: [-2.5 - (k % 2), 2 + (k % 3) * 0.5], telescope,
      });
    }
  }
  return out;
}

async function heuristicAgainstExact(): Promise<BenchRow[]> {
  const highs = (await highsLoader()) as unknown as HighsLike;
  const rows: BenchRow[] = [];
  const cases: [string, number, number, string, string][] = [
    ['12 galaxies x 4 masks of 2.5 h, 14 nights', 12, 2.5, '2027-03-01', '2027-03-14'],
    ['20 galaxies x 4 masks of 3 h, 21 nights', 20, 3, '2027-03-01', '2027-03-21'],
  ];
  for (const [name, galaxies, hours, from, to] of cases) {
    const reqs = crowded(galaxies, hours);
    const base: ScheduleSettings = { from, to, maxAirmass: 2, maxMoonIllumination: 1, minMoonSeparationDeg: 30, slotMinutes: 10, exactMaxVariables: 0, exactTimeLimitS: 120 };
    let t0 = performance.now();
    const h = scheduleSurvey(reqs, base, highs);
    const hMs = performance.now() - t0;
    t0 = performance.now();
    const e = scheduleSurvey(reqs, { ...base, exactMaxVariables: 10_000_000 }, highs);
    const eMs = performance.now() - t0;
    rows.push({ name: `${name}: heuristic / exact optimum`, value: h.solver.objective / e.solver.objective, unit: 'ratio', note: `${h.solver.objective} vs ${e.solver.objective} (${e.solver.exactStatus}); ${e.solver.candidateBlocks} candidate blocks; knapsack bound ${h.solver.bound.toFixed(1)}` });
    rows.push({ name: `${name}: heuristic schedule`, value: hMs, unit: 'ms' });
    rows.push({ name: `${name}: exact schedule (HiGHS)`, value: eMs, unit: 'ms' });
  }
  return rows;
}
