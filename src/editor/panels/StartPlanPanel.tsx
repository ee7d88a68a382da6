/**
 * Start a plan from your own catalog and profile, as `haloweave draft` does: drop the catalog and the profile on this
 * panel (together, or one after the other, in either order; or pick them), type the galaxy's centre, size, shape and
 * velocity. Its columns and units are found, the usable rows and the alignment stars near the galaxy counted, the goals
 * chosen and each choice explained here; the drafted plan opens, is solved and shown (asking first when there is
 * unsaved work). What was typed and given stays in the panel (held by the controller) whatever goes wrong.
 */
import { useState, type DragEvent } from 'react';
import type { EditorController } from '../controller';
import { formatProblem, type Problem } from '../../core/result';
import { badStartFields, START_FIELDS } from '../io/startForm';
import { Panel } from './Panel';

function Problems({ list, testId }: { list: readonly Problem[]; testId: string }) {
  return <>{list.map((p, i) => <p key={i} className="small" role="alert" style={{ color: 'var(--bad)' }} data-testid={testId}>{formatProblem(p)}</p>)}</>;
}

export function StartPlanPanel({ c }: { c: EditorController }) {
  const st = c.start;
  const [over, setOver] = useState(false);
  const docProfile = c.store?.doc.profile;
  const bad = badStartFields(st.formProblems);
  const r = st.result;
  const take = (e: DragEvent) => {
    e.preventDefault();
    e.stopPropagation(); // the window's drop would open the files for the current plan
    setOver(false);
    void c.addStartFiles([...(e.dataTransfer?.files ?? [])]);
  };
  return (
    <Panel title="Start a plan" testId="panel-start-plan" startOpen={false}>
      <p className="dim small">Your catalog and your instrument profile, and the galaxy: columns and units are found, goals chosen and explained.</p>
      <div
        className={`start-drop ${over ? 'over' : ''}`}
        data-testid="start-drop"
        onDragOver={(e) => { e.preventDefault(); e.stopPropagation(); setOver(true); }}
        onDragLeave={() => setOver(false)}
        onDrop={take}
      >
        <div className="small" data-testid="start-catalog-name">catalog: {st.catalog ? <b>{st.catalog.name}</b> : <span className="dim">drop it here (CSV, TSV, ECSV, VOTable, FITS)</span>}</div>
        <div className="small" data-testid="start-profile-name">
          profile: {st.profile
            ? <><b>{st.profile.profile.id}</b> from {st.profile.fileName} <button className="link" data-testid="start-profile-clear" onClick={() => c.clearStartProfile()}>use {docProfile?.id}</button></>
            : <span className="dim">{docProfile?.id} (the instrument above), or drop your profile file here</span>}
        </div>
        <input type="file" multiple data-testid="start-files" title="pick the catalog and/or the profile"
          onChange={(e) => { void c.addStartFiles([...(e.target.files ?? [])]); e.target.value = ''; }} />
      </div>
      <Problems list={st.fileProblems} testId="start-file-problem" />
      {st.fileNotes.map((n, i) => <p key={i} className="small" data-testid="start-file-note">{n}</p>)}
      <div className="form-rows">
      {START_FIELDS.map((f) => (
        <label key={f.key} className={`field ${bad.has(f.key) ? 'bad' : ''}`}>
          <span className="field-label">{f.label}</span>
          <input type="text" data-testid={`start-${f.key}`} placeholder={f.placeholder} aria-invalid={bad.has(f.key)} value={st.values[f.key] ?? ''}
            onChange={(e) => c.setStartValue(f.key, e.target.value)} />
        </label>
      ))}
      </div>
      <button data-testid="start-plan" onClick={() => c.startPlan()}>Start the plan</button>
      <Problems list={st.formProblems} testId="start-bad" />
      {r && <Problems list={r.problems} testId="start-problem" />}
      {r?.summary && (
        <div className="small" data-testid="start-summary">
          <p data-testid="start-summary-catalog">{r.summary.catalog}</p>
          <p className="dim">columns:</p>
          <ul>{r.summary.columns.map((l) => <li key={l} data-testid="start-column">{l}</li>)}{r.summary.carried && <li className="dim">{r.summary.carried}</li>}</ul>
          <p data-testid="start-summary-tracers">{r.summary.tracers}</p>
          <p data-testid="start-summary-alignment">{r.summary.alignment}</p>
          <p>{r.summary.profile}</p>
        </div>
      )}
      {r?.notes.map((n, i) => <p key={i} className="small dim" data-testid="start-note">{n}</p>)}
      {r?.choices.map((ch) => <p key={ch.key} className="small" data-testid="start-choice"><b>{ch.key} = {JSON.stringify(ch.value)}</b>: {ch.why}</p>)}
    </Panel>
  );
}
