/**
 * `haloweave survey` end to end (the real command in a child process): an invented survey of three galaxies, one of
 * them with a bad plan; the good ones planned into folders `haloweave check` accepts, the bad one reported without
 * stopping the others and a non-zero exit at the end; schedule.csv with the contract's columns and no overlapping
 * blocks; a second run skips the unchanged galaxies and says so; a changed catalog is planned again.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { appendFileSync, mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from '../cli/runCli';
import { surveyScenario, SURVEY_FILE } from '../../src/core/survey/exampleSurvey';
import { exampleSurvey } from '../../src/core/survey/exampleSurvey';
import { galaxyRequests } from '../../src/cli/survey/galaxyInputs';
import { parseSurvey } from '../../src/core/survey/schema';

let work: string;
let first: ReturnType<typeof cli>;
beforeAll(() => {
  work = mkdtempSync(join(tmpdir(), 'haloweave-survey-'));
  const files = surveyScenario({ galaxies: 2, candidates: 500, seed: 11, from: '2027-03-01', to: '2027-03-12', surveyKeys: { hoursPerMask: 1.5 } });
  for (const [n, t] of Object.entries(files)) writeFileSync(join(work, n), t);
  // A third plan whose catalog file does not exist.
  const bad = JSON.parse(files['halo-survey-01.plan.json']);
  bad.galaxy.id = 'Broken Halo';
  bad.catalog = 'missing.catalog.csv';
  writeFileSync(join(work, 'broken.plan.json'), JSON.stringify(bad));
  const survey = JSON.parse(files[SURVEY_FILE]);
  survey.plans.push('broken.plan.json');
  writeFileSync(join(work, SURVEY_FILE), JSON.stringify(survey));
  first = cli(['survey', SURVEY_FILE, '--out', 'out', '--jobs', '2'], work);
}, 240_000);

describe('haloweave survey', () => {
  it('plans the good galaxies, reports the bad one by file and field, and exits 2 at the end', () => {
    expect(first.code).toBe(2);
    expect(first.err).toMatch(/Broken Halo.*FAILED/);
    expect(first.err).toMatch(/broken\.plan\.json: catalog: catalog file "missing\.catalog\.csv" not found/);
    expect(first.err).not.toMatch(/\n\s+at /); // no stack trace
    expect(first.err).toMatch(/Halo Survey 01: +\d+% /); // progress per galaxy
    for (const g of ['Halo Survey 01', 'Halo Survey 02']) {
      const r = cli(['check', join('out', g)], work);
      expect(r.code, r.out + r.err).toBe(0);
    }
  });

  it('writes schedule.csv with the contract columns, blocks inside dark windows and not overlapping', () => {
    const lines = readFileSync(join(work, 'out', 'schedule.csv'), 'utf8').trim().split('\n');
    expect(lines[0].startsWith('night,galaxy_id,mask_id,start_utc,end_utc')).toBe(true);
    const rows = lines.slice(1).map((l) => l.split(','));
    expect(rows.length).toBeGreaterThan(0);
    const spans = rows.map((r) => [Date.parse(r[3]), Date.parse(r[4])]).sort((a, b) => a[0] - b[0]);
    for (let i = 1; i < spans.length; i++) expect(spans[i][0]).toBeGreaterThanOrEqual(spans[i - 1][1]);
    for (const r of rows) {
      expect(r[0]).toMatch(/^\d{4}-\d{2}-\d{2}$/);
      expect(r[3]).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}Z$/);
      expect((Date.parse(r[4]) - Date.parse(r[3])) / 3.6e6).toBeCloseTo(1.5, 3);
    }
  });

  it('survey.json gives every galaxy a status, hours and reasons', () => {
    const s = JSON.parse(readFileSync(join(work, 'out', 'survey.json'), 'utf8'));
    expect(s.format).toBe('haloweave.survey-report/1');
    const byId = new Map<string, any>(s.galaxies.map((g: any) => [g.id, g]));
    expect(byId.get('Broken Halo').status).toBe('failed');
    expect(byId.get('Broken Halo').unscheduled[0].reason).toMatch(/the plan failed/);
    for (const id of ['Halo Survey 01', 'Halo Survey 02']) {
      const g = byId.get(id);
      expect(g.status).toBe('planned');
      expect(g.hoursNeeded).toBeCloseTo(4 * 1.5, 6);
      expect(g.masks).toHaveLength(4);
      for (const m of g.masks) expect(m.scheduled === null).toBe(m.reason !== null);
      expect(g.hoursScheduled).toBeCloseTo(1.5 * g.masks.filter((m: any) => m.scheduled).length, 6);
    }
    expect(existsSync(join(work, 'out', 'calendar.svg'))).toBe(true);
    expect(readFileSync(join(work, 'out', 'calendar.svg'), 'utf8')).toMatch(/^<svg[^>]*xmlns="http:\/\/www.w3.org\/2000\/svg"/);
  });

  it('takes hours per mask from the plan, from hoursPerMask, or from the median tracer time of the exposure report', () => {
    const folder = join(work, 'out', 'Halo Survey 01');
    const solved = JSON.parse(readFileSync(join(folder, 'solved.plan.json'), 'utf8'));
    const base = { format: 'haloweave.survey/1', plans: ['x'], from: '2027-03-01', to: '2027-03-02' };
    const plan = join(work, 'halo-survey-01.plan.json');
    const fromPlan = galaxyRequests(folder, plan, 1, parseSurvey({ ...base, overheadMinutesPerMask: 30 }).settings);
    expect(fromPlan.requests).toHaveLength(4);
    for (const r of fromPlan.requests) expect(r.hoursNeeded).toBeCloseTo(solved.observingReport.settings.exposureTimeS / 3600 + 0.5, 9);
    const fixed = galaxyRequests(folder, plan, 1, parseSurvey({ ...base, hoursPerMask: 2.25 }).settings);
    for (const r of fixed.requests) expect(r.hoursNeeded).toBe(2.25);
    const model = galaxyRequests(folder, plan, 1, parseSurvey({ ...base, hoursFrom: 'median-tracer-sn' }).settings);
    for (const r of model.requests) {
      const times = solved.observingReport.exposures.find((e: any) => e.maskId === r.maskId).slits
        .filter((x: any) => x.role === 'tracer' && x.timeForTargetSnS !== null).map((x: any) => x.timeForTargetSnS).sort((a: number, b: number) => a - b);
      // The lower median of the tracer slits' times to the target S/N, in hours.
      expect(r.hoursNeeded).toBeCloseTo(times[Math.floor((times.length - 1) / 2)] / 3600, 9);
      expect(r.hourAngleWindowH).toEqual(solved.masks.find((m: any) => m.id === r.maskId).hourAngleWindowH);
      expect(r.telescope.site.latDeg).toBe(28.1); // ridge10-narrow's site
    }
  });

  it('a second run skips unchanged galaxies and says so; a changed catalog is planned again', () => {
    appendFileSync(join(work, 'halo-survey-02.catalog.csv'), '');
    const again = cli(['survey', SURVEY_FILE, '--out', 'out', '--quiet'], work);
    expect(again.err).toMatch(/2 galaxies unchanged since the last run.*Halo Survey 01, Halo Survey 02/);
    const text = readFileSync(join(work, 'halo-survey-02.catalog.csv'), 'utf8').split('\n');
    // Change one magnitude of the last data row: a different content hash.
    const last = text.length - 2;
    text[last] = text[last].replace(/,(\d+)\.(\d)/, (_m, a, b) => `,${a}.${(Number(b) + 1) % 10}`);
    writeFileSync(join(work, 'halo-survey-02.catalog.csv'), text.join('\n'));
    const third = cli(['survey', SURVEY_FILE, '--out', 'out', '--quiet'], work);
    expect(third.err).toMatch(/1 galaxy unchanged since the last run.*Halo Survey 01/);
    expect(third.err).toMatch(/Halo Survey 02: planned into/);
    const s = JSON.parse(readFileSync(join(work, 'out', 'survey.json'), 'utf8'));
    expect(s.galaxies.map((g: any) => g.status)).toEqual(['unchanged', 'planned', 'failed']);
  });

  it('a survey file with wrong keys is refused with each problem, exit 2', () => {
    writeFileSync(join(work, 'bad.survey.json'), JSON.stringify({ format: 'haloweave.survey/1', plans: [], from: '2027-02-30', to: '2027-01-01', maxAirmass: 0.5 }));
    const r = cli(['survey', 'bad.survey.json', '--out', 'x'], work);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/bad\.survey\.json: plans: list at least one plan file/);
    expect(r.err).toMatch(/bad\.survey\.json: from: is not a calendar date/);
    expect(r.err).toMatch(/bad\.survey\.json: maxAirmass: must be at least 1/);
  });
});

describe('examples/survey', () => {
  it('holds exactly what exampleSurvey() writes (invented galaxies from the scenario generator)', () => {
    for (const [name, text] of Object.entries(exampleSurvey())) {
      expect(readFileSync(new URL(`../../examples/survey/${name}`, import.meta.url), 'utf8')).toBe(text);
    }
  });
});
