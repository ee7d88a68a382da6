/**
 * What `haloweave survey` reads around each plan (Node file access): the content hash of a plan's inputs (plan,
 * instrument profiles, catalog) for skipping unchanged galaxies, the galaxy's folder name, and the masks of a solved
 * output folder as schedule requests (each mask with its own telescope, from its own profile when it names one).
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { InputError } from '../../core/result';
import { loadProfile, profilePathFor } from '../loadPlanInputs';
import { siteKey } from '../../core/survey/darkNights';
import type { MaskRequest, SurveyTelescope } from '../../core/survey/blocks';
import type { GoalRecord } from '../../core/survey/report';
import type { SurveySettings } from '../../core/survey/schema';
import { parseDecDeg, parseRaDeg } from '../../core/sky/sexagesimal';
import { parseMasksCsv } from '../../core/export/slitsCsv';

/** Bump when the planning of a galaxy changes in a way that makes earlier output folders stale. */
const PLAN_OUTPUT_VERSION = 'haloweave-survey-plan/1';

/** The plan file's JSON and the galaxy id in it, or null when it cannot be read (the planning run reports why). */
export function peekPlan(planPath: string): { json: Record<string, unknown>; galaxyId: string | null } | null {
  try {
    const json = JSON.parse(readFileSync(planPath, 'utf8')) as Record<string, unknown>;
    const g = json.galaxy as Record<string, unknown> | undefined;
    return { json, galaxyId: g && typeof g.id === 'string' && g.id !== '' ? g.id : null };
  } catch {
    return null;
  }
}

/** The instrument values a plan names: its `instrument`, each `instruments[].profile`, each mask's own `instrument`. */
function namedInstruments(json: Record<string, unknown>): Set<string> {
  const out = new Set<string>();
  if (typeof json.instrument === 'string') out.add(json.instrument);
  for (const i of Array.isArray(json.instruments) ? json.instruments : []) if (i && typeof i.profile === 'string') out.add(i.profile);
  for (const m of Array.isArray(json.masks) ? json.masks : []) if (m && typeof m.instrument === 'string') out.add(m.instrument);
  return out;
}

/** Paths of every file a plan's planning reads: the plan, its profile(s) and its catalog (null if one cannot be named). */
function planInputFiles(planPath: string, json: Record<string, unknown>): string[] | null {
  const base = dirname(planPath);
  const files = [planPath];
  const instruments = namedInstruments(json);
  if (instruments.size === 0 || typeof json.catalog !== 'string') return null;
  for (const i of [...instruments].sort()) files.push(profilePathFor(i, base));
  files.push(resolve(base, json.catalog));
  return files.every((f) => existsSync(f) && statSync(f).isFile()) ? files : null;
}

/** SHA-256 of everything a galaxy's planning reads, or null when an input is missing (then it is planned, and fails). */
export function planInputsHash(planPath: string, json: Record<string, unknown>): string | null {
  const files = planInputFiles(planPath, json);
  if (!files) return null;
  const h = createHash('sha256').update(PLAN_OUTPUT_VERSION);
  for (const f of files) h.update('\u0000').update(readFileSync(f));
  return h.digest('hex');
}

/** A folder name for a galaxy id: characters that are unsafe in file names replaced by "_"; unique among `taken`. */
export function galaxyFolderName(id: string, taken: Set<string>): string {
  let base = id.replace(/[^A-Za-z0-9._+ -]/g, '_').trim().replace(/^\.+/, '_');
  if (!base || base === 'schedule.csv' || base === 'survey.json' || base === 'calendar.svg') base = `galaxy_${base}`;
  let name = base;
  for (let k = 2; taken.has(name.toLowerCase()); k++) name = `${base}-${k}`;
  taken.add(name.toLowerCase());
  return name;
}

/** The parts of solved.plan.json's observingReport the schedule reads. */
interface ObservingReportFile {
  settings?: { exposureTimeS?: number };
  exposures?: { maskId: string; slits: { role: string; timeForTargetSnS: number | null }[] }[];
}

interface SolvedMask { id: string; hourAngleWindowH?: [number, number] | null }

/**
 * Schedule requests of a galaxy from its solved output folder, and the coverage goals. Hours per mask: the survey's
 * hoursPerMask, else the plan's planned exposure, or (hoursFrom "median-tracer-sn") the exposure model's time for
 * the mask's median tracer slit to reach the target S/N (solver/exposure.ts); plus the overhead.
 */
export function galaxyRequests(folder: string, planPath: string, priority: number, settings: SurveySettings): { requests: MaskRequest[]; goals: GoalRecord[]; masksPlanned: number; warnings: string[] } {
  const solvedPath = join(folder, 'solved.plan.json');
  const solved = JSON.parse(readFileSync(solvedPath, 'utf8')) as Record<string, unknown>;
  const coverage = JSON.parse(readFileSync(join(folder, 'coverage.json'), 'utf8')) as { goals?: GoalRecord[] };
  const galaxy = solved.galaxy as { id: string; ra: number | string; dec: number | string };
  const ra = parseRaDeg(galaxy.ra), dec = parseDecDeg(galaxy.dec);
  if (!ra.ok || !dec.ok) throw new InputError([{ where: `${solvedPath}: galaxy`, what: 'ra/dec could not be read' }]);
  const report = solved.observingReport as ObservingReportFile | undefined;
  const planH = (report?.settings?.exposureTimeS ?? 3600) / 3600;
  const warnings: string[] = [];
  const hoursOf = (maskId: string): number => {
    if (settings.hoursPerMask !== null) return settings.hoursPerMask;
    if (settings.hoursFrom === 'plan') return planH;
    const times = (report?.exposures?.find((e) => e.maskId === maskId)?.slits ?? [])
      .filter((x) => x.role === 'tracer' && x.timeForTargetSnS !== null).map((x) => x.timeForTargetSnS as number).sort((a, b) => a - b);
    if (times.length === 0) {
      warnings.push(`mask ${maskId}: no tracer slit with an exposure estimate; its planned exposure (${planH.toFixed(2)} h) is used`);
      return planH;
    }
    return times[Math.floor((times.length - 1) / 2)] / 3600;
  };
  // Each mask's telescope: masks.csv names each mask's profile id (one profile per plan, or one per mask when a plan
  // uses several spectrographs); the profiles are found from what the plan names (its instrument(s), masks' own).
  const base = dirname(resolve(planPath));
  const original = peekPlan(resolve(planPath))?.json ?? {};
  const named = namedInstruments(original);
  const byProfileId = new Map<string, SurveyTelescope>();
  for (const instrument of named) {
    const { profile } = loadProfile(instrument, base, `${planPath}: instrument`);
    const site = { latDeg: profile.site.latDeg, lonDeg: profile.site.lonDeg, elevationM: profile.site.elevationM };
    byProfileId.set(profile.id, { key: `${siteKey(site)}|${profile.telescope.apertureM}`, label: `${profile.telescope.apertureM} m telescope of ${profile.id}`, site });
  }
  const maskInstrument = new Map(parseMasksCsv(readFileSync(join(folder, 'masks.csv'), 'utf8'), join(folder, 'masks.csv')).map((r) => [r.maskId, r.instrument]));
  const telescopeFor = (maskId: string): SurveyTelescope => {
    const id = maskInstrument.get(maskId);
    const t = (id !== undefined ? byProfileId.get(id) : undefined) ?? (byProfileId.size === 1 ? [...byProfileId.values()][0] : undefined);
    if (!t) throw new InputError([{ where: `${join(folder, 'masks.csv')}: mask ${maskId}`, what: `instrument "${id ?? ''}" is none of the profiles the plan names`, fix: 'plan the galaxy again (haloweave survey --force)' }]);
    return t;
  };
  const masks = (solved.masks as SolvedMask[] | undefined) ?? [];
  const requests = masks.map((m) => ({
    galaxyId: galaxy.id, maskId: m.id, priority,
    hoursNeeded: hoursOf(m.id) + settings.overheadHoursPerMask,
    raDeg: ra.value, decDeg: dec.value,
    hourAngleWindowH: m.hourAngleWindowH ?? null,
    telescope: telescopeFor(m.id),
  }));
  const goals = (solved.goals as { masks?: number } | undefined)?.masks ?? masks.length;
  return { requests, goals: coverage.goals ?? [], masksPlanned: goals, warnings };
}
