/**
 * Nights: dark hours with airmass below a limit for every night of a semester at the profile's site,
 * with the Moon's illuminated fraction, computed in a worker (src/core/observe/night.ts); and each mask's
 * recommended hour-angle window from the solution's refraction report (src/core/pipeline/refractionReport.ts).
 */
import { memo, useEffect, useRef, useState } from 'react';
import { editorPlanSites } from '../io/planProfiles';
import { semesterOf } from '../io/semester';
import type { EditorController } from '../controller';
import type { NightRow } from '../../core/observe/night';
import type { GalaxyModel } from '../../core/plan/schema';
import type { NightsReply, NightsRequest } from '../worker/nightsWorker';
import { INK, ROLE_STYLE } from '../view/palette';
import { NumberField, Panel } from './Panel';
import { monthYearLabel } from './plotAxes';

/** Dark hours per night (bars) and the Moon's lit fraction (dashed line); memoised: it redraws only when the rows change, not on every solve. */
const NightsChart = memo(function NightsChart({ rows }: { rows: NightRow[] }) {
  const W = 290, H = 132, left = 30, right = 32, bottom = 28;
  const maxH = Math.max(1, ...rows.map((r) => r.darkTotalHours));
  const bw = (W - left - right) / Math.max(1, rows.length);
  const y = (h: number) => 4 + (H - bottom - 4) * (1 - h / maxH);
  const months = rows.map((r, i) => ({ r, i })).filter(({ r }) => r.date.endsWith('-01'));
  const moon = rows.map((r, i) => `${left + (i + 0.5) * bw},${4 + (H - bottom - 4) * (1 - r.moonIllumination)}`).join(' ');
  const xEnd = W - right;
  return (
    <svg width={W} height={H} viewBox={`0 0 ${W} ${H}`} data-testid="nights-plot" role="img" aria-label="dark hours per night">
      {[0, Math.round(maxH / 2), Math.round(maxH)].map((h) => (
        <g key={h}><line x1={left} x2={xEnd} y1={y(h)} y2={y(h)} stroke={INK.grid} /><text x={left - 3} y={y(h) + 3} textAnchor="end" className="axis">{h}</text></g>
      ))}
      {rows.map((r, i) => (
        <rect key={r.date} x={left + i * bw} width={Math.max(0.8, bw - 0.3)} y={y(r.darkHours)} height={H - bottom - y(r.darkHours)} fill={ROLE_STYLE.tracer.colour}>
          <title>{`${r.date}: ${r.darkHours.toFixed(1)} h dark below the airmass limit, Moon ${(r.moonIllumination * 100).toFixed(0)} % lit, ${r.moonSeparationDeg.toFixed(0)}° away`}</title>
        </rect>
      ))}
      <polyline points={moon} fill="none" stroke={ROLE_STYLE.starlight.colour} strokeWidth={1.2} strokeDasharray="4 2" />
      {months.map(({ r, i }, k) => <text key={r.date} x={left + i * bw} y={H - bottom + 11} className="axis" data-testid="nights-month">{k === 0 || r.date.slice(5, 7) === '01' ? monthYearLabel(r.date) : monthYearLabel(r.date).slice(0, 3)}</text>)}
      {[0, 0.5, 1].map((f) => <text key={f} x={xEnd + 3} y={4 + (H - bottom - 4) * (1 - f) + 3} className="axis">{f * 100}</text>)}
      <text transform={`translate(9, ${(H - bottom) / 2}) rotate(-90)`} textAnchor="middle" className="axis axis-title">dark hours</text>
      <text transform={`translate(${W - 6}, ${(H - bottom) / 2}) rotate(90)`} textAnchor="middle" className="axis axis-title">Moon lit %</text>
      <text x={left + (xEnd - left) / 2} y={H - 3} textAnchor="middle" className="axis axis-title">night (local evening date)</text>
    </svg>
  );
});

function HourAngleWindows({ c }: { c: EditorController }) {
  const masks = c.session.solution?.result.plan.masks ?? [];
  const W = 290, left = 40, span = 6; // hour angles from -6 h to +6 h
  const x = (h: number) => left + ((h + span) / (2 * span)) * (W - left - 6);
  const rows = masks.filter((m) => 'hourAngleWindowH' in m);
  if (!rows.length) return <p className="dim small">Hour-angle windows appear with the next full solve.</p>;
  return (
    <svg width={W} height={32 + rows.length * 18} viewBox={`0 0 ${W} ${32 + rows.length * 18}`} data-testid="ha-windows" role="img" aria-label="hour-angle window per mask">
      <text x={left + (W - left - 6) / 2} y={28 + rows.length * 18} textAnchor="middle" className="axis axis-title">hour angle (h; negative: east of the meridian)</text>
      {[-6, -3, 0, 3, 6].map((h) => (
        <g key={h}><line x1={x(h)} x2={x(h)} y1={12} y2={12 + rows.length * 18} stroke={INK.grid} /><text x={x(h)} y={9} textAnchor="middle" className="axis">{h > 0 ? `+${h}` : h} h</text></g>
      ))}
      {rows.map((m, i) => {
        const w = (m as { hourAngleWindowH?: [number, number] | null }).hourAngleWindowH;
        const d = (m as { designHourAngleH?: number }).designHourAngleH ?? 0;
        const yy = 16 + i * 18;
        return (
          <g key={m.id} data-testid={`ha-window-${m.id}`} data-from={w ? w[0] : ''} data-to={w ? w[1] : ''}>
            <text x={2} y={yy + 9} className="axis">{m.id}</text>
            {w ? <rect x={x(Math.max(-span, w[0]))} width={Math.max(1, x(Math.min(span, w[1])) - x(Math.max(-span, w[0])))} y={yy} height={11} fill={ROLE_STYLE.tracer.colour} fillOpacity={0.8}>
              <title>{`${m.id}: every slit keeps its light from ${w[0].toFixed(2)} h to ${w[1].toFixed(2)} h`}</title></rect>
              : <text x={x(0)} y={yy + 9} className="axis" textAnchor="middle">no hour angle passes</text>}
            <line x1={x(d)} x2={x(d)} y1={yy - 2} y2={yy + 13} stroke={INK.text} strokeWidth={1.5} />
          </g>
        );
      })}
    </svg>
  );
}

export function ObservabilityPanel({ c, galaxy }: { c: EditorController; galaxy: GalaxyModel }) {
  // A plan with several spectrographs: the nights of the chosen instrument's site.
  const sites = editorPlanSites(c.store!.doc.plan, c.store!.doc.profile);
  const [siteIndex, setSiteIndex] = useState(0);
  const site = (sites[siteIndex] ?? sites[0]).site;
  const [sem, setSem] = useState(() => semesterOf(new Date()));
  const [maxAirmass, setMaxAirmass] = useState(2);
  const [rows, setRows] = useState<NightRow[] | null>(null);
  const [info, setInfo] = useState('');
  const worker = useRef<Worker | null>(null);
  const reqId = useRef(0);
  useEffect(() => {
    const w = new Worker(new URL('../worker/nightsWorker.ts', import.meta.url), { type: 'module' });
    worker.current = w;
    w.onmessage = (ev: MessageEvent<NightsReply>) => {
      if (ev.data.id !== reqId.current) return;
      if ('error' in ev.data) { setInfo(`could not compute the nights: ${ev.data.error}`); return; }
      setRows(ev.data.rows);
      setInfo(`${ev.data.rows.length} nights in ${(ev.data.computeMs / 1000).toFixed(1)} s`);
    };
    return () => w.terminate();
  }, []);
  useEffect(() => {
    const id = ++reqId.current;
    setInfo('computing…');
    const req: NightsRequest = { id, from: sem.from, to: sem.to, raDeg: galaxy.raDeg, decDeg: galaxy.decDeg, site: { latDeg: site.latDeg, lonDeg: site.lonDeg, elevationM: site.elevationM }, maxAirmass };
    worker.current?.postMessage(req);
  }, [sem, maxAirmass, galaxy.raDeg, galaxy.decDeg, site.latDeg, site.lonDeg, site.elevationM]);
  const total = rows ? rows.reduce((a, r) => a + r.darkHours, 0) : 0;
  const shift = (months: number) => {
    const d = new Date(`${sem.from}T00:00:00Z`);
    d.setUTCMonth(d.getUTCMonth() + months);
    setSem(semesterOf(d));
  };
  return (
    <Panel title="Nights and hour angles" testId="panel-observability">
      <div className="row-tools">
        <button onClick={() => shift(-6)} aria-label="previous semester">‹</button>
        <span data-testid="semester">{sem.label}</span>
        <button onClick={() => shift(6)} aria-label="next semester">›</button>
        <NumberField label="airmass <" value={maxAirmass} min={1.01} max={5} onCommit={setMaxAirmass} />
        {sites.length > 1 && (
          <select data-testid="nights-site" value={Math.min(siteIndex, sites.length - 1)} onChange={(e) => setSiteIndex(Number(e.target.value))} title="the site whose nights are shown">
            {sites.map((x, k) => <option key={x.instrument} value={k}>{`${x.instrument} (lat ${x.site.latDeg.toFixed(1)}°)`}</option>)}
          </select>
        )}
      </div>
      {rows && <NightsChart rows={rows} />}
      <div className="small dim" data-testid="nights-info">
        {rows ? `${total.toFixed(0)} dark hours below airmass ${maxAirmass} over the semester; bars: hours per night, dashed: Moon lit fraction · ` : ''}{info}
      </div>
      <h4>hour-angle window per mask (bar; line: design hour angle)</h4>
      <HourAngleWindows c={c} />
    </Panel>
  );
}
