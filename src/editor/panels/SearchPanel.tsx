/** The pointing search as one button, with a progress bar and a cancel; it runs in its own worker. */
import type { EditorController } from '../controller';
import { Panel } from './Panel';

export function SearchPanel({ c }: { c: EditorController }) {
  const s = c.session.search;
  const masks = c.store!.doc.plan.masks ?? [];
  const free = masks.filter((m) => !m.locked).length + Math.max(0, c.store!.doc.plan.goals.masks - masks.length);
  return (
    <Panel title="Pointing search" testId="panel-search">
      {s?.running ? (
        <div className="search-run">
          {/* Cancel sits beside the bar, above the message: a message that wraps to another line must not move it. */}
          <div className="search-bar">
            <progress data-testid="search-progress" value={s.fraction} max={1} />
            <button data-testid="search-cancel" onClick={() => c.cancelSearch()}>Cancel</button>
          </div>
          <div className="small" data-testid="search-message">{Math.round(s.fraction * 100)} % · {s.message}</div>
        </div>
      ) : (
        <button className="primary" data-testid="search-start" disabled={!c.session.catalog || free === 0} onClick={() => c.startSearch()}>
          Place {free} free mask{free === 1 ? '' : 's'}
        </button>
      )}
      <p className="dim small">Chooses centres and PAs of the unlocked masks for weighted tracer yield and coverage; locked masks stay. Undo returns to the previous layout.</p>
    </Panel>
  );
}
