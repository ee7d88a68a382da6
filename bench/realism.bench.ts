/**
 * Spectral and photometric realism: the cost of the wavelength rule over the velocity range (full plan, goals
 * 3 000 candidates < 0.3 s and 20 000 < 2 s, observing report skipped as in plan.bench.ts), of the observing report
 * with the design hour angle chosen per mask (Moon-lit sky, exposure fit), of co-adding starlight per bin and the
 * Moon from a date, and of the spectral report.
 */
import { readFileSync } from 'node:fs';
import { medianMs, printTable, type BenchRow } from './harness';
import { demoScenario, generateScenario, scenarioCatalog, type Scenario } from '../src/core/scenario/generator';
import { parsePlan } from '../src/core/plan/validate';
import { parseProfile } from '../src/core/profile/load';
import { solvePlan } from '../src/core/pipeline/pipeline';
import { observingReportForPlan } from '../src/core/pipeline/refractionReport';
import { spectralReport } from '../src/core/spectro/spectralReport';
import { coaddStarlightBins, planStarlightModels } from '../src/core/solver/starlightCoadd';
import { planSkyMagPerArcsec2 } from '../src/core/observe/planSky';
import type { AllocationContext } from '../src/core/solver/allocateMasks';

const profile = parseProfile(JSON.parse(readFileSync(new URL('../instrument-profiles/ridge10-narrow.json', import.meta.url), 'utf8')), 'ridge10-narrow');

export default async function run(): Promise<void> {
  const rows: BenchRow[] = [];
  const cases: [string, Scenario, number][] = [
    ['3 000 candidates', generateScenario({ seed: 3000, candidates: 3000, alignmentMagRange: profile.alignment.magRange }), 300],
    ['20 000 candidates', generateScenario({ seed: 20000, candidates: 20000, alignmentMagRange: profile.alignment.magRange }), 2000],
  ];
  for (const [name, s, goalMs] of cases) {
    const inputs = { plan: parsePlan(s.plan), profile, catalog: scenarioCatalog(s) };
    rows.push({ name: `${name}: full plan, +-500 km/s and +-10 A windows`, value: await medianMs(() => solvePlan(inputs, { skipObservingReport: true }), 3), unit: 'ms', goal: goalMs, lowerIsBetter: true });
    const bare = { ...inputs, plan: parsePlan({ ...s.plan, goals: { ...(s.plan.goals as object), velocityHalfRangeKms: 0, lineHalfWindowA: 0 } }) };
    rows.push({ name: `${name}: full plan, bare rule at v_sys (reference)`, value: await medianMs(() => solvePlan(bare, { skipObservingReport: true }), 3), unit: 'ms' });
    // CPU time of this process (user + system), steadier than wall time on a shared machine.
    for (const [label, inp] of [['windows', inputs], ['bare rule', bare]] as const) {
      const c0 = process.cpuUsage();
      for (let i = 0; i < 3; i++) solvePlan(inp, { skipObservingReport: true });
      const c1 = process.cpuUsage(c0);
      rows.push({ name: `${name}: full plan, ${label}, CPU time (mean of 3)`, value: (c1.user + c1.system) / 1000 / 3, unit: 'cpu ms', goal: label === 'windows' ? goalMs : undefined, lowerIsBetter: true });
    }
  }
  const demo = demoScenario();
  const inputs = { plan: parsePlan(demo.plan), profile, catalog: scenarioCatalog(demo) };
  const sol = solvePlan(inputs, { skipObservingReport: true });
  const moonPlan = parsePlan({ ...demo.plan, observing: { moon: { phaseAngleDeg: 60, separationDeg: 45, altitudeDeg: 40 } } });
  rows.push({ name: 'demo: observing report, design hour angle chosen per mask', value: await medianMs(() => observingReportForPlan(inputs.plan, profile, sol.galaxy, sol.masks), 3), unit: 'ms' });
  const fixedHa = parsePlan({ ...demo.plan, observing: { designHourAngleH: 0 } });
  rows.push({ name: 'demo: observing report, design hour angle given (reference)', value: await medianMs(() => observingReportForPlan(fixedHa, profile, sol.galaxy, sol.masks), 3), unit: 'ms' });
  rows.push({ name: 'demo: observing report with the Moon', value: await medianMs(() => observingReportForPlan(moonPlan, profile, sol.galaxy, sol.masks), 3), unit: 'ms' });
  // Co-adding starlight per bin (solver/starlightCoadd.ts) on the demo's masks without their starlight slits, and the
  // plan's sky with the Moon computed from a date (observe/planSky.ts), against the whole solve of the same plan.
  const lowFloor = parsePlan({ ...demo.plan, observing: { skySystematicFraction: 0.002 }, starlight: { ...(demo.plan.starlight as object), targetSnPerA: 12 } });
  const solLow = solvePlan({ ...inputs, plan: lowFloor }, { skipObservingReport: true });
  const models = planStarlightModels(solLow.plan, { profile, galaxy: solLow.galaxy } as AllocationContext);
  const bare = solLow.masks.map((m) => ({ ...m, slits: m.slits.filter((x) => x.role !== 'starlight') }));
  rows.push({ name: 'demo: full plan, floor 0.2 %, target S/N 12 (reference for the two rows below)', value: await medianMs(() => solvePlan({ ...inputs, plan: lowFloor }, { skipObservingReport: true }), 3), unit: 'ms' });
  rows.push({ name: 'demo: co-adding starlight per bin (stage alone, from no starlight slit)', value: await medianMs(() => coaddStarlightBins(bare, models.stageOf, models.modelOf, models.settings), 5), unit: 'ms' });
  rows.push({ name: 'demo: sky with the Moon of a date (one plan)', value: await medianMs(() => planSkyMagPerArcsec2(19.6, { date: '2027-03-20' }, undefined, profile.site, solLow.galaxy), 20), unit: 'ms' });
  rows.push({ name: 'demo: spectral report', value: await medianMs(() => spectralReport(inputs.plan, profile, sol.masks.map((m) => m.mask.id)), 20), unit: 'ms' });
  await printTable('Spectral and photometric realism', rows);
}
