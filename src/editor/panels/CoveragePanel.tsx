/**
 * Coverage plots: slits per radial bin of 1 Re for tracers and starlight against their goal radii,
 * and tracers per azimuthal sector (45 degrees from the major axis) as a rose. Drawn as SVG.
 * Tracers: solid blue bars; starlight: orange bars with diagonal hatching, so the two differ without colour.
 */
import type { CoverageReport, RoleCoverage } from '../../core/coverage/coverage';
import type { EditorController } from '../controller';
import { INK, ROLE_STYLE } from '../view/palette';
import { Panel } from './Panel';

const W = 290;

function RadialBars({ tracer, starlight }: { tracer: RoleCoverage; starlight: RoleCoverage }) {
  const nBins = Math.max(tracer.radialBins.length, starlight.radialBins.length, 1);
  const max = Math.max(1, ...tracer.radialBins.map((b) => b.count), ...starlight.radialBins.map((b) => b.count));
  const h = 120, left = 28, bottom = 18, plotW = W - left - 6, plotH = h - bottom - 6;
  const bw = plotW / nBins;
  const y = (v: number) => 6 + plotH - (v / max) * plotH;
  const tick = Math.max(1, Math.ceil(max / 4));
  return (
    <svg width={W} height={h} data-testid="radial-plot" role="img" aria-label="slits per radial bin">
      <defs>
        <pattern id="hatch" width="5" height="5" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
          <rect width="5" height="5" fill={ROLE_STYLE.starlight.colour} opacity="0.35" />
          <line x1="0" y1="0" x2="0" y2="5" stroke={ROLE_STYLE.starlight.colour} strokeWidth="2.5" />
        </pattern>
      </defs>
      {Array.from({ length: Math.floor(max / tick) + 1 }, (_, i) => i * tick).map((v) => (
        <g key={v}>
          <line x1={left} x2={W - 6} y1={y(v)} y2={y(v)} stroke={INK.grid} />
          <text x={left - 4} y={y(v) + 3} textAnchor="end" className="axis">{v}</text>
        </g>
      ))}
      {tracer.radialBins.map((b, i) => (
        <rect key={`t${i}`} x={left + i * bw + 1} width={bw * 0.5 - 1} y={y(b.count)} height={plotH + 6 - y(b.count)} fill={ROLE_STYLE.tracer.colour}>
          <title>{`tracers ${b.fromRe}–${b.toRe} Re: ${b.count}`}</title>
        </rect>
      ))}
      {starlight.radialBins.map((b, i) => (
        <rect key={`s${i}`} x={left + i * bw + bw * 0.5} width={bw * 0.5 - 1} y={y(b.count)} height={plotH + 6 - y(b.count)} fill="url(#hatch)" stroke={ROLE_STYLE.starlight.colour} strokeWidth={0.8}>
          <title>{`starlight ${b.fromRe}–${b.toRe} Re: ${b.count}`}</title>
        </rect>
      ))}
      {[{ r: tracer.goalRe, c: ROLE_STYLE.tracer.colour, d: '' }, { r: starlight.goalRe, c: ROLE_STYLE.starlight.colour, d: '5 3' }].map((g, i) =>
        g.r > 0 ? <line key={i} x1={left + (g.r / nBins) * plotW} x2={left + (g.r / nBins) * plotW} y1={4} y2={6 + plotH} stroke={g.c} strokeWidth={1.5} strokeDasharray={g.d || undefined} /> : null)}
      {Array.from({ length: nBins + 1 }, (_, i) => i).filter((i) => i % Math.max(1, Math.ceil(nBins / 10)) === 0).map((i) => (
        <text key={i} x={left + i * bw} y={h - 4} textAnchor="middle" className="axis">{i}</text>
      ))}
      <text x={W - 6} y={12} textAnchor="end" className="axis">per 1 Re bin of R/Re</text>
    </svg>
  );
}

function SectorRose({ tracer, galaxyPaDeg }: { tracer: RoleCoverage; galaxyPaDeg: number }) {
  const size = 150, cx = size / 2, cy = size / 2, rMax = size / 2 - 14;
  const max = Math.max(1, ...tracer.sectors.map((s) => s.count));
  // Sector azimuth phi runs from the major axis towards +v; drawn with the major axis at its sky PA (North up, East left).
  const screenAngle = (phiDeg: number) => {
    // u points to PA theta and v (xi cos theta - eta sin theta) to PA theta + 90, so azimuth phi points to PA theta + phi.
    const pa = (galaxyPaDeg + phiDeg) * (Math.PI / 180);
    return { x: -Math.sin(pa), y: -Math.cos(pa) };
  };
  return (
    <svg width={size} height={size} data-testid="sector-plot" role="img" aria-label="tracers per azimuthal sector">
      {[0.5, 1].map((f) => <circle key={f} cx={cx} cy={cy} r={rMax * f} fill="none" stroke={INK.grid} />)}
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
      <text x={cx} y={10} textAnchor="middle" className="axis">N</text>
      <text x={6} y={cy + 3} className="axis">E</text>
    </svg>
  );
}

export function CoveragePanel({ c, galaxyPaDeg }: { c: EditorController; galaxyPaDeg: number }) {
  const cov = c.session.solution?.result.coverage as CoverageReport | undefined;
  return (
    <Panel title="Coverage" testId="panel-coverage">
      {!cov ? <p className="dim">no solution yet</p> : (
        <>
          <div className="legend small">
            <span><i className="sw" style={{ background: ROLE_STYLE.tracer.colour }} /> tracers</span>
            <span><i className="sw hatch" /> starlight</span>
            <span className="dim">vertical lines: goal radii</span>
          </div>
          <RadialBars tracer={cov.roles.tracer} starlight={cov.roles.starlight} />
          <div className="rose-row">
            <SectorRose tracer={cov.roles.tracer} galaxyPaDeg={galaxyPaDeg} />
            <div className="small">
              <div>tracers per 45° sector, as on the sky (dashed: major axis)</div>
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
