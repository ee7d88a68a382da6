/** The masks: centre, PA, lock, and slits per role on each; click a row to make it the active mask. */
import type { EditorController } from '../controller';
import { setMaskLockedCommand } from '../store/commands';
import { instrumentRef, setMaskInstrumentCommand } from '../store/instrumentCommands';
import { formatDecDms, formatRaHms } from '../../core/sky/sexagesimal';
import type { MaskSolution } from '../../core/solver/types';
import { ROLE_STYLE, ROLES } from '../view/palette';
import { slitCountsByRole } from '../derive';
import { Panel } from './Panel';

export function MasksPanel({ c, solved }: { c: EditorController; solved: readonly MaskSolution[] }) {
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
                <td className="num" data-testid={`mask-${m.id}-pa`}>{m.paDeg !== undefined ? m.paDeg.toFixed(1) : '–'}</td>
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
      <p className="dim small">Drag a mask on the sky to move it, its round handle to turn it. A mask moved by hand is locked.</p>
      <label className="small" title="Off: the slits and coverage are solved when the mask is dropped, not on every step of the drag (for slow machines)">
        <input type="checkbox" data-testid="live-drag" checked={c.session.liveDrag} onChange={(e) => c.setLiveDrag(e.target.checked)} /> re-solve while dragging
      </label>
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

