/** `haloweave plan PLAN --out DIR`: solve a plan file and write the contract's output folder (atomically). */
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { InputError } from '../../core/result';
import { solvePlan } from '../../core/plan/pipeline';
import { loadPlanInputs, type LoadedPlan } from '../loadPlanInputs';
import { planOutputFiles, writeOutputFolder, type OutputFolderOptions } from '../outputFolder';
import { excludedTargetsCsv, planSummaryLines } from '../../core/coverage/summary';
import { instrumentYieldLines, instrumentYields } from '../../core/plan/instrumentYield';

const USAGE = 'usage: haloweave plan PLAN --out DIR [--quiet]';

/** How solveAndWrite runs: progress shown or not, and files written into the same atomic folder as the outputs. */
export interface SolveAndWriteOptions extends OutputFolderOptions {
  quiet?: boolean;
  /** Extra files (name -> text) written into the output folder with the outputs, e.g. the demo's own inputs. */
  extraFiles?: Record<string, string>;
  /** The name, among extraFiles, of the plan's catalog copied into the folder: solved.plan.json then names it. */
  catalogInFolder?: string;
}

/** Solve loaded plan inputs, write the output folder `out` atomically (outputs plus extra files) and print the summary. */
export function solveAndWrite(loaded: LoadedPlan, out: string, io: CliIO, opts: SolveAndWriteOptions = {}): number {
  const c = loaded.catalog;
  io.err(`haloweave plan: catalog ${c.source} (${c.format}): ${c.rowsRead} rows read, ${c.targets.length} used, ${c.rowsRead - c.targets.length} rejected${c.rejects.length ? ` (${c.rejects.length} problems listed in ${out}/catalog-report.csv)` : ''}`);
  let lastShown = -1;
  const solution = solvePlan(loaded, {
    onProgress: (fraction, message) => {
      const pct = Math.round(fraction * 100);
      if (opts.quiet || pct === lastShown) return;
      lastShown = pct;
      io.err(`haloweave plan: [${String(pct).padStart(3)}%] ${message}`);
    },
  });
  if (solution.problems.length) throw new InputError(solution.problems);
  for (const w of [...loaded.warnings, ...solution.warnings]) io.err(`haloweave plan: warning: ${w}`);
  const files: Record<string, string> = {
    ...planOutputFiles(solution, loaded, out, opts.catalogInFolder),
    'excluded-targets.csv': excludedTargetsCsv(solution.weighting),
  };
  for (const [name, text] of Object.entries(opts.extraFiles ?? {})) {
    if (name in files) throw new Error(`extra file ${name} would replace an output file`);
    files[name] = text;
  }
  writeOutputFolder(out, files, opts);
  for (const line of planSummaryLines(solution)) io.out(line);
  const yields = instrumentYields(solution.masks, solution.observingReport, loaded.profile.id);
  if (yields.length > 1) for (const line of instrumentYieldLines(yields)) io.out(line);
  io.out(`wrote ${out}/: ${Object.keys(files).join(', ')}`);
  return 0;
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
  return solveAndWrite(loadPlanInputs(args.positionals[0]), out, io, { quiet: args.options.quiet === true });
}
