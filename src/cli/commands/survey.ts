/**
 * `haloweave survey SURVEY --out DIR`: plan every galaxy of a survey file in parallel (worker threads, progress per
 * galaxy), each into DIR/<galaxy id>/ (a complete `haloweave plan` output folder); skip galaxies whose inputs did not
 * change since the last run (content hashes kept in DIR/survey.json); then schedule every mask of the planned
 * galaxies into the semester's nights and write DIR/schedule.csv, DIR/survey.json and DIR/calendar.svg.
 * One galaxy's bad input is reported and the others go on; the exit status is 2 at the end if any galaxy failed
 * on its input (70 if on an internal error), 0 otherwise. docs/survey.md describes the files.
 */
import { existsSync, mkdirSync, readFileSync, statSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { basename, dirname, join, relative, resolve } from 'node:path';
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { InputError, formatProblem } from '../../core/result';
import { parseSurveyText, type SurveySettings } from '../../core/survey/schema';
import { scheduleSurvey } from '../../core/survey/schedule';
import { scheduleCsv, surveyReport, type GalaxyRun } from '../../core/survey/report';
import { calendarSvg } from '../../core/survey/calendarSvg';
import type { MaskRequest } from '../../core/survey/blocks';
import type { HighsLike } from '../../core/solver/jointIlp';
import { writeFileAtomic } from '../atomicWrite';
import { loadPlanInputs } from '../loadPlanInputs';
import { galaxyFolderName, galaxyRequests, peekPlan, planInputsHash } from '../survey/galaxyInputs';
import { runPlanJobs } from '../survey/pool';
import type { PlanJob } from '../survey/protocol';

const USAGE = 'usage: haloweave survey SURVEY --out DIR [--jobs N] [--force] [--quiet]';

interface PreviousRun { hash: string | null; folder: string | null; status: string }

/** Hashes and folders of the previous run's galaxies, by plan file as written (empty when there was none). */
function previousRuns(outDir: string): Map<string, PreviousRun> {
  const p = join(outDir, 'survey.json');
  const out = new Map<string, PreviousRun>();
  if (!existsSync(p)) return out;
  try {
    const json = JSON.parse(readFileSync(p, 'utf8')) as { galaxies?: { plan: string; inputsHash: string | null; folder: string | null; status: string }[] };
    for (const g of json.galaxies ?? []) out.set(g.plan, { hash: g.inputsHash, folder: g.folder, status: g.status });
  } catch {
    // An unreadable survey.json only means nothing is skipped.
  }
  return out;
}

function folderComplete(dir: string): boolean {
  return ['masks.csv', 'slits.csv', 'coverage.json', 'solved.plan.json', 'catalog-report.csv'].every((f) => existsSync(join(dir, f)));
}

async function loadHighs(): Promise<HighsLike | null> {
  try {
    const mod = (await import('highs')) as unknown as { default: () => Promise<HighsLike> };
    return await mod.default();
  } catch {
    return null;
  }
}

export async function run(argv: string[], io: CliIO): Promise<number> {
  const args = parseArgs(argv, ['quiet', 'force']);
  const bad = unknownOptions(args, ['out', 'jobs', 'force', 'quiet']);
  const out = optionText(args, 'out');
  const jobsText = optionText(args, 'jobs');
  const jobsWanted = jobsText === undefined ? undefined : Number(jobsText);
  if (args.positionals.length !== 1 || !out || bad.length || (jobsWanted !== undefined && !(Number.isInteger(jobsWanted) && jobsWanted >= 1))) {
    if (bad.length) io.err(`haloweave survey: unknown option${bad.length > 1 ? 's' : ''} ${bad.map((b) => `--${b}`).join(', ')}`);
    if (!out) io.err('haloweave survey: --out DIR is required (the survey output folder)');
    if (args.positionals.length !== 1) io.err('haloweave survey: give exactly one survey file');
    if (jobsWanted !== undefined && !(Number.isInteger(jobsWanted) && jobsWanted >= 1)) io.err(`haloweave survey: --jobs ${jobsText} is not a whole number of at least 1 (parallel planning workers)`);
    io.err(USAGE);
    return 2;
  }
  const quiet = args.options.quiet === true;
  const surveyArg = args.positionals[0];
  const surveyPath = resolve(surveyArg);
  if (!existsSync(surveyPath) || !statSync(surveyPath).isFile()) throw new InputError([{ where: surveyArg, what: 'survey file not found', fix: 'give the path of a survey file (format haloweave.survey/1)' }]);
  const { plans, settings } = parseSurveyText(readFileSync(surveyPath, 'utf8'), surveyArg);
  const outDir = resolve(out);
  if (existsSync(outDir) && !statSync(outDir).isDirectory()) throw new InputError([{ where: `--out ${out}`, what: 'exists and is a file', fix: 'choose a folder name for --out' }]);
  mkdirSync(outDir, { recursive: true });
  const previous = previousRuns(outDir);
  const base = dirname(surveyPath);

  // Galaxies: id and folder from each plan file; unchanged ones skipped.
  const taken = new Set<string>();
  const runs: GalaxyRun[] = [];
  const jobs: PlanJob[] = [];
  const ids = new Map<string, string>();
  for (const [i, entry] of plans.entries()) {
    const planPath = resolve(base, entry.plan);
    // Problems name the plan as a path from the working directory, as `haloweave plan` would.
    const shownPath = relative(process.cwd(), planPath) || planPath;
    const peek = existsSync(planPath) ? peekPlan(planPath) : null;
    const run: GalaxyRun = { id: peek?.galaxyId ?? entry.plan, plan: entry.plan, folder: null, status: 'failed', inputsHash: null, priority: entry.priority, masksPlanned: 0, goals: [], problems: [], warnings: [] };
    runs.push(run);
    if (!peek || !peek.galaxyId) {
      // Let the plan loader say exactly what is wrong with the file.
      try {
        loadPlanInputs(shownPath);
        run.problems = [`${entry.plan}: the galaxy id could not be read`];
      } catch (e) {
        run.problems = e instanceof InputError ? e.problems.map(formatProblem) : [`internal error: ${(e as Error).message}`];
      }
      io.err(`haloweave survey: ${entry.plan}: FAILED, not planned:`);
      for (const p of run.problems) io.err(`haloweave survey:   ${p}`);
      continue;
    }
    const other = ids.get(peek.galaxyId);
    if (other !== undefined) {
      run.problems = [`${entry.plan}: galaxy.id "${peek.galaxyId}" is also the id of ${other}; each galaxy of a survey needs its own id (fix: give this plan's galaxy a different id)`];
      io.err(`haloweave survey: ${run.problems[0]}`);
      continue;
    }
    ids.set(peek.galaxyId, entry.plan);
    const prev = previous.get(entry.plan);
    run.folder = galaxyFolderName(peek.galaxyId, taken);
    run.inputsHash = planInputsHash(planPath, peek.json);
    const unchanged = !args.options.force && run.inputsHash !== null && prev?.hash === run.inputsHash && prev.status !== 'failed' && prev.folder === run.folder && folderComplete(join(outDir, run.folder));
    if (unchanged) {
      run.status = 'unchanged';
      continue;
    }
    jobs.push({ index: i, planPath: shownPath, outDir: join(outDir, run.folder) });
  }
  const skipped = runs.filter((r) => r.status === 'unchanged');
  if (skipped.length) io.err(`haloweave survey: ${skipped.length} galax${skipped.length === 1 ? 'y' : 'ies'} unchanged since the last run (same plan, profile and catalog contents), not planned again: ${skipped.map((r) => r.id).join(', ')}`);

  // Plan the others in parallel.
  const workers = Math.max(1, Math.min(jobsWanted ?? availableParallelism(), jobs.length || 1));
  if (jobs.length) io.err(`haloweave survey: planning ${jobs.length} galax${jobs.length === 1 ? 'y' : 'ies'} on ${workers} worker${workers === 1 ? '' : 's'}`);
  const lastPct = new Map<number, number>();
  let finished = 0;
  const tag = (index: number) => `[${String(finished).padStart(String(jobs.length).length)}/${jobs.length} done] ${runs[index].id}`;
  let internal = false;
  await runPlanJobs(jobs, workers, (m) => {
    const r = runs[m.index];
    if (m.type === 'progress') {
      const pct = Math.floor(m.fraction * 5) * 20;
      if (quiet || (lastPct.get(m.index) ?? -1) >= pct) return;
      lastPct.set(m.index, pct);
      io.err(`haloweave survey: ${tag(m.index)}: ${String(pct).padStart(3)}% ${m.message}`);
      return;
    }
    finished++;
    if (m.ok) {
      r.status = 'planned';
      r.warnings = m.warnings;
      r.catalog = m.catalog;
      if (m.catalog && !quiet) io.err(`haloweave survey: ${runs[m.index].id}: ${m.catalog}`);
      io.err(`haloweave survey: ${tag(m.index)}: planned into ${join(out, r.folder!)}/${m.warnings.length ? ` (${m.warnings.length} warning${m.warnings.length === 1 ? '' : 's'} in survey.json)` : ''}`);
    } else {
      r.status = 'failed';
      r.problems = m.problems;
      if (m.internal) internal = true;
      io.err(`haloweave survey: ${tag(m.index)}: FAILED, not planned:`);
      for (const p of m.problems) io.err(`haloweave survey:   ${p}`);
    }
  });
  for (const r of runs) if (r.status === 'failed') r.folder = null;

  // Schedule every mask of the galaxies that have an output folder.
  const requests: MaskRequest[] = [];
  for (const r of runs) {
    if (r.status === 'failed') continue;
    try {
      const g = galaxyRequests(join(outDir, r.folder!), resolve(base, r.plan), r.priority, settings);
      requests.push(...g.requests);
      r.goals = g.goals;
      r.warnings.push(...g.warnings);
      r.masksPlanned = g.masksPlanned;
    } catch (e) {
      r.status = 'failed';
      r.problems = e instanceof InputError ? e.problems.map(formatProblem) : [`could not read the output folder ${r.folder}: ${(e as Error).message}`];
      r.folder = null;
    }
  }
  const highs = await loadHighs();
  let lastStep = -1;
  const schedule = scheduleSurvey(requests, settings, highs, (f, message) => {
    const step = Math.floor(f * 10);
    if (quiet || step === lastStep) return;
    lastStep = step;
    io.err(`haloweave survey: schedule [${String(Math.round(f * 100)).padStart(3)}%] ${message}`);
  });
  const title = `${basename(surveyArg)}: ${settings.from} to ${settings.to}, airmass <= ${settings.maxAirmass}`;
  const order = runs.filter((r) => r.status !== 'failed').map((r) => r.id);
  writeFileAtomic(join(outDir, 'schedule.csv'), scheduleCsv(schedule));
  writeFileAtomic(join(outDir, 'calendar.svg'), calendarSvg(schedule, order, title));
  const report = surveyReport(relative(outDir, surveyPath).split('\\').join('/'), settings, runs, schedule);
  writeFileAtomic(join(outDir, 'survey.json'), JSON.stringify(report, null, 2) + '\n');

  for (const line of summaryLines(runs, schedule, settings)) io.out(line);
  io.out(`wrote ${out}/: schedule.csv, survey.json, calendar.svg and ${runs.filter((r) => r.folder).length} galaxy folders`);
  const failed = runs.filter((r) => r.status === 'failed');
  if (failed.length) {
    io.err(`haloweave survey: ${failed.length} galax${failed.length === 1 ? 'y' : 'ies'} failed (see above and survey.json): ${failed.map((r) => r.id).join(', ')}`);
    return internal ? 70 : 2;
  }
  return 0;
}

/** Plain-text summary of a survey run: per galaxy masks and hours scheduled, then the solver's figures. */
function summaryLines(runs: GalaxyRun[], schedule: ReturnType<typeof scheduleSurvey>, settings: SurveySettings): string[] {
  const lines = [`Survey ${settings.from} to ${settings.to}: ${schedule.blocks.length} of ${schedule.masks.length} masks scheduled`];
  const width = Math.max(6, ...runs.map((r) => r.id.length));
  for (const r of runs) {
    const masks = schedule.masks.filter((m) => m.galaxyId === r.id);
    const done = masks.filter((m) => m.block);
    const hoursNeeded = masks.reduce((s, m) => s + m.hoursNeeded, 0), hoursDone = done.reduce((s, m) => s + m.hoursNeeded, 0);
    const unmet = r.goals.filter((g) => !g.met).map((g) => g.name);
    const goals = unmet.length ? `; goals not met: ${unmet.join(', ')}` : '';
    const state = r.status === 'failed' ? 'FAILED (not planned)' : `${done.length}/${masks.length} masks, ${hoursDone.toFixed(1)}/${hoursNeeded.toFixed(1)} h${goals}${r.status === 'unchanged' ? ' (plan unchanged, reused)' : ''}`;
    lines.push(`  ${r.id.padEnd(width)}  ${state}`);
  }
  const s = schedule.solver;
  lines.push(`Schedule: ${s.method === 'exact' ? 'exact integer program (HiGHS)' : 'heuristic'}: ${s.why}.`);
  lines.push(`  total priority scheduled ${s.objective.toFixed(2)}, upper bound ${s.bound.toFixed(2)}, gap ${(s.gap * 100).toFixed(1)} %`);
  return lines;
}
