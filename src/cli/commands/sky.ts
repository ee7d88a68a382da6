/**
 * `haloweave sky PLAN --from DATE --to DATE [--max-airmass X] [--step-min N] [--json [--curve]]`: observability of the
 * plan's galaxy from its profile's site, one row a night (the local evening's date). Times are UTC. The airmass limit
 * defaults to the plan's observing.maxAirmass (in a plan with several spectrographs, each one's instruments[].observing
 * value over it), else 2; --curve adds each night's sampled altitude/airmass to the JSON.
 */
import { existsSync, readFileSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import type { CliIO } from '../io';
import { optionText, parseArgs, unknownOptions } from '../args';
import { InputError, type Problem } from '../../core/result';
import { parsePlanText, galaxyModel } from '../../core/plan/validate';
import type { GalaxyModel } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';
import { loadProfile, namedProfiles } from '../loadPlanInputs';
import { instrumentSections, planProfiles } from '../../core/plan/instruments';
import { nightRows, nightTable, type NightRow } from '../../core/observe/night';
import { observabilityVerdict } from '../../core/observe/observability';
import { parseDateText } from '../../core/sky/calendarText';

const OPTIONS = ['from', 'to', 'max-airmass', 'step-min', 'json', 'curve'];
/** Longest range accepted, in nights (ten years). */
const MAX_NIGHTS = 3660;

/** Read the plan (validated) and its (first) profile, with every profile of a plan with several; the catalog is not needed here. */
export function loadPlanAndProfile(planPathArg: string): { galaxy: GalaxyModel; profile: InstrumentProfile; profileId: string; profiles: InstrumentProfile[]; planMaxAirmass?: number; maxAirmassOf: (profileId: string) => number | undefined } {
  const planPath = resolve(planPathArg);
  if (!existsSync(planPath) || !statSync(planPath).isFile()) {
    throw new InputError([{ where: planPathArg, what: 'plan file not found', fix: 'give the path of a *.plan.json file' }]);
  }
  const plan = parsePlanText(readFileSync(planPath, 'utf8'), planPathArg);
  const loaded: Record<string, InstrumentProfile> = {};
  for (const { ref, where } of namedProfiles(plan, planPathArg)) loaded[ref] ??= loadProfile(ref, dirname(planPath), where).profile;
  const profiles = planProfiles(plan, loaded, planPathArg);
  // Several spectrographs: each one's own observing.maxAirmass (instruments[].observing) over the plan's.
  const maxAirmassOf = (profileId: string) => instrumentSections(plan, profileId, loaded).observing?.maxAirmass;
  return { galaxy: galaxyModel(plan), profile: profiles[0], profileId: profiles[0].id, profiles, planMaxAirmass: plan.observing?.maxAirmass, maxAirmassOf };
}

/** Options of the command, every problem reported at once. */
function readOptions(argv: string[]) {
  const args = parseArgs(argv, ['json', 'curve']);
  const problems: Problem[] = [];
  for (const b of unknownOptions(args, OPTIONS)) problems.push({ where: `--${b}`, what: 'unknown option', fix: `the options are ${OPTIONS.map((o) => `--${o}`).join(', ')}` });
  if (args.positionals.length !== 1) problems.push({ where: 'PLAN', what: args.positionals.length ? `expected one plan file, got ${args.positionals.length}` : 'no plan file given', fix: 'usage: haloweave sky PLAN --from YYYY-MM-DD --to YYYY-MM-DD' });
  const date = (name: 'from' | 'to') => {
    const text = optionText(args, name);
    if (text === undefined) {
      problems.push({ where: `--${name}`, what: 'missing date', fix: 'write the date as YYYY-MM-DD, e.g. 2026-10-01' });
      return null;
    }
    const r = parseDateText(text);
    if (!r.ok) problems.push({ where: `--${name}`, what: r.error, fix: 'write the date as YYYY-MM-DD, e.g. 2026-10-01' });
    return r.ok ? r.value : null;
  };
  const from = date('from'), to = date('to');
  if (from && to) {
    const nights = (Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000 + 1;
    if (nights < 1) problems.push({ where: '--to', what: `${to} is before --from ${from}`, fix: 'give --to on or after --from' });
    else if (nights > MAX_NIGHTS) problems.push({ where: '--to', what: `${nights} nights asked; at most ${MAX_NIGHTS}`, fix: 'split the range' });
  }
  const number = (name: string, fallback: number, min: number, max: number) => {
    const v = args.options[name];
    if (v === undefined) return fallback;
    const x = typeof v === 'string' && v.trim() !== '' ? Number(v) : NaN;
    if (!Number.isFinite(x) || x < min || x > max) {
      problems.push({ where: `--${name}`, what: `"${v === true ? '' : v}" is not a number from ${min} to ${max}` });
      return fallback;
    }
    return x;
  };
  const maxAirmass = args.options['max-airmass'] === undefined ? null : number('max-airmass', 2, 1, 10);
  const stepMinutes = number('step-min', 5, 0.5, 60);
  if (args.options.curve === true && args.options.json !== true) problems.push({ where: '--curve', what: 'only goes with --json', fix: 'add --json' });
  if (problems.length) throw new InputError(problems);
  return { planPath: args.positionals[0], from: from!, to: to!, maxAirmass, stepMinutes, json: args.options.json === true, curve: args.options.curve === true };
}

const round = (v: number, digits: number) => Math.round(v * 10 ** digits) / 10 ** digits;
const roundOrNull = (v: number | null, digits: number) => (v === null ? null : round(v, digits));

/** A row for JSON output: hours to 0.001, airmass and illumination to 1e-4, degrees to 0.001. */
export function roundedRow(r: NightRow): NightRow {
  return {
    ...r,
    darkHours: round(r.darkHours, 3), darkTotalHours: round(r.darkTotalHours, 3), darkHoursMoonDown: round(r.darkHoursMoonDown, 3),
    minAirmass: roundOrNull(r.minAirmass, 4), minAirmassSecZ: roundOrNull(r.minAirmassSecZ, 4),
    moonIllumination: round(r.moonIllumination, 4), moonSeparationDeg: round(r.moonSeparationDeg, 3),
    moonAltitudeDeg: round(r.moonAltitudeDeg, 3), transitAltitudeDeg: round(r.transitAltitudeDeg, 3),
  };
}

const hhmm = (iso: string | null) => (iso === null ? '--' : iso.slice(11, 16));
const num = (v: number | null, digits: number) => (v === null ? '--' : v.toFixed(digits));

/** The readable table: one aligned row a night. */
export function formatNightTable(rows: NightRow[], maxAirmass: number): string[] {
  const header = ['date', 'sunset', 'dusk18', 'dawn18', 'sunrise', 'transit', 'alt@tr', 'dark h', `X<${maxAirmass} h`, 'no moon h', 'min X', 'secz', 'moon %', 'moon sep', 'moon alt'];
  const body = rows.map((r) => [
    r.date, hhmm(r.sunsetUtc), hhmm(r.astroDuskUtc), hhmm(r.astroDawnUtc), hhmm(r.sunriseUtc), hhmm(r.transitUtc),
    r.transitAltitudeDeg.toFixed(1), r.darkTotalHours.toFixed(2), r.darkHours.toFixed(2), r.darkHoursMoonDown.toFixed(2), num(r.minAirmass, 3), num(r.minAirmassSecZ, 3),
    (r.moonIllumination * 100).toFixed(0), r.moonSeparationDeg.toFixed(1), r.moonAltitudeDeg.toFixed(1),
  ]);
  const widths = header.map((h, i) => Math.max(h.length, ...body.map((b) => b[i].length)));
  const line = (cells: string[]) => cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join('  ');
  return [line(header), widths.map((w) => '-'.repeat(w)).join('  '), ...body.map(line)];
}

/** Run `haloweave sky`; exit 0 also when the galaxy is not observable (that is a result, not an error). */
export async function run(argv: string[], io: CliIO): Promise<number> {
  const opts = readOptions(argv);
  const { galaxy, profiles, planMaxAirmass, maxAirmassOf } = loadPlanAndProfile(opts.planPath);
  const o = { ...opts, maxAirmass: opts.maxAirmass ?? planMaxAirmass ?? 2 };
  if (profiles.length === 1) return siteNights(io, galaxy, profiles[0], o, null);
  // Several spectrographs: each site in turn; JSON rows name their instrument and site.
  const all: object[] = [];
  for (const p of profiles) {
    siteNights(o.json ? { out: () => {}, err: io.err } : io, galaxy, p, { ...o, maxAirmass: opts.maxAirmass ?? maxAirmassOf(p.id) ?? 2 }, all);
    if (!o.json) io.out('');
  }
  if (o.json) io.out(JSON.stringify(all, null, 2));
  return 0;
}

/** The nights of one site; `collect` (several sites) gathers the JSON rows with their instrument and site instead of printing them. */
function siteNights(io: CliIO, galaxy: GalaxyModel, profile: InstrumentProfile, o: ReturnType<typeof readOptions> & { maxAirmass: number }, collect: object[] | null): number {
  const profileId = profile.id;
  const site = { latDeg: profile.site.latDeg, lonDeg: profile.site.lonDeg, elevationM: profile.site.elevationM };
  const nightOptions = { maxAirmass: o.maxAirmass, stepMinutes: o.stepMinutes, includeCurve: o.curve };
  if (o.json) {
    if (collect) {
      // Several sites: the rows are gathered with their instrument and site and printed together by the caller.
      const rows = nightTable(o.from, o.to, galaxy, site, nightOptions);
      collect.push(...rows.map((r) => ({ instrument: profileId, site, ...roundedRow(r) })));
      const verdict = observabilityVerdict(rows, galaxy, site, o.maxAirmass);
      if (verdict) io.err(`haloweave sky: ${profileId}: ${verdict}`);
      return 0;
    }
    // Streamed night by night: ten years of curves at half-minute steps are written as they are computed, the text
    // equal to JSON.stringify(rows, null, 2); only the rows without their curves are kept, for the verdict.
    const kept: NightRow[] = [];
    let previous: string | null = null; // written once the next night shows whether a comma follows
    io.out('[');
    for (const row of nightRows(o.from, o.to, galaxy, site, nightOptions)) {
      if (previous !== null) io.out(`${previous},`);
      previous = `  ${JSON.stringify(roundedRow(row), null, 2).replace(/\n/g, '\n  ')}`;
      const { curve: _curve, ...rest } = row;
      kept.push(rest);
    }
    if (previous !== null) io.out(previous);
    io.out(']');
    const verdict = observabilityVerdict(kept, galaxy, site, o.maxAirmass);
    if (verdict) io.err(`haloweave sky: ${verdict}`);
    return 0;
  }
  const rows = nightTable(o.from, o.to, galaxy, site, nightOptions);
  const verdict = observabilityVerdict(rows, galaxy, site, o.maxAirmass);
  const lon = site.lonDeg;
  io.out(`galaxy ${galaxy.id} (RA ${galaxy.raDeg.toFixed(4)}, Dec ${galaxy.decDeg.toFixed(4)} deg) from ${profileId}: latitude ${site.latDeg.toFixed(3)}, longitude ${lon >= 0 ? '+' : ''}${lon.toFixed(3)} (East), ${site.elevationM} m`);
  io.out(`times UTC (HH:MM); a night is named by its local evening and runs from local mean noon to the next; dark = Sun below -18 deg; airmass by Hardie (1962), secz plane-parallel; "no moon h" = those hours with the Moon below the horizon; Moon figures at mid-night`);
  if (verdict) io.out(verdict);
  for (const l of formatNightTable(rows, o.maxAirmass)) io.out(l);
  const total = rows.reduce((s, r) => s + r.darkHours, 0);
  io.out(`${rows.length} nights, ${rows.filter((r) => r.observable).length} with dark time at airmass below ${o.maxAirmass}; ${total.toFixed(1)} such hours in all`);
  return 0;
}
