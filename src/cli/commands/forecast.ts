/**
 * `haloweave forecast DIR [--trials N] [--seed S] [--against DIR_B] [--from DATE --to DATE] [--json]`: what the
 * planned masks of an output folder will measure (core/forecast/forecast.ts). Writes DIR/forecast.json and the SVG
 * plots DIR/forecast-dispersion.svg, forecast-rotation.svg, forecast-starlight.svg; prints a summary, or both
 * folders side by side with --against (the comparison plots are written to DIR as forecast-*-against.svg).
 */
import { planInstrumentRefs } from '../../core/plan/instruments';
import { existsSync, readFileSync, statSync } from 'node:fs';
import { basename, isAbsolute, join, resolve } from 'node:path';
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { InputError, type Problem } from '../../core/result';
import { parseMasksCsv, parseSlitsCsv } from '../../core/export/slitsCsv';
import { galaxyModel, parsePlanText } from '../../core/plan/validate';
import type { ColumnMapping } from '../../core/catalog/types';
import type { MaskSolution } from '../../core/geometry/maskSolution';
import type { InstrumentProfile } from '../../core/profile/schema';
import { nightTable } from '../../core/observe/night';
import { parseDateText } from '../../core/sky/calendarText';
import { DEFAULT_TRIALS, forecastPlan, type Forecast, type ForecastInput } from '../../core/forecast/forecast';
import { dispersionProfileSvg, rotationSvg, starlightMapSvg } from '../../core/forecast/plots';
import { formatComparison, formatForecastSummary } from '../../core/forecast/summary';
import { loadProfile } from '../loadPlanInputs';
import { readCatalogFile } from '../readCatalogFile';
import { writeFileAtomic } from '../atomicWrite';

const OPTIONS = ['trials', 'seed', 'against', 'from', 'to', 'json'];
const USAGE = 'usage: haloweave forecast DIR [--trials N] [--seed S] [--against DIR_B] [--from YYYY-MM-DD --to YYYY-MM-DD] [--json]';

interface Options {
  dir: string;
  trials: number;
  seed: number | string;
  against: string | null;
  from: string | null;
  to: string | null;
  json: boolean;
}

/** The command's options, every problem reported at once. */
function readOptions(argv: string[]): Options {
  const args = parseArgs(argv, ['json']);
  const problems: Problem[] = [];
  for (const b of unknownOptions(args, OPTIONS)) problems.push({ where: `--${b}`, what: 'unknown option', fix: `the options are ${OPTIONS.map((o) => `--${o}`).join(', ')}` });
  if (args.positionals.length !== 1) problems.push({ where: 'DIR', what: args.positionals.length ? `expected one output folder, got ${args.positionals.length}` : 'no output folder given', fix: USAGE });
  let trials = DEFAULT_TRIALS;
  if (args.options.trials !== undefined) {
    const t = Number(args.options.trials);
    if (!Number.isInteger(t) || t < 10 || t > 100000) problems.push({ where: '--trials', what: `"${args.options.trials === true ? '' : args.options.trials}" is not a whole number from 10 to 100000`, fix: `leave it out for ${DEFAULT_TRIALS} (errors good to 5 %)` });
    else trials = t;
  }
  const seedText = optionText(args, 'seed');
  if (args.options.seed === true) problems.push({ where: '--seed', what: 'missing value', fix: 'give a number or a word, e.g. --seed 7' });
  const seed = seedText === undefined ? 1 : /^-?\d+$/.test(seedText) ? Number(seedText) : seedText;
  const date = (name: 'from' | 'to') => {
    if (args.options[name] === undefined) return null;
    const r = parseDateText(optionText(args, name) ?? '');
    if (!r.ok) problems.push({ where: `--${name}`, what: r.error, fix: 'write the date as YYYY-MM-DD, e.g. 2027-02-01' });
    return r.ok ? r.value : null;
  };
  const from = date('from'), to = date('to');
  if ((args.options.from === undefined) !== (args.options.to === undefined)) problems.push({ where: args.options.from === undefined ? '--from' : '--to', what: 'the semester needs both --from and --to' });
  if (from && to && to < from) problems.push({ where: '--to', what: `${to} is before --from ${from}`, fix: 'give --to on or after --from' });
  if (args.options.against === true) problems.push({ where: '--against', what: 'missing folder', fix: 'give a second output folder to compare with' });
  if (problems.length) throw new InputError(problems);
  return { dir: args.positionals[0], trials, seed, against: optionText(args, 'against') ?? null, from, to, json: args.options.json === true };
}

function readIn(dir: string, shown: string, name: string): string {
  const p = join(dir, name);
  if (!existsSync(p)) throw new InputError([{ where: join(shown, name), what: 'file not found', fix: 'give an output folder written by `haloweave plan`' }]);
  return readFileSync(p, 'utf8');
}

/** Everything the forecast needs from an output folder: plan, profile, masks with slits, catalog colours, semester nights. */
export function loadForecastInput(shown: string, semester: { from: string | null; to: string | null }, notes: string[]): ForecastInput {
  const dir = resolve(shown);
  if (!existsSync(dir) || !statSync(dir).isDirectory()) throw new InputError([{ where: shown, what: 'folder not found', fix: 'give an output folder written by `haloweave plan`' }]);
  const plan = parsePlanText(readIn(dir, shown, 'solved.plan.json'), join(shown, 'solved.plan.json'));
  const masks = parseMasksCsv(readIn(dir, shown, 'masks.csv'), join(shown, 'masks.csv'));
  const slits = parseSlitsCsv(readIn(dir, shown, 'slits.csv'), join(shown, 'slits.csv'));
  // Every profile the plan names; each mask follows the one masks.csv names by id (the first for a single spectrograph).
  const profiles = planInstrumentRefs(plan).map((ref) => loadProfile(ref, dir, `${join(shown, 'solved.plan.json')}: instrument`).profile);
  const profile = profiles[0];
  const maskProfiles = new Map<string, InstrumentProfile>();
  for (const m of masks) {
    const own = profiles.find((p) => p.id === m.instrument);
    if (own) maskProfiles.set(m.maskId, own);
    else if (profiles.length > 1) {
      throw new InputError([{ where: `${join(shown, 'masks.csv')}: mask ${m.maskId}`, what: `instrument "${m.instrument}" is none of the plan's profiles (${profiles.map((p) => p.id).join(', ')})`, fix: 'run `haloweave check` on the folder, or plan it again' }]);
    }
  }
  const galaxy = galaxyModel(plan);
  const solutions: MaskSolution[] = masks.map((m) => ({
    mask: { id: m.maskId, raDeg: m.raDeg, decDeg: m.decDeg, paDeg: m.paDeg, locked: true },
    slits: slits.filter((s) => s.maskId === m.maskId),
  }));
  const stray = slits.filter((s) => !masks.some((m) => m.maskId === s.maskId));
  if (stray.length) throw new InputError([{ where: join(shown, 'slits.csv'), what: `${stray.length} rows name a mask not in masks.csv (e.g. "${stray[0].maskId}")`, fix: 'run `haloweave check` on the folder' }]);
  let colours: Map<string, number> | undefined;
  try {
    const catalog = readCatalogFile(isAbsolute(plan.catalog) ? plan.catalog : join(dir, plan.catalog), plan.catalogColumns as ColumnMapping | undefined, { source: plan.catalog });
    colours = new Map(catalog.targets.filter((t) => t.color !== null).map((t) => [t.id, t.color!]));
  } catch (e) {
    if (!(e instanceof InputError)) throw e;
    notes.push(`${shown}: catalog ${plan.catalog} not readable, colours not used by the contamination model`);
  }
  const from = semester.from ?? plan.forecast?.semesterFrom ?? null, to = semester.to ?? plan.forecast?.semesterTo ?? null;
  let nights: ForecastInput['nights'] = null;
  const nightsOfProfile = new Map<string, NonNullable<ForecastInput['nights']>>();
  if (from && to) {
    // One night table per site; profiles at the same latitude and longitude share it.
    const bySite = new Map<string, NonNullable<ForecastInput['nights']>>();
    for (const p of profiles) {
      const key = `${p.site.latDeg},${p.site.lonDeg}`;
      if (!bySite.has(key)) {
        const site = { latDeg: p.site.latDeg, lonDeg: p.site.lonDeg, elevationM: p.site.elevationM };
        bySite.set(key, { rows: nightTable(from, to, galaxy, site, { maxAirmass: plan.observing?.maxAirmass ?? 2, stepMinutes: 10 }), from, to });
      }
      nightsOfProfile.set(p.id, bySite.get(key)!);
    }
    nights = nightsOfProfile.get(profile.id)!;
  }
  const profilesByRef = Object.fromEntries(planInstrumentRefs(plan).map((ref, k) => [ref, profiles[k]]));
  return { plan, profile, maskProfiles, profilesByRef, nightsOfProfile: profiles.length > 1 && nights ? nightsOfProfile : undefined, galaxy, masks: solutions, colours, nights };
}

/** A forecast with numbers rounded for the file (6 significant digits). */
export function forecastJson(f: Forecast): string {
  return JSON.stringify(f, (_k, v) => (typeof v === 'number' && !Number.isInteger(v) && Number.isFinite(v) ? Number(v.toPrecision(6)) : v), 2) + '\n';
}

/** Run `haloweave forecast`. */
export async function run(argv: string[], io: CliIO): Promise<number> {
  const o = readOptions(argv);
  const notes: string[] = [];
  const t0 = Date.now();
  const input = loadForecastInput(o.dir, o, notes);
  const f = forecastPlan({ ...input, trials: o.trials, seed: o.seed });
  f.notes.push(...notes);
  const dir = resolve(o.dir);
  // The second folder is read before anything is written, so a mistake there leaves the first folder untouched.
  let other: Forecast | null = null;
  if (o.against) {
    const inputB = loadForecastInput(o.against, o, f.notes);
    other = forecastPlan({ ...inputB, trials: o.trials, seed: o.seed });
  }
  writeFileAtomic(join(dir, 'forecast.json'), forecastJson(f));
  const suffix = other ? '-against' : '';
  writeFileAtomic(join(dir, 'forecast-dispersion.svg'), dispersionProfileSvg(f));
  writeFileAtomic(join(dir, 'forecast-rotation.svg'), rotationSvg(f));
  writeFileAtomic(join(dir, 'forecast-starlight.svg'), starlightMapSvg(f));
  if (other) {
    writeFileAtomic(join(dir, `forecast-dispersion${suffix}.svg`), dispersionProfileSvg(f, other));
    writeFileAtomic(join(dir, `forecast-rotation${suffix}.svg`), rotationSvg(f, other));
  }
  if (o.json) {
    io.out(other ? `{"forecast": ${forecastJson(f)}, "against": ${forecastJson(other)}}` : forecastJson(f));
    return 0;
  }
  for (const l of formatForecastSummary(f)) io.out(l);
  if (other) {
    io.out(`\nSide by side (same model, ${o.trials} mocks, seed ${o.seed}): A = ${o.dir}, B = ${o.against}`);
    for (const l of formatComparison(f, other, `A ${basename(resolve(o.dir))}`, `B ${basename(resolve(o.against!))}`)) io.out(l);
    for (const n of other.notes) io.out(`note (B): ${n}`);
  }
  io.out(`wrote ${join(o.dir, 'forecast.json')} and forecast-*.svg plots (${((Date.now() - t0) / 1000).toFixed(1)} s)`);
  return 0;
}
