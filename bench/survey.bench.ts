/**
 * Survey benchmark (issue: survey mode): `haloweave survey` run in this process on invented surveys made by the
 * scenario generator: 25 galaxies of 3 000 candidates each over 184 nights (goal < 30 s), and 100 galaxies of 3 000
 * candidates each (goal < 2 min); each planned (worker threads, one per core) and scheduled. Then the same command
 * again with nothing changed (every galaxy skipped by its content hash: the schedule alone), and the schedule's
 * figures: candidate blocks, method, masks scheduled and the gap to the bound.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { printTable, type BenchRow } from './harness';
import { surveyScenario, SURVEY_FILE } from '../src/core/survey/exampleSurvey';
import { main } from '../src/cli/main';

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
}
