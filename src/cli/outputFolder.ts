/**
 * Output folders written atomically: every file goes into DIR.tmp-<pid>-<time> first, which is then renamed into
 * place, so a failed run never leaves a folder that looks complete. An existing DIR is replaced only when it is
 * empty or every entry in it is one of the files being written (a previous run of the same kind), so no file of
 * the user's is ever deleted.
 */
import { existsSync, mkdirSync, readdirSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import { InputError } from '../core/result';
import type { PlanSolution } from '../core/plan/pipeline';
import { masksToCsv, slitsToCsv } from '../core/export/slitsCsv';
import { catalogReportCsv } from '../core/export/catalogReport';
import type { LoadedPlan } from './loadPlanInputs';
import { looksLikePath } from './loadPlanInputs';

/** Options of writeOutputFolder: entries of an existing DIR that may be replaced besides the files being written. */
export interface OutputFolderOptions {
  alsoReplaces?: (entry: string, dir: string) => boolean;
}

/** Write `files` (name -> text) as the folder `dir`, atomically. */
export function writeOutputFolder(dirArg: string, files: Record<string, string>, opts: OutputFolderOptions = {}): void {
  const dir = resolve(dirArg);
  if (existsSync(dir)) {
    if (!statSync(dir).isDirectory()) throw new InputError([{ where: `--out ${dirArg}`, what: 'exists and is a file', fix: 'choose a folder name for --out' }]);
    const foreign = readdirSync(dir).filter((e) => !Object.prototype.hasOwnProperty.call(files, e) && !opts.alsoReplaces?.(e, dir));
    if (foreign.length) {
      const shown = foreign.slice(0, 5).join(', ') + (foreign.length > 5 ? `, and ${foreign.length - 5} more` : '');
      throw new InputError([{ where: `--out ${dirArg}`, what: `the folder exists and is not a Haloweave output folder this run may replace (it holds ${shown}, which this run does not write); it is left untouched`, fix: 'choose a new or empty folder for --out, or move those files away' }]);
    }
  }
  mkdirSync(dirname(dir), { recursive: true });
  const stamp = `${process.pid}-${Date.now().toString(36)}`;
  const tmp = `${dir}.tmp-${stamp}`;
  try {
    mkdirSync(tmp);
    for (const [name, text] of Object.entries(files)) writeFileSync(join(tmp, name), text);
    let old: string | null = null;
    if (existsSync(dir)) {
      old = `${dir}.old-${stamp}`;
      renameSync(dir, old);
    }
    renameSync(tmp, dir);
    if (old) rmSync(old, { recursive: true, force: true });
  } catch (e) {
    rmSync(tmp, { recursive: true, force: true });
    throw e;
  }
}

/** A path relative to `fromDir`, with forward slashes (as plan files write paths). */
function relativePath(fromDir: string, target: string): string {
  const r = relative(fromDir, target) || '.';
  return sep === '/' ? r : r.split(sep).join('/');
}

/**
 * The contract's output files of a solved plan: masks.csv, slits.csv, coverage.json, solved.plan.json (catalog
 * and instrument paths rewritten relative to the output folder so it loads again) and catalog-report.csv.
 * `catalogInFolder` names a copy of the catalog written into the folder itself, which solved.plan.json then names.
 */
export function planOutputFiles(solution: PlanSolution, loaded: LoadedPlan, outDir: string, catalogInFolder?: string): Record<string, string> {
  const dir = resolve(outDir);
  const masks = solution.masks.map((m) => ({ maskId: m.mask.id, instrument: m.mask.instrument ?? loaded.profile.id, raDeg: m.mask.raDeg, decDeg: m.mask.decDeg, paDeg: m.mask.paDeg }));
  // Profile references that are paths are rewritten relative to the output folder, so solved.plan.json loads from there.
  const ref = (r: string) => (looksLikePath(r) ? relativePath(dir, loaded.profilePaths?.[r] ?? loaded.profilePath) : r);
  const slits = solution.masks.flatMap((m) => [...m.slits].sort((a, b) => a.yArcsec - b.yArcsec));
  const plan = {
    ...solution.plan,
    catalog: catalogInFolder ?? relativePath(dir, loaded.catalogPath),
    ...(solution.plan.instrument !== undefined ? { instrument: ref(solution.plan.instrument) } : {}),
    ...(solution.plan.instruments ? { instruments: solution.plan.instruments.map((i) => ({ ...i, profile: ref(i.profile) })) } : {}),
  };
  return {
    'masks.csv': masksToCsv(masks),
    'slits.csv': slitsToCsv(slits),
    'coverage.json': JSON.stringify(solution.coverage, null, 2) + '\n',
    'solved.plan.json': JSON.stringify(plan, null, 2) + '\n',
    'catalog-report.csv': catalogReportCsv(loaded.catalog.rejects),
  };
}
