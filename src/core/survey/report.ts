/**
 * The survey's outputs as text: `schedule.csv` (contract revision 2 columns first, then additions) and
 * `survey.json` (format haloweave.survey-report/1): per galaxy its status, masks and hours needed and scheduled,
 * goals, and for every mask left out the reason. Times ISO 8601 UTC; hours to 4 decimals; airmass to 4 decimals.
 */
import { toCsv } from '../export/csvText';
import type { SurveySchedule } from './schedule';
import type { SurveySettings } from './schema';

export const SURVEY_REPORT_FORMAT = 'haloweave.survey-report/1';

/** The columns of schedule.csv: the contract's five, then the additions. */
export const SCHEDULE_COLUMNS = ['night', 'galaxy_id', 'mask_id', 'start_utc', 'end_utc', 'hours', 'telescope', 'airmass_start', 'airmass_middle', 'airmass_end', 'hour_angle_start_h', 'hour_angle_end_h', 'moon_illumination', 'priority'] as const;

const r4 = (v: number) => Math.round(v * 1e4) / 1e4;

/** schedule.csv text: one row per block, in time order. */
export function scheduleCsv(schedule: SurveySchedule): string {
  const label = new Map(schedule.telescopes.map((t) => [t.key, t.label]));
  const priority = new Map(schedule.masks.map((m) => [`${m.galaxyId}\u0000${m.maskId}`, m.priority]));
  return toCsv([...SCHEDULE_COLUMNS], schedule.blocks.map((b) => [
    b.night, b.galaxyId, b.maskId, b.startUtc, b.endUtc, b.hours.toFixed(4), label.get(b.telescopeKey) ?? b.telescopeKey,
    b.airmass[0].toFixed(4), b.airmass[1].toFixed(4), b.airmass[2].toFixed(4), b.hourAngleH[0].toFixed(4), b.hourAngleH[1].toFixed(4), b.moonIllumination.toFixed(3),
    priority.get(`${b.galaxyId}\u0000${b.maskId}`) ?? 1,
  ]));
}

/** A coverage goal as written in coverage.json. */
export interface GoalRecord {
  name: string;
  target: unknown;
  achieved: unknown;
  met: boolean;
  reason?: string | null;
}

/** One galaxy of the survey as the command saw it. */
export interface GalaxyRun {
  /** Galaxy id (or, when the plan could not be read, the plan file as written). */
  id: string;
  plan: string;
  /** Output folder, relative to the survey's output folder; null when the plan failed. */
  folder: string | null;
  /** planned: solved in this run; unchanged: inputs identical to the previous run, folder kept; failed: not planned. */
  status: 'planned' | 'unchanged' | 'failed';
  inputsHash: string | null;
  priority: number;
  /** Masks the plan asks for (goals.masks). */
  masksPlanned: number;
  goals: GoalRecord[];
  /** Problems (one line each) when status is failed; warnings otherwise. */
  problems: string[];
  warnings: string[];
  /** The planning run's catalog line (rows read, used, rejected), when planned in this run. */
  catalog?: string | null;
}

/** survey.json object. */
export function surveyReport(surveyFile: string, settings: SurveySettings, galaxies: readonly GalaxyRun[], schedule: SurveySchedule): Record<string, unknown> {
  const masksOf = (id: string) => schedule.masks.filter((m) => m.galaxyId === id);
  const rows = galaxies.map((g) => {
    const masks = g.status === 'failed' ? [] : masksOf(g.id);
    const hoursNeeded = masks.reduce((s, m) => s + m.hoursNeeded, 0);
    const scheduled = masks.filter((m) => m.block);
    const hoursScheduled = scheduled.reduce((s, m) => s + m.block!.hours, 0);
    return {
      id: g.id,
      plan: g.plan,
      folder: g.folder,
      status: g.status,
      inputsHash: g.inputsHash,
      priority: g.priority,
      masksPlanned: g.masksPlanned,
      masksScheduled: scheduled.length,
      hoursNeeded: r4(hoursNeeded),
      hoursScheduled: r4(hoursScheduled),
      complete: g.status !== 'failed' && masks.length > 0 && scheduled.length === masks.length,
      goals: g.goals,
      goalsMet: g.goals.every((x) => x.met),
      problems: g.problems,
      warnings: g.warnings,
      catalog: g.catalog ?? null,
      masks: masks.map((m) => ({
        maskId: m.maskId,
        hoursNeeded: r4(m.hoursNeeded),
        scheduled: m.block ? { night: m.block.night, startUtc: m.block.startUtc, endUtc: m.block.endUtc, airmass: m.block.airmass.map(r4), hourAngleH: m.block.hourAngleH.map(r4) } : null,
        possibleNights: m.possibleNights,
        reason: m.reason,
      })),
      unscheduled: g.status === 'failed'
        ? [{ maskId: null, reason: `the plan failed, so none of its masks was planned or scheduled: ${g.problems[0] ?? 'see problems'}` }]
        : masks.filter((m) => !m.block).map((m) => ({ maskId: m.maskId, reason: m.reason })),
    };
  });
  const s = schedule.solver;
  return {
    format: SURVEY_REPORT_FORMAT,
    survey: surveyFile,
    from: settings.from,
    to: settings.to,
    settings: {
      maxAirmass: settings.maxAirmass,
      hoursPerMask: settings.hoursPerMask,
      hoursFrom: settings.hoursPerMask === null ? settings.hoursFrom : 'hoursPerMask',
      overheadHoursPerMask: r4(settings.overheadHoursPerMask),
      moon: { maxIllumination: settings.maxMoonIllumination, minSeparationDeg: settings.minMoonSeparationDeg, appliesWhen: 'the Moon is above the horizon' },
      slotMinutes: settings.slotMinutes,
      exactMaxVariables: settings.exactMaxVariables,
      exactTimeLimitS: settings.exactTimeLimitS,
    },
    solver: { ...s, objective: r4(s.objective), bound: r4(s.bound), gap: r4(s.gap) },
    totals: {
      galaxies: rows.length,
      planned: rows.filter((r) => r.status === 'planned').length,
      unchanged: rows.filter((r) => r.status === 'unchanged').length,
      failed: rows.filter((r) => r.status === 'failed').length,
      complete: rows.filter((r) => r.complete).length,
      masks: schedule.masks.length,
      masksScheduled: schedule.blocks.length,
      hoursNeeded: r4(schedule.masks.reduce((a, m) => a + m.hoursNeeded, 0)),
      hoursScheduled: r4(schedule.blocks.reduce((a, b) => a + b.hours, 0)),
    },
    telescopes: schedule.telescopes.map((t) => ({
      key: t.key, label: t.label, site: t.site,
      darkHours: r4(t.nights.reduce((a, n) => a + (n.darkStartJd !== null && n.darkEndJd !== null ? (n.darkEndJd - n.darkStartJd) * 24 : 0), 0)),
      nights: t.nights.map((n) => {
        const own = schedule.blocks.filter((b) => b.telescopeKey === t.key && b.night === n.night);
        return {
          night: n.night, darkStartUtc: n.darkStartUtc, darkEndUtc: n.darkEndUtc,
          darkHours: n.darkStartJd !== null && n.darkEndJd !== null ? r4((n.darkEndJd - n.darkStartJd) * 24) : 0,
          scheduledHours: r4(own.reduce((a, b) => a + b.hours, 0)),
          moonIllumination: n.moonIllumination === null ? null : Math.round(n.moonIllumination * 1000) / 1000,
          blocks: own.map((b) => `${b.galaxyId} ${b.maskId}`),
        };
      }),
    })),
    galaxies: rows,
  };
}
