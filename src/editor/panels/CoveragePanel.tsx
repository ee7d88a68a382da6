/**
 * Coverage plots: slits per radial bin of 1 Re for tracers and starlight against their goal radii,
 * and tracers per azimuthal sector (45 degrees from the major axis) as a rose. Drawn as SVG.
 * Tracers: solid blue bars; starlight: orange bars with diagonal hatching, so the two differ without colour.
 */
import { useRef } from 'react';
import type { CoverageReport, RoleCoverage } from '../../core/coverage/coverage';
import { galaxyRadiusAndAzimuth } from '../../core/sky/galaxyRadius';
import type { GalaxyModel } from '../../core/plan/schema';
import type { MaskSolution } from '../../core/geometry/maskSolution';
import type { EditorController } from '../controller';
import { countAxis } from './plotAxes';
import { INK, ROLE_STYLE } from '../view/palette';
import { Panel } from './Panel';

const W = 290;

/** Counts of one role per radial bin of 1 Re out to the tracer goal, then one bin beyond the goal. */
interface RadialCounts { bins: number[]; beyond: number }

/**
 * Tracers per bin from the coverage report (its bins out to the goal, and its count beyond the goal), starlight per the
 * same bins from the slits themselves (the report bins starlight only out to the starlight goal), so the bars add up
 * to every slit placed.
 */
export function radialCounts(cov: CoverageReport, galaxy: GalaxyModel | null, masks: readonly MaskSolution[]): { tracer: RadialCounts; starlight: RadialCounts; edges: number[] } {
  const t = cov.roles.tracer;
  const edges = [...t.radialBins.map((b) => b.fromRe), t.goalRe];
  const tracer = { bins: t.radialBins.map((b) => b.count), beyond: t.beyondGoal ?? 0 };
  const starlight = { bins: t.radialBins.map(() => 0), beyond: 0 };
  if (galaxy) {
    for (const m of masks) for (const s of m.slits) {
      if (s.role !== 'starlight') continue;
      const r = galaxyRadiusAndAzimuth(galaxy, s.raDeg, s.decDeg).rRe;
      const k = edges.findIndex((e, i) => i < edges.length - 1 && r >= e && r < edges[i + 1]);
      if (k >= 0) starlight.bins[k]++;
      else starlight.beyond++;
    }
  }
  return { tracer, starlight, edges };
}

function RadialBars({ counts, tracerGoalRe, starlightGoalRe, steadyTop }: {
  counts: ReturnType<typeof radialCounts>; tracerGoalRe: number; starlightGoalRe: number; steadyTop: { current: number; steady: boolean };
}) {
  const { tracer, starlight, edges } = counts;
  const nBins = tracer.bins.length + 1; // the last bar: beyond the goal
  const max = Math.max(1, ...tracer.bins, tracer.beyond, ...starlight.bins, starlight.beyond);
  // While a mask is dragged the axis only grows, so its ticks do not jump on every step; an exact solve sets it afresh.
  const axis = countAxis(steadyTop.steady ? Math.max(max, steadyTop.current) : max);
  steadyTop.current = axis.top;
  const h = 150, left = 34, bottom = 30, top = 16, plotW = W - left - 6, plotH = h - bottom - top;
  const bw = plotW / nBins;
  const y = (v: number) => top + plotH - (v / axis.top) * plotH;
  // A bar of count 1 stays visible (at least 3 px) however tall the others are.
  const barTop = (v: number) => (v > 0 ? Math.min(y(v), top + plotH - 3) : top + plotH);
  const xAt = (re: number) => {
    const k = edges.findIndex((e, i) => i < edges.length - 1 && re >= e && re <= edges[i + 1]);
    return k < 0 ? left + (nBins - 1) * bw : left + (k + (re - edges[k]) / (edges[k + 1] - edges[k])) * bw;
  };
  const bars = (role: 'tracer' | 'starlight', c: RadialCounts) => [...c.bins, c.beyond].map((v, i) => {
    const x = left + i * bw + (role === 'tracer' ? 1 : bw * 0.5);
    const from = i < c.bins.length ? `${edges[i]}–${edges[i + 1]} Re` : `beyond ${edges[edges.length - 1]} Re`;
    return (
      <g key={`${role}${i}`}>
        <rect x={x} width={bw * 0.5 - 1} y={barTop(v)} height={top + plotH - barTop(v)} data-role={role} data-count={v}
          fill={role === 'tracer' ? ROLE_STYLE.tracer.colour : 'url(#hatch)'} stroke={role === 'starlight' ? ROLE_STYLE.starlight.colour : undefined} strokeWidth={0.8}>
          <title>{`${role === 'tracer' ? 'tracer' : 'starlight'} slits ${from}: ${v}`}</title>
        </rect>
        {role === 'starlight' && v > 0 && <text x={x + bw * 0.25} y={barTop(v) - 2} textAnchor="middle" className="axis small-count">{v}</text>}
      </g>
    );
  });
  const labelEvery = Math.max(1, Math.ceil(nBins / 8));
  return (
    <svg width={W} height={h} viewBox={`0 0 ${W} ${h}`} data-testid="radial-plot" role="img" aria-label="slits per radial bin of 1 Re, and beyond the tracer goal">
      <defs>
        <pattern id="hatch" width="5" height="5" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <rect width="5" height="5" fill={ROLE_STYLE.starlight.colour} opacity="0.35" />
          <line x1="0" y1="0" x2="0" y2="5" stroke={ROLE_STYLE.starlight.colour} strokeWidth="2.5" />
        </pattern>
      </defs>
      <rect x={left + (nBins - 1) * bw} y={top} width={bw} height={plotH} fill={INK.grid} opacity={0.5} />
      {Array.from({ length: Math.round(axis.top / axis.step) + 1 }, (_, i) => i * axis.step).map((v) => (
        <g key={v} data-testid="radial-tick" data-value={v}>
          <line x1={left} x2={W - 6} y1={y(v)} y2={y(v)} stroke={INK.grid} />
          <text x={left - 4} y={y(v) + 3} textAnchor="end" className="axis">{v}</text>
        </g>
      ))}
      {bars('tracer', tracer)}
      {bars('starlight', starlight)}
      {[{ r: tracerGoalRe, c: ROLE_STYLE.tracer.colour, d: '' }, { r: starlightGoalRe, c: ROLE_STYLE.starlight.colour, d: '5 3' }].map((g, i) =>
        g.r > 0 ? <line key={i} x1={xAt(g.r)} x2={xAt(g.r)} y1={top - 2} y2={top + plotH} stroke={g.c} strokeWidth={1.5} strokeDasharray={g.d || undefined} /> : null)}
      {edges.map((e, i) => (i % labelEvery === 0 || i === edges.length - 1 ? <text key={i} x={left + i * bw} y={top + plotH + 11} textAnchor="middle" className="axis">{e}</text> : null))}
      <text x={left + (nBins - 0.5) * bw} y={top + plotH + 11} textAnchor="middle" className="axis">{'>'}</text>
      <text x={left + plotW / 2} y={h - 3} textAnchor="middle" className="axis axis-title">R / Re (circularised); last bar: beyond the goal</text>
      <text transform={`translate(9, ${top + plotH / 2}) rotate(-90)`} textAnchor="middle" className="axis axis-title">slits</text>
    </svg>
  );
}

function SectorRose({ tracer, galaxyPaDeg }: { tracer: RoleCoverage; galaxyPaDeg: number }) {
  const size = 150, cx = size / 2, cy = size / 2, rMax = size / 2 - 14;
  // Radius grows as the square root of the count (area proportional to count); the rings are labelled in counts.
  const max = countAxis(Math.max(1, ...tracer.sectors.map((s) => s.count)), 2).top;
  const rings = [max / 4, max].map((v) => ({ v, r: rMax * Math.sqrt(v / max) }));
  // Sector azimuth phi runs from the major axis towards +v; drawn with the major axis at its sky PA (North up, East left).
  const screenAngle = (phiDeg: number) => {
    // u points to PA theta and v (xi cos theta - eta sin theta) to PA theta + 90, so azimuth phi points to PA theta + phi.
    const pa = (galaxyPaDeg + phiDeg) * (Math.PI / 180);
    return { x: -Math.sin(pa), y: -Math.cos(pa) };
  };
  return (
    <svg width={size} height={size} viewBox={`0 0 ${size} ${size}`} data-testid="sector-plot" role="img" aria-label="tracers per azimuthal sector">
      {rings.map((g) => <circle key={g.v} cx={cx} cy={cy} r={g.r} fill="none" stroke={INK.grid} />)}
      {tracer.sectors.map((s, i) => {
        const r = rMax * Math.sqrt(s.count / max);
        const steps = 8;
        const pts = [`${cx},${cy}`];
        for (let k = 0; k <= steps; k++) {
          const a = screenAngle(s.fromDeg + ((s.toDeg - s.fromDeg) * k) / steps);
          pts.push(`${cx + a.x * r},${cy + a.y * r}`);
        }
        return (
          <polygon key={i} points={pts.join(' ')} fill={ROLE_STYLE.tracer.colour} fillOpacity={0.75} stroke={INK.background} strokeWidth={1}>
            <title>{`sector ${s.fromDeg}–${s.toDeg}° from the major axis: ${s.count} tracers`}</title>
          </polygon>
        );
      })}
      {(() => {
        const a = screenAngle(0), b = screenAngle(180);
        return <line x1={cx + b.x * rMax} y1={cy + b.y * rMax} x2={cx + a.x * rMax} y2={cy + a.y * rMax} stroke={INK.isophoteGoal} strokeDasharray="3 3" />;
      })()}
      {rings.map((g) => (
        <text key={`l${g.v}`} x={cx + g.r * 0.71 + 2} y={cy + g.r * 0.71 + 8} className="axis" data-testid="rose-ring" data-value={g.v}>{Number.isInteger(g.v) ? g.v : g.v.toFixed(1)}</text>
      ))}
      <text x={cx} y={10} textAnchor="middle" className="axis">N</text>
      <text x={6} y={cy + 3} className="axis">E</text>
    </svg>
  );
}

export function CoveragePanel({ c, galaxyPaDeg }: { c: EditorController; galaxyPaDeg: number }) {
  const sol = c.session.solution;
  const cov = sol?.result.coverage as CoverageReport | undefined;
  const steadyTop = useRef({ current: 0, steady: false });
  steadyTop.current.steady = !!sol && sol.mode === 'preview';
  return (
    <Panel title="Coverage" testId="panel-coverage">
      {!cov ? <p className="dim">no solution yet</p> : (
        <>
          <div className="legend small">
            <span><i className="sw" style={{ background: ROLE_STYLE.tracer.colour }} /> tracers</span>
            <span><i className="sw hatch" /> starlight</span>
            <span className="dim">vertical lines: goal radii</span>
          </div>
          <RadialBars counts={radialCounts(cov, sol!.result.galaxy, sol!.result.masks)} tracerGoalRe={cov.roles.tracer.goalRe} starlightGoalRe={cov.roles.starlight.goalRe} steadyTop={steadyTop.current} />
          <div className="rose-row">
            <SectorRose tracer={cov.roles.tracer} galaxyPaDeg={galaxyPaDeg} />
            <div className="small">
              <div>tracers per 45° sector, as on the sky (dashed: major axis); area ∝ count, rings labelled in slits</div>
              {cov.roles.tracer.emptyBinsFromRe.length > 0 && (
                <div className="short" data-testid="empty-bins">empty tracer bins from {cov.roles.tracer.emptyBinsFromRe.join(', ')} Re</div>
              )}
              {cov.roles.starlight.goalRe > 0 && cov.roles.starlight.emptyBinsFromRe.length > 0 && (
                <div className="short">empty starlight bins from {cov.roles.starlight.emptyBinsFromRe.join(', ')} Re</div>
              )}
            </div>
          </div>
        </>
      )}
    </Panel>
  );
}
