/**
 * The science forecast of the layout on screen (src/core/forecast/), computed in a worker: while a mask is dragged
 * with fewer mocks (stated, with the precision of its errors), otherwise with the default; beside it the forecast
 * of the last saved layout (the last exact solve while the plan had no unsaved change), so a drag shows what it
 * gains or loses. Plots: dispersion profile (saved layout dashed), rotation curve, starlight bins; each exportable.
 */
import { useEffect, useRef, useState } from 'react';
import type { EditorController } from '../controller';
import type { Forecast } from '../../core/forecast/forecast';
import { DEFAULT_TRIALS, trialPrecision } from '../../core/forecast/forecast';
import { LIVE_FORECAST_TRIALS } from '../../core/forecast/live';
import { dispersionProfileSvg, rotationSvg, starlightMapSvg } from '../../core/forecast/plots';
import type { ForecastReply, ForecastRequest } from '../worker/forecastWorker';
import type { NightsReply, NightsRequest } from '../worker/nightsWorker';
import type { NightRow } from '../../core/observe/night';
import { nightsOfSites, type NightsEstimate } from '../../core/forecast/hours';
import { editorPlanSites } from '../io/planProfiles';
import { semesterOf } from '../io/semester';
import type { SolveResult } from '../worker/protocol';
import { downloadFile } from '../io/download';
import { Panel } from './Panel';

type Plot = 'dispersion' | 'rotation' | 'starlight';

const pct = (v: number | null) => (v === null ? '–' : `${(v * 100).toFixed(1)} %`);
const num = (v: number | null, d = 1) => (v === null || !Number.isFinite(v) ? '–' : v.toFixed(d));

/** Rows of the panel's table: label, value of a forecast, test id. */
const ROWS: [string, string, (f: Forecast) => string, string][] = [
  ['velocities', 'cluster velocities expected after contamination and S/N', (f) => num(f.expectedVelocities, 0), 'fc-velocities'],
  ['median δv km/s', 'median velocity error, km/s', (f) => num(f.medianVelocityErrorKms), 'fc-verr'],
  ['δ rotation km/s', '1-sigma error of the rotation amplitude, km/s', (f) => num(f.rotation.amplitudeErrorKms), 'fc-rot'],
  ['rotation found', 'share of mocks that detect the assumed rotation at 3 sigma', (f) => pct(f.rotation.detectionFraction), 'fc-detect'],
  ['δ slope σ(R)', '1-sigma error of the logarithmic slope of the dispersion profile', (f) => num(f.dispersionSlope.slopeError, 2), 'fc-slope'],
  ['δ kin. PA', '1-sigma error of the kinematic position angle, degrees', (f) => `${num(f.rotation.kinematicPaErrorDeg)}°`, 'fc-pa'],
  ['δσ/σ outer', 'fractional 1-sigma error of the dispersion in the outermost radial bin', (f) => pct(f.dispersionProfile.at(-1)?.sigmaFracError ?? null), 'fc-outer'],
  ['δM/M', 'fractional 1-sigma error of the mass within the outermost radius (Watkins, Evans & An 2010)', (f) => pct(f.mass.fracError), 'fc-mass'],
  ['r_out kpc', 'outermost expected cluster radius, kpc', (f) => num(f.mass.radiusKpc, 0), 'fc-rout'],
  ['hours', 'hours for all masks with overheads', (f) => num(f.hours.total, 1), 'fc-hours'],
];

/** Nights a forecast's hours need, site by site (sites observe in parallel), from each site's nights; null until they are known. */
function forecastNights(f: Forecast, rows: ReadonlyMap<string, NightRow[]> | null, sem: { from: string; to: string }): NightsEstimate | null {
  if (!rows || !rows.size) return null;
  const first = rows.values().next().value as NightRow[];
  return nightsOfSites(f.hours.siteHours, (id) => ({ rows: rows.get(id) ?? first, from: sem.from, to: sem.to })).overall;
}

const nightsText = (n: NightsEstimate | null) => (n === null ? '…' : n.nightsNeeded === null ? `> ${n.nightsUsable}` : `${n.nightsNeeded} of ${n.nightsUsable}`);

/**
 * The semester's nights at every site of the plan (observe/night.ts in a worker, as the Nights panel computes them),
 * by profile id: the plan's forecast.semesterFrom/semesterTo, else the current semester; observing.maxAirmass, else 2.
 */
function useSemesterNights(c: EditorController, galaxy: { raDeg: number; decDeg: number } | undefined) {
  const plan = c.store!.doc.plan, profile = c.store!.doc.profile;
  const given = plan.forecast?.semesterFrom && plan.forecast?.semesterTo ? { from: plan.forecast.semesterFrom, to: plan.forecast.semesterTo } : null;
  const sem = given ? { ...given, label: `${given.from} to ${given.to}` } : semesterOf(new Date());
  const maxAirmass = (plan.observing as { maxAirmass?: number } | undefined)?.maxAirmass ?? 2;
  const sites = editorPlanSites(plan, profile);
  const siteKey = sites.map((x) => `${x.instrument}@${x.site.latDeg},${x.site.lonDeg},${x.site.elevationM}`).join(';');
  const [rows, setRows] = useState<Map<string, NightRow[]> | null>(null);
  const worker = useRef<Worker | null>(null);
  const pending = useRef<{ ids: Map<number, string>; got: Map<string, NightRow[]> }>({ ids: new Map(), got: new Map() });
  const nextId = useRef(0);
  useEffect(() => {
    const w = new Worker(new URL('../worker/nightsWorker.ts', import.meta.url), { type: 'module' });
    worker.current = w;
    w.onmessage = (ev: MessageEvent<NightsReply>) => {
      const p = pending.current, instrument = p.ids.get(ev.data.id);
      if (instrument === undefined || 'error' in ev.data) return;
      p.ids.delete(ev.data.id);
      p.got.set(instrument, ev.data.rows);
      if (!p.ids.size) setRows(new Map(p.got));
    };
    return () => w.terminate();
  }, []);
  useEffect(() => {
    if (!galaxy || !worker.current) return;
    pending.current = { ids: new Map(), got: new Map() };
    setRows(null);
    for (const x of sites) {
      const id = ++nextId.current;
      pending.current.ids.set(id, x.instrument);
      const req: NightsRequest = { id, from: sem.from, to: sem.to, raDeg: galaxy.raDeg, decDeg: galaxy.decDeg, site: { latDeg: x.site.latDeg, lonDeg: x.site.lonDeg, elevationM: x.site.elevationM }, maxAirmass };
      worker.current.postMessage(req);
    }
    // siteKey stands for `sites` (a new array each render).
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [sem.from, sem.to, maxAirmass, galaxy?.raDeg, galaxy?.decDeg, siteKey]);
  return { rows, sem, maxAirmass };
}

/** The panel: current (or live, while dragging) and saved forecasts, one plot at a time. */
export function ForecastPanel({ c }: { c: EditorController }) {
  const result: SolveResult | undefined = c.session.solution?.result;
  const profile = c.store!.doc.profile;
  const live = !!c.session.preview || (!!result && !c.session.solvedDoc);
  const clean = !c.store!.dirty && c.solutionIsCurrent;
  const [now, setNow] = useState<{ f: Forecast; ms: number; live: boolean } | null>(null);
  const [saved, setSaved] = useState<Forecast | null>(null);
  const [plot, setPlot] = useState<Plot>('dispersion');
  const [error, setError] = useState<string | null>(null);
  const worker = useRef<Worker | null>(null);
  const state = useRef<{ id: number; busy: boolean; pending: ForecastRequest | null; meta: Map<number, { live: boolean; result: SolveResult }> }>({ id: 0, busy: false, pending: null, meta: new Map() });
  const lastFull = useRef<{ f: Forecast; result: SolveResult } | null>(null);
  const nights = useSemesterNights(c, result?.galaxy);

  useEffect(() => {
    const w = new Worker(new URL('../worker/forecastWorker.ts', import.meta.url), { type: 'module' });
    worker.current = w;
    w.onmessage = (ev: MessageEvent<ForecastReply>) => {
      const s = state.current;
      const meta = s.meta.get(ev.data.id);
      s.meta.delete(ev.data.id);
      s.busy = false;
      if (s.pending) { w.postMessage(s.pending); s.busy = true; s.pending = null; }
      if ('error' in ev.data) { setError(ev.data.error); return; }
      setError(null);
      if (!meta) return;
      setNow({ f: ev.data.forecast, ms: ev.data.computeMs, live: meta.live });
      if (!meta.live) lastFull.current = { f: ev.data.forecast, result: meta.result };
    };
    return () => w.terminate();
  }, []);

  useEffect(() => {
    if (!result || !worker.current) return;
    const s = state.current;
    const req: ForecastRequest = { id: ++s.id, plan: result.plan, profile, galaxy: result.galaxy, masks: result.masks, trials: live ? LIVE_FORECAST_TRIALS : DEFAULT_TRIALS, seed: 1 };
    s.meta.set(req.id, { live, result });
    if (s.busy) {
      if (s.pending) s.meta.delete(s.pending.id); // overtaken before it was sent
      s.pending = req;
    } else { worker.current.postMessage(req); s.busy = true; }
  }, [result, profile, live]);

  // The saved layout's forecast: the full forecast of the exact solve of a plan without unsaved changes.
  useEffect(() => {
    if (clean && lastFull.current && lastFull.current.result === result) setSaved(lastFull.current.f);
  }, [clean, result, now]);

  const f = now?.f ?? null;
  const other = saved && f && saved !== f ? saved : undefined;
  const svg = !f ? '' : plot === 'dispersion' ? dispersionProfileSvg(f, other) : plot === 'rotation' ? rotationSvg(f, other) : starlightMapSvg(f);
  const trials = now?.live ? LIVE_FORECAST_TRIALS : DEFAULT_TRIALS;
  return (
    <Panel title="Science forecast" testId="panel-forecast">
      {!f ? (
        <div className="small dim">{result ? 'forecasting…' : 'no solved layout yet'}</div>
      ) : (
        <>
          <table className="mini" data-testid="forecast-table">
            <thead><tr><th /><th>{now!.live ? 'dragging' : 'current'}</th><th>saved</th></tr></thead>
            <tbody>
              {ROWS.map(([label, title, get, id]) => (
                <tr key={id} title={title}><td>{label}</td><td className="num" data-testid={id}>{get(f)}</td><td className="num dim" data-testid={`${id}-saved`}>{saved ? get(saved) : '–'}</td></tr>
              ))}
              <tr title={`nights of the semester ${nights.sem.label} needed for the hours (best nights first; dark time with the galaxy below airmass ${nights.maxAirmass}; sites of a mixed plan in parallel), of the usable nights`}>
                <td>nights</td>
                <td className="num" data-testid="fc-nights" data-hours={f.hours.total} data-from={nights.sem.from} data-to={nights.sem.to} data-max-airmass={nights.maxAirmass}>{nightsText(forecastNights(f, nights.rows, nights.sem))}</td>
                <td className="num dim" data-testid="fc-nights-saved">{saved ? nightsText(forecastNights(saved, nights.rows, nights.sem)) : '–'}</td>
              </tr>
            </tbody>
          </table>
          <div className="row-tools">
            {(['dispersion', 'rotation', 'starlight'] as Plot[]).map((p) => (
              <button key={p} onClick={() => setPlot(p)} aria-pressed={plot === p} data-testid={`forecast-plot-${p}`} title={`show the ${p} plot`}>{p === 'dispersion' ? 'σ(R)' : p}</button>
            ))}
            <button onClick={() => downloadFile(`forecast-${plot}.svg`, svg, 'image/svg+xml')} title="Save this plot as SVG">SVG</button>
            <button onClick={() => downloadFile('forecast.json', JSON.stringify(f, null, 2), 'application/json')} title="Save the whole forecast (as haloweave forecast writes it)">JSON</button>
          </div>
          <div className="forecast-plot" data-testid="forecast-plot" style={{ background: '#fff', borderRadius: 4 }} dangerouslySetInnerHTML={{ __html: svg.replace(/ width="\d+" height="\d+"/, ' width="100%"') }} />
          <div className="small dim" data-testid="forecast-info" data-live={now!.live ? 'yes' : 'no'} data-trials={trials}>
            {trials} mocks{now!.live ? ' while dragging' : ''} (errors good to {(trialPrecision(trials) * 100).toFixed(0)} %), {now!.ms.toFixed(0)} ms in a worker
            {other ? ' · dashed: saved layout' : ''} · model and assumptions in the plan's forecast section (docs/forecast.md)
          </div>
        </>
      )}
      {error && <div className="error" data-testid="forecast-error">{error}</div>}
    </Panel>
  );
}
