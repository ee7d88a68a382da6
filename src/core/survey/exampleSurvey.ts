/**
 * Invented example surveys: galaxies made with the scenario generator (scenario/generator.ts), each with its plan
 * and catalog, and a survey file listing them. examples/survey/ holds exactly what exampleSurvey() returns (a test
 * keeps them equal); the benchmarks use surveyScenario() for larger ones. Names and positions are made up.
 */
import { generateScenario } from '../scenario/generator';
import { SURVEY_FORMAT } from './schema';

export interface SurveyScenarioOptions {
  galaxies: number;
  candidates: number;
  seed: number;
  from: string;
  to: string;
  /** Name prefix of the invented galaxies (default "Halo Survey"). */
  prefix?: string;
  instrument?: string;
  /** Extra keys of the survey file (moon rules, overheads...). */
  surveyKeys?: Record<string, unknown>;
}

/** The file name of the survey file in a scenario's folder. */
export const SURVEY_FILE = 'halo-survey.survey.json';

/** Files (name -> text) of an invented survey: one plan and catalog per galaxy and the survey file. */
export function surveyScenario(o: SurveyScenarioOptions): Record<string, string> {
  const files: Record<string, string> = {};
  const plans: (string | { plan: string; priority: number })[] = [];
  const width = String(o.galaxies).length < 2 ? 2 : String(o.galaxies).length;
  for (let g = 0; g < o.galaxies; g++) {
    const label = String(g + 1).padStart(width, '0');
    const id = `${o.prefix ?? 'Halo Survey'} ${label}`;
    const stem = `halo-survey-${label}`;
    // Invented positions: RA spread over the night sky of a February-July semester, Dec over -35..+50 deg.
    const raDeg = 120 + ((g * 0.6180339887) % 1) * 180;
    const decDeg = -35 + ((g * 37.7) % 85);
    const s = generateScenario({
      seed: o.seed + g,
      candidates: o.candidates,
      instrument: o.instrument ?? 'ridge10-narrow',
      alignmentMagRange: [15, 20],
      catalogFile: `${stem}.catalog.csv`,
      galaxy: { id, raDeg: Number(raDeg.toFixed(5)), decDeg: Number(decDeg.toFixed(5)), distanceMpc: 10 + (g % 7) * 2, paDeg: (g * 47) % 180, vsysKms: 700 + (g % 9) * 150 },
    });
    files[`${stem}.plan.json`] = JSON.stringify(s.plan, null, 2) + '\n';
    files[`${stem}.catalog.csv`] = s.catalogCsv;
    plans.push(g % 4 === 0 ? { plan: `${stem}.plan.json`, priority: 2 } : `${stem}.plan.json`);
  }
  files[SURVEY_FILE] = JSON.stringify({ format: SURVEY_FORMAT, plans, from: o.from, to: o.to, ...(o.surveyKeys ?? {}) }, null, 2) + '\n';
  return files;
}

/** The committed example (examples/survey/): six invented galaxies over the February-July 2027 semester. */
export function exampleSurvey(): Record<string, string> {
  return surveyScenario({
    galaxies: 6, candidates: 1200, seed: 20270201, from: '2027-02-01', to: '2027-07-31',
    surveyKeys: { maxAirmass: 1.8, overheadMinutesPerMask: 15, moon: { maxIllumination: 0.7, minSeparationDeg: 30 } },
  });
}
