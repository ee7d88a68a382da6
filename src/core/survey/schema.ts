/**
 * The survey file (format `haloweave.survey/1`): the plan files of a programme and the semester's first and last
 * night. Contract revision 2 fixes `plans`, `from`, `to`, `maxAirmass` and `hoursPerMask`; the other keys are
 * additions documented in docs/survey.md. Dates are local evening dates (YYYY-MM-DD), hours are hours of time.
 */
import { z } from 'zod';
import { InputError, type Problem } from '../result';
import { zodIssuesToProblems } from '../profile/load';

export const SURVEY_FORMAT = 'haloweave.survey/1';

const dateText = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'must be a date YYYY-MM-DD (the local evening of the night)')
  .refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)) && new Date(`${d}T00:00:00Z`).toISOString().startsWith(d), 'is not a calendar date');

/** One entry of `plans`: a path relative to the survey file, or an object with the path and the galaxy's priority. */
const planEntrySchema = z.union([
  z.string().min(1, 'give the path of a plan file, relative to the survey file'),
  z.looseObject({
    plan: z.string().min(1, 'give the path of a plan file, relative to the survey file'),
    /** Weight of each of this galaxy's masks in the schedule (larger is more important). */
    priority: z.number().positive('must be greater than 0 (larger is more important)').optional(),
  }),
]);

/** Moon constraints on a block: applied only while the Moon's centre is above the horizon. */
export const moonRulesSchema = z.looseObject({
  /** Largest illuminated fraction (0..1) of the Moon while it is up; 1 leaves it free. */
  maxIllumination: z.number().min(0, 'must be in [0, 1]').max(1, 'must be in [0, 1]').optional(),
  /** Smallest angle between the Moon and the galaxy while the Moon is up, degrees. */
  minSeparationDeg: z.number().min(0, 'must be in [0, 180] degrees').max(180, 'must be in [0, 180] degrees').optional(),
});

export const surveySchema = z.looseObject({
  format: z.literal(SURVEY_FORMAT, { message: `must be "${SURVEY_FORMAT}"` }),
  plans: z.array(planEntrySchema).min(1, 'list at least one plan file'),
  from: dateText,
  to: dateText,
  maxAirmass: z.number().min(1, 'must be at least 1').max(10, 'must be at most 10').optional(),
  hoursPerMask: z.number().positive('must be greater than 0 (hours of exposure per mask)').max(24).optional(),
  /**
   * Where a mask's exposure hours come from when hoursPerMask is not given: "plan" (the plan's planned exposure) or
   * "median-tracer-sn" (the exposure model's time for the mask's median tracer slit to reach the plan's target S/N).
   */
  hoursFrom: z.enum(['plan', 'median-tracer-sn'], { message: 'must be "plan" or "median-tracer-sn"' }).optional(),
  /** Time added to each mask's exposure for acquisition and alignment, minutes (default 0). */
  overheadMinutesPerMask: z.number().min(0).max(240).optional(),
  moon: moonRulesSchema.optional(),
  /** Grid step of block starts, minutes (default 10). */
  slotMinutes: z.number().int('must be a whole number of minutes').min(1).max(60).optional(),
  /** Largest integer program (number of block variables) given to the exact solver; larger surveys use the heuristic. */
  exactMaxVariables: z.number().int().min(0).optional(),
  /** Time limit of the exact solver, seconds. */
  exactTimeLimitS: z.number().positive().max(3600).optional(),
});

export type SurveyFile = z.infer<typeof surveySchema>;

/** A plan entry resolved: path as written and priority (default 1). */
export interface SurveyPlanEntry {
  plan: string;
  priority: number;
}

/** Settings of the schedule with every default filled. */
export interface SurveySettings {
  from: string;
  to: string;
  maxAirmass: number;
  hoursPerMask: number | null;
  hoursFrom: 'plan' | 'median-tracer-sn';
  overheadHoursPerMask: number;
  maxMoonIllumination: number;
  minMoonSeparationDeg: number;
  slotMinutes: number;
  exactMaxVariables: number;
  exactTimeLimitS: number;
}

export const SURVEY_DEFAULTS = {
  maxAirmass: 2,
  maxMoonIllumination: 1,
  /** Common practice: keep about 30 degrees from the Moon when it is up. */
  minMoonSeparationDeg: 30,
  slotMinutes: 10,
  exactMaxVariables: 20_000,
  exactTimeLimitS: 30,
};

/** Longest semester accepted, nights (a year and a day: several semesters in one file are fine). */
export const MAX_SURVEY_NIGHTS = 366 * 2;

/** Validate parsed survey JSON; throws InputError with one problem per wrong key (by its path in the file). */
export function parseSurvey(json: unknown, source = 'survey'): { survey: SurveyFile; plans: SurveyPlanEntry[]; settings: SurveySettings } {
  const r = surveySchema.safeParse(json);
  if (!r.success) throw new InputError(zodIssuesToProblems(source, r.error.issues));
  const s = r.data;
  const problems: Problem[] = [];
  const nights = (Date.parse(`${s.to}T00:00:00Z`) - Date.parse(`${s.from}T00:00:00Z`)) / 86_400_000 + 1;
  if (nights < 1) problems.push({ where: `${source}: to`, what: `the last night ${s.to} is before the first night ${s.from}`, fix: 'give "from" the first night and "to" the last night' });
  if (nights > MAX_SURVEY_NIGHTS) problems.push({ where: `${source}: to`, what: `${nights} nights from ${s.from} to ${s.to}; at most ${MAX_SURVEY_NIGHTS} are scheduled at once`, fix: 'split the programme into several survey files' });
  const plans = s.plans.map((p) => (typeof p === 'string' ? { plan: p, priority: 1 } : { plan: p.plan, priority: p.priority ?? 1 }));
  const seen = new Map<string, number>();
  plans.forEach((p, i) => {
    const j = seen.get(p.plan);
    if (j !== undefined) problems.push({ where: `${source}: plans.${i}`, what: `the plan file "${p.plan}" is listed twice (also plans.${j})`, fix: 'list each plan once' });
    seen.set(p.plan, i);
  });
  if (problems.length) throw new InputError(problems);
  const settings: SurveySettings = {
    from: s.from,
    to: s.to,
    maxAirmass: s.maxAirmass ?? SURVEY_DEFAULTS.maxAirmass,
    hoursPerMask: s.hoursPerMask ?? null,
    hoursFrom: s.hoursFrom ?? 'plan',
    overheadHoursPerMask: (s.overheadMinutesPerMask ?? 0) / 60,
    maxMoonIllumination: s.moon?.maxIllumination ?? SURVEY_DEFAULTS.maxMoonIllumination,
    minMoonSeparationDeg: s.moon?.minSeparationDeg ?? SURVEY_DEFAULTS.minMoonSeparationDeg,
    slotMinutes: s.slotMinutes ?? SURVEY_DEFAULTS.slotMinutes,
    exactMaxVariables: s.exactMaxVariables ?? SURVEY_DEFAULTS.exactMaxVariables,
    exactTimeLimitS: s.exactTimeLimitS ?? SURVEY_DEFAULTS.exactTimeLimitS,
  };
  return { survey: s, plans, settings };
}

/** Parse survey text (JSON) with the file named in any error. */
export function parseSurveyText(text: string, source = 'survey'): ReturnType<typeof parseSurvey> {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new InputError([{ where: source, what: `not valid JSON: ${(e as Error).message}`, fix: 'fix the JSON syntax of the survey file' }]);
  }
  return parseSurvey(json, source);
}
