/** `haloweave plan PLAN --out DIR`: solve a plan file and write the contract's output folder (atomically). */
import { lineWindowSettings } from '../../core/profile/wavelength';
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { InputError, type Problem } from '../../core/result';
import { scienceSlitProblems } from '../../core/plan/scienceFeasibility';
import { solvePlan, type PlanSolution } from '../../core/pipeline/pipeline';
import { usableRowCount } from '../../core/catalog/validate';
import { loadPlanInputs, type LoadedPlan } from '../loadPlanInputs';
import { OutputFolder, planOutputFiles, type OutputFolderOptions } from '../outputFolder';
import { CONTRACT_OUTPUT_FILES } from '../../core/check/manifest';
import { excludedTargetsCsv, planSummaryLines } from '../../core/pipeline/summary';
import { unmetGoalLines } from '../../core/coverage/goals';
import { instrumentYieldLines, instrumentYields } from '../../core/pipeline/instrumentYield';

const USAGE = 'usage: haloweave plan PLAN --out DIR [--quiet] [--strict]';

/** How solveAndWrite runs: progress shown or not, and files written into the same atomic folder as the outputs. */
export interface SolveAndWriteOptions extends OutputFolderOptions {
  quiet?: boolean;
  /** Exit 3 (after writing the valid output) when a goal is not met. */
  strict?: boolean;
  /** Extra files (name -> text) written into the output folder with the outputs, e.g. the demo's own inputs. */
  extraFiles?: Record<string, string>;
  /** The name, among extraFiles, of the plan's catalog copied into the folder: solved.plan.json then names it. */
  catalogInFolder?: string;
}

/** Solve loaded plan inputs, write the output folder `out` atomically (outputs plus extra files) and print the summary. */
export function solveAndWrite(loaded: LoadedPlan, out: string, io: CliIO, opts: SolveAndWriteOptions = {}): number {
  // A setup where no science slit can exist is an error named by its cause, before any work.
  // Every profile of the plan (one per spectrograph), with the lines' windows over the velocity range.
  const window = lineWindowSettings(loaded.plan.goals);
  const used = [{ profile: loaded.profile, path: loaded.profilePath }, ...Object.entries(loaded.profilePaths).map(([ref, path]) => ({ profile: loaded.profiles?.[ref] ?? loaded.profile, path }))]
    .filter((u, k, all) => all.findIndex((v) => v.profile.id === u.profile.id) === k);
  const profiles = used.map((u) => ({ id: u.profile.id, path: u.path }));
  const impossible = used.flatMap((u) => scienceSlitProblems(u.profile, loaded.plan.goals.linesA, loaded.plan.galaxy.vsysKms, `instrument profile ${u.profile.id} (${u.path})`, window));
  if (impossible.length) throw new InputError(impossible);
  // The output place is checked, and its temporary folder made, before the solve.
  const folder = OutputFolder.open(out, [...CONTRACT_OUTPUT_FILES, 'excluded-targets.csv', ...Object.keys(opts.extraFiles ?? {})], {
    ...opts,
    // Every profile the masks are designed with (one per spectrograph of a mixed plan), each once.
    profiles: uniqueProfiles([...profiles, ...(opts.profiles ?? [])]),
  });
  for (const note of folder.notes) io.err(`haloweave plan: note: ${note}`);
  try {
    const { files, unmet } = solveToFiles(loaded, out, io, opts);
    folder.commit(files);
    // Said only once the report exists: a run that fails writes no catalog-report.csv.
    const rejects = loaded.catalog.rejects.length;
    if (rejects) io.err(`haloweave plan: ${rejects} catalog problem${rejects > 1 ? 's' : ''} listed in ${out}/catalog-report.csv`);
    io.out(`wrote ${out}/: ${[...Object.keys(files), 'manifest.json'].join(', ')}`);
    // Unmet goals do not stop a valid output: each is named with its cause (also in coverage.json `goals`).
    for (const line of unmet) io.err(`haloweave plan: ${line}`);
    if (unmet.length && opts.strict) {
      io.err(`haloweave plan: --strict: ${unmet.length} goal(s) not met (exit 3); the output in ${out}/ is complete and valid`);
      return 3;
    }
    return 0;
  } catch (e) {
    folder.abandon();
    throw e;
  }
}

/** Solve loaded plan inputs and return the files of the output folder (outputs plus extra files); prints the summary. */
function solveToFiles(loaded: LoadedPlan, out: string, io: CliIO, opts: SolveAndWriteOptions): { files: Record<string, string>; unmet: string[] } {
  const c = loaded.catalog;
  io.err(`haloweave plan: catalog ${c.source} (${c.format}): ${c.rowsRead} rows read, ${usableRowCount(c)} used, ${c.rowsRead - usableRowCount(c)} rejected`);
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
  const noScience = noScienceSlitProblem(solution, loaded.planPath);
  if (noScience) throw new InputError([noScience]);
  for (const w of [...loaded.warnings, ...solution.warnings]) io.err(`haloweave plan: warning: ${w}`);
  const files: Record<string, string> = {
    ...planOutputFiles(solution, loaded, out, opts.catalogInFolder),
    'excluded-targets.csv': excludedTargetsCsv(solution.weighting),
  };
  for (const [name, text] of Object.entries(opts.extraFiles ?? {})) {
    if (name in files) throw new Error(`extra file ${name} would replace an output file`);
    files[name] = text;
  }
  for (const line of planSummaryLines(solution)) io.out(line);
  const yields = instrumentYields(solution.masks, solution.observingReport, loaded.profile.id);
  if (yields.length > 1) for (const line of instrumentYieldLines(yields)) io.out(line);
  return { files, unmet: unmetGoalLines(solution.goals) };
}

/** A problem when the solve placed no tracer and no starlight slit on any mask: such masks observe nothing. */
function noScienceSlitProblem(solution: PlanSolution, planSource: string): Problem | null {
  if (solution.masks.some((m) => m.slits.some((s) => s.role === 'tracer' || s.role === 'starlight'))) return null;
  const eligible = solution.stats.masks.map((m) => `${m.maskId}: ${m.eligibleTracers} eligible tracers`).join(', ');
  return {
    where: planSource,
    what: `no science slit (tracer or starlight) could be placed on any mask (${eligible}); the masks would observe nothing`,
    fix: 'check that catalog tracers fall inside the masks (free locked masks so the search can place them), and the weighting rules that exclude targets',
  };
}

export async function run(argv: string[], io: CliIO): Promise<number> {
  const args = parseArgs(argv, ['quiet', 'strict']);
  const bad = unknownOptions(args, ['out', 'quiet', 'strict']);
  const out = optionText(args, 'out');
  if (args.positionals.length !== 1 || !out || bad.length) {
    if (bad.length) io.err(`haloweave plan: unknown option${bad.length > 1 ? 's' : ''} ${bad.map((b) => `--${b}`).join(', ')}`);
    if (!out) io.err('haloweave plan: --out DIR is required (the output folder)');
    if (args.positionals.length !== 1) io.err('haloweave plan: give exactly one plan file');
    io.err(USAGE);
    return 2;
  }
  return solveAndWrite(loadPlanInputs(args.positionals[0]), out, io, { quiet: args.options.quiet === true, strict: args.options.strict === true });
}

/** Profiles by id, the first of each id kept. */
function uniqueProfiles(list: { id: string; path: string }[]): { id: string; path: string }[] {
  const seen = new Set<string>();
  return list.filter((p) => !seen.has(p.id) && (seen.add(p.id), true));
}
