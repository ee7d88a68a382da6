/** Slits per role and reach per role (largest R/Re), against the goals; the numbers tests read. */
import type { EditorController } from '../controller';
import { reachByRole, slitCountsByRole } from '../derive';
import { ROLE_STYLE, ROLES } from '../view/palette';
import { RoleMark } from './MasksPanel';
import { Panel } from './Panel';
import { InstrumentYieldTable } from './InstrumentYieldTable';

export function YieldPanel({ c }: { c: EditorController }) {
  const sol = c.session.solution;
  const goals = c.store!.doc.plan.goals;
  const counts = sol ? slitCountsByRole(sol.result.masks) : null;
  const reach = sol ? reachByRole(sol.result.coverage) : null;
  const goalOf = (r: string) => (r === 'tracer' ? goals.tracerReachRe : r === 'starlight' ? goals.starlightReachRe : null);
  return (
    <Panel title="Yield" testId="panel-yield">
      <table className="mini yield">
        <thead><tr><th /><th>role</th><th>slits</th><th>reach</th><th>goal</th></tr></thead>
        <tbody>
          {ROLES.map((r) => {
            const g = goalOf(r);
            const met = reach && g !== null ? reach[r] >= g * 0.999 : null;
            return (
              <tr key={r}>
                <td><RoleMark role={r} /></td>
                <td>{ROLE_STYLE[r].label.replace(/ (slit|box)$/, '')}</td>
                <td className="num" data-testid={`count-${r}`}>{counts ? counts[r] : '–'}</td>
                <td className="num" data-testid={`reach-${r}`} data-value={reach ? reach[r] : ''}>{reach ? `${reach[r].toFixed(2)} Re` : '–'}</td>
                <td className={`num ${met === null ? '' : met ? 'ok' : 'short'}`}>{g !== null ? `${g} Re ${met === null ? '' : met ? '✓' : '✗'}` : ''}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <InstrumentYieldTable c={c} />
      <div className="small dim" data-testid="solve-info" data-compute-ms={sol ? sol.computeMs.toFixed(2) : ''}>
        {sol ? `solved in ${sol.computeMs.toFixed(1)} ms (worker)` : c.session.catalog ? 'solving…' : 'no catalog loaded'}
        {c.session.solving ? ' · updating' : ''}
      </div>
      {sol && sol.result.warnings.length > 0 && (
        <ul className="warnings" data-testid="solve-warnings">{sol.result.warnings.map((w, i) => <li key={i}>{w}</li>)}</ul>
      )}
      {sol && Array.isArray(sol.result.extra.problems) && sol.result.extra.problems.length > 0 && (
        <ul className="warnings problems" data-testid="solve-problems">
          {(sol.result.extra.problems as { where: string; what: string; fix?: string }[]).map((p, i) => <li key={i}>{p.where}: {p.what}{p.fix ? ` (${p.fix})` : ''}</li>)}
        </ul>
      )}
      {c.session.solveError && (
        <div className="error" data-testid="solve-error">
          {c.session.solveError.message}
        </div>
      )}
    </Panel>
  );
}
