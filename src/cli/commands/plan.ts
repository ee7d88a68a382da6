/** `haloweave plan PLAN --out DIR`: solve a plan file and write the contract's output folder (atomically). */
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { InputError } from '../../core/result';
import { solvePlan, type PlanSolution } from '../../core/plan/pipeline';
import { loadPlanInputs } from '../loadPlanInputs';
import { planOutputFiles, writeOutputFolder } from '../outputFolder';
import { coverageSummaryLines, excludedTargetsCsv } from '../../core/coverage/summary';
import { formatRefractionSummary } from '../../core/observe/refractionReport';

const USAGE = 'usage: haloweave plan PLAN --out DIR [--quiet]';

/** Plain-text summary of a solution: slits per mask and the tracer weight allocated (coverage follows from coverage/summary.ts). */
export function solutionSummary(solution: PlanSolution): string[] {
  const lines: string[] = [];
  for (const s of solution.stats.masks) {
    const m = solution.masks.find((x) => x.mask.id === s.maskId)!;
    const byRole = (r: string) => m.slits.filter((x) => x.role === r).length;
    lines.push(`mask ${s.maskId}: ra ${m.mask.raDeg.toFixed(5)} dec ${m.mask.decDeg.toFixed(5)} pa ${m.mask.paDeg.toFixed(2)} deg; ${byRole('tracer')} tracer, ${byRole('starlight')} starlight, ${byRole('sky')} sky slits, ${byRole('alignment')} alignment boxes (${s.eligibleTracers} eligible tracers)`);
  }
  const ub = solution.stats.tracerWeightUpperBound;
  lines.push(`tracer weight allocated: ${solution.stats.tracerWeight.toFixed(3)}${Number.isFinite(ub) ? ` (upper bound for these pointings ${ub.toFixed(3)})` : ''}`);
  return lines;
}

export async function run(argv: string[], io: CliIO): Promise<number> {
  const args = parseArgs(argv, ['quiet']);
  const bad = unknownOptions(args, ['out', 'quiet']);
  const out = optionText(args, 'out');
  if (args.positionals.length !== 1 || !out || bad.length) {
    if (bad.length) io.err(`haloweave plan: unknown option${bad.length > 1 ? 's' : ''} ${bad.map((b) => `--${b}`).join(', ')}`);
    if (!out) io.err('haloweave plan: --out DIR is required (the output folder)');
    if (args.positionals.length !== 1) io.err('haloweave plan: give exactly one plan file');
    io.err(USAGE);
    return 2;
  }
  const quiet = args.options.quiet === true;
  const loaded = loadPlanInputs(args.positionals[0]);
  const c = loaded.catalog;
  io.err(`haloweave plan: catalog ${c.source} (${c.format}): ${c.rowsRead} rows read, ${c.targets.length} used, ${c.rowsRead - c.targets.length} rejected${c.rejects.length ? ` (${c.rejects.length} problems listed in ${out}/catalog-report.csv)` : ''}`);
  let lastShown = -1;
  const solution = solvePlan(loaded, {
    onProgress: (fraction, message) => {
      const pct = Math.round(fraction * 100);
      if (quiet || pct === lastShown) return;
      lastShown = pct;
      io.err(`haloweave plan: [${String(pct).padStart(3)}%] ${message}`);
    },
  });
  if (solution.problems.length) throw new InputError(solution.problems);
  for (const w of [...loaded.warnings, ...solution.warnings]) io.err(`haloweave plan: warning: ${w}`);
  writeOutputFolder(out, { ...planOutputFiles(solution, loaded, out), 'excluded-targets.csv': excludedTargetsCsv(solution.weighting) });
  for (const line of solutionSummary(solution)) io.out(line);
  for (const line of coverageSummaryLines(solution)) io.out(line);
  if (solution.observingReport) for (const line of formatRefractionSummary(solution.observingReport)) io.out(line);
  io.out(`wrote ${out}/: masks.csv, slits.csv, coverage.json, solved.plan.json, catalog-report.csv, excluded-targets.csv`);
  return 0;
}
