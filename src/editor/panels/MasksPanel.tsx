/**
 * The masks: PA (following a turn live), slits per role and lock of each; click a row to make it the active mask
 * (drawn on top in the sky view). The active mask's centre and PA can be typed (RA/Dec sexagesimal or degrees), set
 * along the galaxy's major or minor axis, or turned by 1° steps. Below: the exposure and signal-to-noise estimate
 * per mask and the resolving power, as the command line reports them.
 */
import { useState, useSyncExternalStore } from 'react';
import type { EditorController } from '../controller';
import { rotateMaskCommand, setMaskLockedCommand } from '../store/commands';
import { CENTRE_SNAP_STEPS_ARCSEC } from '../view/centreSnap';
import { instrumentRef, setMaskInstrumentCommand } from '../store/instrumentCommands';
import { formatDecDms, formatRaHms, parseDecDeg, parseRaDeg } from '../../core/sky/sexagesimal';
import { wrap360Deg } from '../../core/sky/angles';
import type { MaskSolution } from '../../core/geometry/maskSolution';
import type { PlanMask } from '../../core/plan/schema';
import type { MaskExposureReport } from '../../core/solver/exposure';
import { slitResolution } from '../../core/spectro/resolution';
import { ROLE_STYLE, ROLES } from '../view/palette';
import { slitCountsByRole } from '../derive';
import { NumberField, Panel } from './Panel';

/** A mask's PA as shown: the live pose while it is being turned or dragged, else the document's. */
function LivePa({ c, mask }: { c: EditorController; mask: PlanMask }) {
  const live = useSyncExternalStore(c.subscribeLive, c.getLivePose);
  const pa = live && live.id === mask.id ? live.paDeg : mask.paDeg;
  return <>{pa !== undefined ? pa.toFixed(1) : '–'}</>;
}

/** A sky coordinate field (RA or Dec, sexagesimal or degrees): commits on Enter or leaving it, says what is wrong otherwise. */
function CoordField({ label, value, format, parse, onCommit, testId }: {
  label: string; value: number; format(v: number): string; parse(t: string): { ok: true; value: number } | { ok: false; error: string };
  onCommit(v: number): void; testId: string;
}) {
  const [text, setText] = useState<string | null>(null);
  const r = text === null ? null : parse(text);
  const problem = r && !r.ok ? r.error : null;
  const commit = (keepRefused: boolean) => {
    if (text === null || !r) return;
    if (!r.ok) { if (!keepRefused) setText(null); return; }
    setText(null);
    if (Math.abs(r.value - value) > 1e-9) onCommit(r.value);
  };
  return (
    <label className={`field wide ${problem ? 'bad' : ''}`}>
      <span className="field-label">{label}</span>
      <input data-testid={testId} aria-invalid={!!problem} value={text ?? format(value)} onChange={(e) => setText(e.target.value)}
        onBlur={() => commit(false)} onKeyDown={(e) => { if (e.key === 'Enter') commit(true); if (e.key === 'Escape') setText(null); }} />
      {problem && <span className="field-error" role="alert" data-testid={`${testId}-error`}>{problem}</span>}
    </label>
  );
}

/** Typed centre and PA of the active mask, PA along the galaxy axes, and turning by steps (each one undoable edit). */
function ActiveMaskEditor({ c, mask, galaxyPaDeg }: { c: EditorController; mask: PlanMask; galaxyPaDeg: number }) {
  if (mask.raDeg === undefined || mask.decDeg === undefined) return <p className="dim small">{mask.id} is not placed yet.</p>;
  const pa = mask.paDeg ?? 0;
  const setPa = (v: number) => c.run((d) => rotateMaskCommand(d, mask.id, wrap360Deg(v)));
  const turn = (step: number) => setPa(Math.round((pa + step) * 10) / 10);
  return (
    <div className="mask-editor" data-testid="mask-editor">
      <div className="small"><b>{mask.id}</b> (active; [ and ] turn it by 1° in the sky view, Shift 10°)</div>
      <CoordField label="RA" value={mask.raDeg} format={(v) => formatRaHms(v, 2)} parse={parseRaDeg} testId="mask-ra"
        onCommit={(v) => c.moveMaskTyped(mask.id, v, mask.decDeg!)} />
      <CoordField label="Dec" value={mask.decDeg} format={(v) => formatDecDms(v, 1)} parse={parseDecDeg} testId="mask-dec"
        onCommit={(v) => c.moveMaskTyped(mask.id, mask.raDeg!, v)} />
      <div className="row-tools">
        <NumberField label="PA" unit="°" value={Math.round(pa * 1e4) / 1e4} min={-360} max={720} onCommit={setPa} testId="mask-pa" />
        <button data-testid="mask-turn-minus" title="turn by −1° (Shift+click −10°)" onClick={(e) => turn(e.shiftKey ? -10 : -1)}>−1°</button>
        <button data-testid="mask-turn-plus" title="turn by +1° (Shift+click +10°)" onClick={(e) => turn(e.shiftKey ? 10 : 1)}>+1°</button>
      </div>
      <div className="row-tools">
        <span className="dim small">slits</span>
        <button data-testid="mask-pa-major" title={`PA ${wrap360Deg(galaxyPaDeg).toFixed(1)}°: slits along the galaxy's major axis`} onClick={() => setPa(galaxyPaDeg)}>∥ major axis</button>
        <button data-testid="mask-pa-minor" title={`PA ${wrap360Deg(galaxyPaDeg + 90).toFixed(1)}°: slits along the minor axis`} onClick={() => setPa(galaxyPaDeg + 90)}>∥ minor axis</button>
      </div>
    </div>
  );
}

/** Per-mask exposure and S/N estimate (from the last full solve) and the resolving power of the profile's slits. */
function ExposureTable({ c, exposures }: { c: EditorController; exposures: readonly MaskExposureReport[] | null }) {
  const profile = c.store!.doc.profile;
  const res = slitResolution(profile.detector, profile.slits.widthArcsec, profile.detector.centralWavelengthA);
  const e0 = exposures?.[0];
  // A plan with several spectrographs may expose their masks differently (instruments[].observing): then per row.
  const same = !exposures || exposures.every((e) => e.exposureTimeS === e0!.exposureTimeS && e.targetSnPerA === e0!.targetSnPerA && e.wavelengthA === e0!.wavelengthA);
  return (
    <div className="exposure" data-testid="exposure">
      <h4>Exposure estimate</h4>
      {!e0 ? <p className="dim small">appears with the next full solve</p> : (
        <>
          {same ? <div className="small dim">{(e0.exposureTimeS / 3600).toFixed(2)} h per mask; S/N per Å at {e0.wavelengthA.toFixed(0)} Å, target {e0.targetSnPerA}</div>
            : <div className="small dim">each mask with its own spectrograph's exposure and target S/N per Å</div>}
          <table className="mini">
            <thead><tr><th>mask</th>{!same && <th className="num" title="exposure time of the mask (its spectrograph's)">h</th>}{!same && <th className="num" title="target S/N per Angstrom (its spectrograph's)">target</th>}<th className="num" title="median signal-to-noise per Angstrom of the mask's tracer slits">median S/N</th><th className="num" title="tracer slits reaching the target S/N in the exposure">at target</th></tr></thead>
            <tbody>
              {exposures!.map((e) => {
                const n = e.slits.filter((s) => s.role === 'tracer').length;
                return (
                  <tr key={e.maskId} data-testid={`exposure-${e.maskId}`} data-median-sn={e.medianTracerSnPerA ?? ''} data-reaching={e.tracersReachingTarget}
                    data-exposure-s={e.exposureTimeS} data-target-sn={e.targetSnPerA}>
                    <td>{e.maskId}</td>
                    {!same && <td className="num">{(e.exposureTimeS / 3600).toFixed(2)}</td>}
                    {!same && <td className="num">{e.targetSnPerA}</td>}
                    <td className="num">{e.medianTracerSnPerA === null ? '–' : e.medianTracerSnPerA.toFixed(1)}</td>
                    <td className="num">{e.tracersReachingTarget} of {n}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </>
      )}
      <div className="small" data-testid="resolving-power" data-value={res.resolvingPower}>
        resolving power R ≈ {Math.round(res.resolvingPower).toLocaleString('en-US')} at {profile.detector.centralWavelengthA.toFixed(0)} Å
        <span className="dim"> ({profile.slits.widthArcsec}″ slit: resolution element {res.fwhmPixels.toFixed(1)} px × {profile.detector.dispersionAPerPixel} Å/px)</span>
      </div>
    </div>
  );
}

export function MasksPanel({ c, solved, exposures, galaxyPaDeg }: { c: EditorController; solved: readonly MaskSolution[]; exposures: readonly MaskExposureReport[] | null; galaxyPaDeg: number }) {
  const masks = c.store!.doc.plan.masks ?? [];
  const active = c.session.activeMaskId;
  const byId = new Map(solved.map((m) => [m.mask.id, m]));
  const instruments = c.store!.doc.plan.instruments;
  return (
    <Panel title="Masks" testId="panel-masks">
      <table className="mini">
        <thead>
          <tr><th>mask</th>{instruments && <th>instrument</th>}<th>PA °</th>{ROLES.map((r) => <th key={r} title={ROLE_STYLE[r].label}><RoleMark role={r} /></th>)}<th>lock</th></tr>
        </thead>
        <tbody>
          {masks.map((m) => {
            const sol = byId.get(m.id);
            const counts = sol ? slitCountsByRole([sol]) : null;
            return (
              <tr key={m.id} data-testid={`mask-row-${m.id}`} className={m.id === active ? 'active' : ''}
                onClick={() => c.store!.updateSession((s) => ({ ...s, activeMaskId: m.id }))}
                title={m.raDeg !== undefined ? `${formatRaHms(m.raDeg, 1)} ${formatDecDms(m.decDeg ?? 0, 0)}` : 'not placed yet'}>
                <td>{m.id}</td>
                {instruments && (
                  <td onClick={(e) => e.stopPropagation()}>
                    <select data-testid={`mask-${m.id}-instrument`} value={instrumentRef(instruments, m.instrument)} title="the mask's spectrograph (the instruments' mask counts follow)"
                      onChange={(e) => c.run((d) => setMaskInstrumentCommand(d, m.id, e.target.value))}>
                      {instruments.map((x) => <option key={x.profile} value={x.profile}>{x.profile}</option>)}
                    </select>
                  </td>
                )}
                <td className="num" data-testid={`mask-${m.id}-pa`}><LivePa c={c} mask={m} /></td>
                {ROLES.map((r) => <td key={r} className="num" data-testid={`mask-${m.id}-${r}`}>{counts ? counts[r] : '–'}</td>)}
                <td>
                  <button
                    className={`lock ${m.locked ? 'on' : ''}`}
                    data-testid={`lock-${m.id}`}
                    aria-pressed={!!m.locked}
                    title={m.locked ? 'locked: the pointing search keeps this mask (click to unlock)' : 'free: the pointing search may move it (click to lock)'}
                    onClick={(e) => { e.stopPropagation(); c.run((d) => setMaskLockedCommand(d, m.id, !m.locked)); }}
                  >{m.locked ? 'locked' : 'free'}</button>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {(() => {
        const missing = c.store!.doc.plan.goals.masks - masks.length;
        return missing > 0 ? (
          <p className="small short" data-testid="masks-unplaced">
            {missing} more mask{missing === 1 ? '' : 's'} for the goal of {c.store!.doc.plan.goals.masks}: place {missing === 1 ? 'it' : 'them'} with the pointing search.
          </p>
        ) : null;
      })()}
      {(() => {
        const am = masks.find((m) => m.id === active);
        return am ? <ActiveMaskEditor c={c} mask={am} galaxyPaDeg={galaxyPaDeg} /> : <p className="dim small">Click a row (or a mask, or press N in the sky view) to type its centre and PA.</p>;
      })()}
      <p className="dim small">Drag a mask on the sky to move it, its round handle to turn it. A mask moved by hand is locked.</p>
      <div className="row-tools small">
        <label title="Off: the slits and coverage are solved when the mask is dropped, not on every step of the drag (for slow machines)">
          <input type="checkbox" data-testid="live-drag" checked={c.session.liveDrag} onChange={(e) => c.setLiveDrag(e.target.checked)} /> re-solve while dragging
        </label>
        <label title="Turning by the handle moves in these steps (Shift while turning: 5°)">
          PA steps <select data-testid="pa-snap" value={c.session.paSnapDeg} onChange={(e) => c.setPaSnap(Number(e.target.value))}>
            <option value={0}>0.1°</option><option value={0.5}>0.5°</option><option value={1}>1°</option><option value={5}>5°</option>
          </select>
        </label>
        <label title="Typed and dragged centres land on this grid of offsets from the galaxy centre (East and North)">
          centre steps <select data-testid="centre-snap" value={c.session.centreSnapArcsec} onChange={(e) => c.setCentreSnap(Number(e.target.value))}>
            {CENTRE_SNAP_STEPS_ARCSEC.map((s) => <option key={s} value={s}>{s === 0 ? 'exact' : `${s}″`}</option>)}
          </select>
        </label>
      </div>
      <ExposureTable c={c} exposures={exposures} />
    </Panel>
  );
}

/** The legend mark of a role: a solid, dashed or dotted bar, or a square for alignment boxes. */
export function RoleMark({ role, size = 14 }: { role: keyof typeof ROLE_STYLE; size?: number }) {
  const st = ROLE_STYLE[role];
  if (st.mark === 'square') {
    return <svg width={size} height={size} aria-label={st.label}><rect x={2.5} y={2.5} width={size - 5} height={size - 5} fill="none" stroke={st.colour} strokeWidth={2} /></svg>;
  }
  return (
    <svg width={size} height={size} aria-label={st.label}>
      <line x1={size / 2} y1={1} x2={size / 2} y2={size - 1} stroke={st.colour} strokeWidth={3} strokeDasharray={st.dash.join(' ') || undefined} />
    </svg>
  );
}

