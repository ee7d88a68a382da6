/**
 * Science forecast benchmark: the solved demo plan (4 masks, about 550 slits) forecast with the default trials
 * (goal < 2 s on one core) and with the editor's reduced live trials (the worker's work per drag update), plus the
 * observing report alone (the S/N of every slit, shared with the plan) for scale. One process, one core.
 */
import { readFileSync } from 'node:fs';
import { medianMs, printTable, type BenchRow } from './harness';
import { demoScenario, scenarioCatalog } from '../src/core/scenario/generator';
import { parsePlan, galaxyModel } from '../src/core/plan/validate';
import { parseProfile } from '../src/core/profile/load';
import { solvePlan } from '../src/core/pipeline/pipeline';
import { LIVE_FORECAST_TRIALS } from '../src/core/forecast/live';
import { DEFAULT_TRIALS, forecastPlan } from '../src/core/forecast/forecast';
import { planExposures } from '../src/core/forecast/planExposures';

const profile = parseProfile(JSON.parse(readFileSync(new URL('../instrument-profiles/ridge10-narrow.json', import.meta.url), 'utf8')), 'ridge10-narrow');

export default async function run(): Promise<void> {
  const s = demoScenario();
  const plan = parsePlan(s.plan);
  const sol = solvePlan({ plan, profile, catalog: scenarioCatalog(s) }, { skipObservingReport: true });
  const masks = sol.masks;
  const slits = masks.reduce((a, m) => a + m.slits.length, 0);
  const galaxy = galaxyModel(plan);
  const input = { plan, profile, galaxy, masks };
  const rows: BenchRow[] = [];
  const full = await medianMs(() => forecastPlan({ ...input, trials: DEFAULT_TRIALS }), 5);
  rows.push({ name: `forecast, ${masks.length} masks, ${slits} slits, ${DEFAULT_TRIALS} trials (default)`, value: full, unit: 'ms', goal: 2000, lowerIsBetter: true });
  const c0 = process.cpuUsage();
  for (let i = 0; i < 3; i++) forecastPlan({ ...input, trials: DEFAULT_TRIALS });
  const c1 = process.cpuUsage(c0);
  rows.push({ name: 'same, CPU time (mean of 3)', value: (c1.user + c1.system) / 1000 / 3, unit: 'cpu ms', goal: 2000, lowerIsBetter: true });
  const live = await medianMs(() => forecastPlan({ ...input, trials: LIVE_FORECAST_TRIALS }), 9);
  rows.push({ name: `live forecast in the editor's worker, ${LIVE_FORECAST_TRIALS} trials`, value: live, unit: 'ms', note: 'runs off the main thread; a drag frame only draws its last result' });
  const c2 = process.cpuUsage();
  for (let i = 0; i < 10; i++) forecastPlan({ ...input, trials: LIVE_FORECAST_TRIALS });
  const c3 = process.cpuUsage(c2);
  rows.push({ name: 'same, CPU time (mean of 10)', value: (c3.user + c3.system) / 1000 / 10, unit: 'cpu ms', goal: 16.7, lowerIsBetter: true, note: 'the worker gives one update per this many ms; goal: one frame at 60 Hz' });
  const report = await medianMs(() => planExposures(plan, profile, galaxy, masks), 5);
  rows.push({ name: 'exposure estimates alone (S/N of every slit)', value: report, unit: 'ms' });
  const f = forecastPlan({ ...input, trials: DEFAULT_TRIALS });
  rows.push({ name: 'expected cluster velocities', value: f.expectedVelocities, unit: '' });
  await printTable('Science forecast', rows);
}
