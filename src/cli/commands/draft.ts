/**
 * `haloweave draft CATALOG --profile P --ra RA --dec DEC --re ARCSEC --axis-ratio Q --pa DEG --vsys KMS --out PLAN`:
 * start a plan from what a user has. Reads the catalog (any supported format), finds its columns and their units,
 * counts the usable rows and the alignment stars near the galaxy, checks the profile for the galaxy's lines, and writes
 * a plan with goals chosen and explained (docs/first-plan.md). Exit 0 with a plan written, 2 on bad input.
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, relative, resolve, sep } from 'node:path';
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { InputError, type Problem } from '../../core/result';
import { loadProfile, looksLikePath, PACKAGE_PROFILE_DIR } from '../loadPlanInputs';
import { readCatalogFile } from '../readCatalogFile';
import { readRawTable } from '../../core/catalog/read';
import { guessColumns } from '../../core/catalog/guessColumns';
import { draftPlan, type DraftGalaxy } from '../../core/plan/draftPlan';
import { draftSummary } from '../../core/plan/draftSummary';
import { parsePlan } from '../../core/plan/validate';
import { parseDecDeg, parseRaDeg } from '../../core/sky/sexagesimal';
import { inspectProfile } from '../../core/profile/inspect';
import { lineSettingsFromOptions, numberOption } from './profile';
import { writeFileAtomic } from '../atomicWrite';

const USAGE = [
  'usage: haloweave draft CATALOG --profile ID|FILE --ra RA --dec DEC --re ARCSEC --axis-ratio Q --pa DEG --vsys KMS --out PLAN',
  '         [--id NAME] [--distance MPC] [--sersic-n N] [--mu-e MAG] [--masks N] [--lines A,B,...] [--force]',
].join('\n');

const OPTIONS = ['profile', 'ra', 'dec', 're', 'axis-ratio', 'pa', 'vsys', 'out', 'id', 'distance', 'sersic-n', 'mu-e', 'masks', 'lines', 'force'];

/** A path as the plan file should name it: relative to the plan's folder, with forward slashes. */
function relativeToPlan(planPath: string, target: string): string {
  return relative(dirname(planPath), target).split(sep).join('/') || '.';
}

export async function run(argv: string[], io: CliIO): Promise<number> {
  const args = parseArgs(argv, ['force']);
  const bad = unknownOptions(args, OPTIONS);
  const problems: Problem[] = [];
  if (bad.length) problems.push({ where: 'options', what: `unknown option${bad.length > 1 ? 's' : ''} ${bad.map((b) => `--${b}`).join(', ')}`, fix: USAGE.split('\n')[0] });
  if (args.positionals.length !== 1) problems.push({ where: 'arguments', what: 'give exactly one catalog file', fix: USAGE.split('\n')[0] });
  for (const k of ['profile', 'ra', 'dec', 're', 'axis-ratio', 'pa', 'vsys', 'out']) {
    if (typeof args.options[k] !== 'string') problems.push({ where: `--${k}`, what: 'is required', fix: describeOption(k) });
  }
  if (problems.length) {
    for (const p of problems) io.err(`haloweave draft: ${p.where}: ${p.what}${p.fix ? ` (${p.fix})` : ''}`);
    io.err(USAGE);
    return 2;
  }
  const o = args.options;
  const ra = parseRaDeg(String(o.ra)), dec = parseDecDeg(String(o.dec));
  if (!ra.ok) problems.push({ where: '--ra', what: ra.error, fix: describeOption('ra') });
  if (!dec.ok) problems.push({ where: '--dec', what: dec.error, fix: describeOption('dec') });
  const reArcsec = numberOption(o.re, 're', NaN, (v) => (v > 0 ? null : 'must be greater than 0 (effective radius in arcsec)'), problems);
  const axisRatio = numberOption(o['axis-ratio'], 'axis-ratio', NaN, (v) => (v > 0 && v <= 1 ? null : 'must be in (0, 1]: the minor-to-major axis ratio b/a'), problems);
  const paDeg = numberOption(o.pa, 'pa', NaN, (v) => (v >= -360 && v <= 360 ? null : 'must be the major-axis PA in degrees East of North'), problems);
  const lines = lineSettingsFromOptions(o, NaN, problems);
  const optional = (k: string, check: (v: number) => string | null) => (o[k] === undefined ? undefined : numberOption(o[k], k, NaN, check, problems));
  const distanceMpc = optional('distance', (v) => (v > 0 ? null : 'must be greater than 0 (Mpc)'));
  const sersicN = optional('sersic-n', (v) => (v >= 0.2 && v <= 20 ? null : 'must be a Sersic index between 0.2 and 20'));
  const muE = optional('mu-e', (v) => (v >= 10 && v <= 35 ? null : 'must be the surface brightness at Re in mag/arcsec^2, 10 to 35'));
  const masks = optional('masks', (v) => (Number.isInteger(v) && v >= 1 && v <= 50 ? null : 'must be a whole number of masks, 1 to 50'));
  const catalogArg = args.positionals[0];
  const catalogFile = resolve(catalogArg);
  if (!existsSync(catalogFile)) problems.push({ where: catalogArg, what: 'the catalog file does not exist', fix: 'give the path of your candidate catalog (CSV, TSV, ECSV, VOTable or FITS)' });
  const planPath = resolve(String(o.out));
  if (existsSync(planPath) && o.force !== true) problems.push({ where: '--out', what: `${o.out} exists already`, fix: 'choose another name, or add --force to replace it' });
  if (problems.length) throw new InputError(problems);

  const { profile, path: profilePath } = loadProfile(String(o.profile), process.cwd(), '--profile');
  const galaxy: DraftGalaxy = {
    id: typeof o.id === 'string' && o.id.trim() ? o.id.trim() : 'my galaxy',
    raDeg: (ra as { value: number }).value, decDeg: (dec as { value: number }).value,
    reArcsec, axisRatio, paDeg, vsysKms: lines.vsysKms, distanceMpc, sersicN, muE,
  };
  const insp = inspectProfile(profile, lines, profilePath);
  if (insp.problems.length) throw new InputError(insp.problems);

  // The catalog: columns by name or by value, then read and validated as `plan` will read it.
  io.err(`haloweave draft: reading ${catalogArg}`);
  const raw = readRawTable(new Uint8Array(readFileSync(catalogFile)), catalogArg);
  const guess = guessColumns(raw, galaxy);
  if (guess.problems.length) throw new InputError(guess.problems.map((what) => ({ where: catalogArg, what })));
  const catalog = readCatalogFile(catalogFile, guess.mapping, { source: catalogArg });
  if (catalog.targets.length === 0) {
    throw new InputError([{ where: catalogArg, what: `none of the ${catalog.rowsRead} rows can be used (first reasons: ${catalog.rejects.slice(0, 3).map((r) => `line ${r.line}: ${r.reason}`).join('; ')})`, fix: 'check the columns named below and the file' }]);
  }
  const instrument = looksLikePath(String(o.profile)) || !resolve(profilePath).startsWith(resolve(PACKAGE_PROFILE_DIR)) ? relativeToPlan(planPath, profilePath) : profile.id;
  const draft = draftPlan({
    galaxy, profile, instrument, catalogPath: relativeToPlan(planPath, catalogFile), catalogColumns: guess.mapping,
    targets: catalog.targets, linesA: [...lines.linesA], masks,
  });
  // The draft must be a plan the tool accepts as it stands.
  parsePlan(draft.plan, String(o.out));

  const summary = draftSummary({ catalogName: catalogArg, catalog, guess, facts: draft.facts, profile, lines, usableXFraction: insp.usableXFraction });
  io.out(summary.catalog);
  io.out('columns:');
  for (const line of summary.columns) io.out(`  ${line}`);
  if (summary.carried) io.out(`  ${summary.carried}`);
  for (const n of guess.notes) io.out(`  note: ${n}`);
  io.out(summary.tracers);
  io.out(summary.alignment);
  io.out(summary.profile);
  io.out('choices:');
  for (const c of draft.choices) io.out(`  ${c.key} = ${JSON.stringify(c.value)}: ${c.why}`);
  for (const w of [...insp.warnings, ...draft.warnings]) io.err(`haloweave draft: warning: ${w}`);
  writeFileAtomic(planPath, JSON.stringify(draft.plan, null, 2) + '\n');
  io.out(`wrote ${planPath}; next: haloweave plan ${String(o.out)} --out DIR (docs/plan-reference.md lists every key to refine it)`);
  return 0;
}

/** What a required option means, for its error line. */
function describeOption(k: string): string {
  return {
    profile: 'an instrument profile id from instrument-profiles/ or the path of your profile file',
    ra: "the galaxy centre's RA in degrees or as 12:34:56.7",
    dec: "the galaxy centre's Dec in degrees or as -05:06:07.8",
    re: 'the effective radius in arcsec (circularised)',
    'axis-ratio': 'b/a of the galaxy, in (0, 1]',
    pa: "the major axis's position angle, degrees East of North",
    vsys: 'the systemic velocity in km/s',
    out: 'the plan file to write, e.g. my-galaxy.plan.json',
  }[k] ?? '';
}
