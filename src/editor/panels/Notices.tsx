/** Messages for the user (file problems, restored work), each with its list of problems and a close button. */
import { formatProblem } from '../../core/result';
import type { EditorController } from '../controller';

export function Notices({ c }: { c: EditorController }) {
  const notices = c.session.notices;
  if (!notices.length) return null;
  return (
    <div className="notices" data-testid="notices">
      {notices.map((n) => (
        <div key={n.id} className={`notice ${n.level}`} data-testid={`notice-${n.level}`}>
          <div className="notice-text">{n.text}</div>
          {n.problems && n.problems.length > 0 && (
            <ul>{n.problems.slice(0, 20).map((p, i) => <li key={i}>{formatProblem(p)}</li>)}</ul>
          )}
          {n.action === 'show-rejects' && (
            <button className="notice-action" data-testid="notice-show-rejects" onClick={() => { c.showRejects(); c.dismissNotice(n.id); }}>Show the rows not used</button>
          )}
          <button className="close" aria-label="dismiss" title="close (Escape closes every message)" onClick={() => c.dismissNotice(n.id)}>×</button>
        </div>
      ))}
    </div>
  );
}
