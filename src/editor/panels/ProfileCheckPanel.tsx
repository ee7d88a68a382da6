/**
 * Check and edit the instrument profile's numbers with the same checks as `haloweave profile`: every edit redraws the
 * profile (footprint, where the plan's lines land on the detector, the gaps projected onto the mask, a slit and a box
 * to scale) and lists what makes it impossible; "Use these numbers" puts the edited profile in the document (undoable).
 */
import { memo, useMemo, useState } from 'react';
import type { Problem } from '../../core/result';
import type { EditorController } from '../controller';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { PlanFile } from '../../core/plan/schema';
import { profileSvg } from '../../core/profile/profileSvg';
import { formatProblem } from '../../core/result';
import { BUNDLED_PROFILES } from '../io/profiles';
import { setProfileCommand } from '../store/commands';
import { Panel, NumberField } from './Panel';
import {
  asEditedProfile, checkEditedProfile, EDITABLE_PROFILE_NUMBERS, footprintText, gapsText, numberAt, parseFootprintText, parseGapsText,
  planLineSettings, withFootprint, withGaps, withNumber,
} from './profileEdit';

/**
 * A list typed as text (footprint corners, detector gaps): commits on leaving the field (or Enter in a one-line field,
 * Ctrl+Enter in the corners) when every line reads; otherwise the text stays, with what is wrong on which line.
 */
function ListField<T>({ label, shown, parse, onCommit, testId, rows }: {
  label: string; shown: string; parse(t: string): { value: T | null; problems: Problem[] }; onCommit(v: T): void; testId: string; rows?: number;
}) {
  const [text, setText] = useState<string | null>(null);
  const r = text === null ? null : parse(text);
  const commit = () => {
    if (text === null || !r || r.value === null) return;
    setText(null);
    if (text.trim() !== shown.trim()) onCommit(r.value);
  };
  const common = {
    'data-testid': testId, 'aria-invalid': !!r?.problems.length, value: text ?? shown, onBlur: commit,
    onChange: (e: { target: { value: string } }) => setText(e.target.value),
  };
  return (
    <label className={`field wide ${r?.problems.length ? 'bad' : ''}`}>
      <span className="field-label">{label}</span>
      {rows
        ? <textarea {...common} rows={rows} onKeyDown={(e) => { if (e.key === 'Enter' && (e.ctrlKey || e.metaKey)) commit(); if (e.key === 'Escape') setText(null); }} />
        : <input type="text" {...common} onKeyDown={(e) => { if (e.key === 'Enter') commit(); if (e.key === 'Escape') setText(null); }} />}
      {r?.problems.map((p, i) => <span key={i} className="field-error" role="alert" data-testid={`${testId}-error`}>{formatProblem(p)}</span>)}
    </label>
  );
}

export const ProfileCheckPanel = memo(function ProfileCheckPanel({ c, profile, plan }: { c: EditorController; profile: InstrumentProfile; plan: PlanFile }) {
  const [edited, setEdited] = useState<{ base: InstrumentProfile; now: InstrumentProfile } | null>(null);
  // Edits belong to the profile they were made on: another profile in the document starts afresh.
  const current = edited && edited.base === profile ? edited.now : profile;
  const lines = planLineSettings(plan as never);
  const check = useMemo(() => checkEditedProfile(current, lines), [current, lines.vsysKms, lines.linesA.join(','), lines.velocityHalfRangeKms, lines.lineHalfWindowA]);
  const svg = check.profile && check.inspection ? profileSvg(check.profile, lines, check.inspection) : null;
  const changed = current !== profile;
  return (
    <Panel title="Profile check" testId="panel-profile-check" startOpen={false}>
      <div className="form-rows">
      {EDITABLE_PROFILE_NUMBERS.map((n) => (
        <NumberField
          key={n.path.join('.')}
          label={n.label}
          unit={n.unit}
          value={numberAt(current, n.path)}
          testId={`profile-edit-${n.path[1]}`}
          onCommit={(v) => setEdited({ base: profile, now: withNumber(current, n.path, v) })}
        />
      ))}
      <ListField label="footprint corners (x y in ″, one a line)" rows={Math.min(8, current.footprint.length)} testId="profile-edit-footprint"
        shown={footprintText(current.footprint)} parse={(t) => { const p = parseFootprintText(t); return { value: p.corners, problems: p.problems }; }}
        onCommit={(v) => setEdited({ base: profile, now: withFootprint(current, v) })} />
      <ListField label="detector gaps (px, first-last)" testId="profile-edit-gaps"
        shown={gapsText(current.detector.gapsPixels)} parse={(t) => { const p = parseGapsText(t); return { value: p.gaps, problems: p.problems }; }}
        onCommit={(v) => setEdited({ base: profile, now: withGaps(current, v) })} />
      </div>
      {check.inspection && (
        <p className="small" data-testid="profile-check-usable">
          lines on the detector over {(100 * check.inspection.usableXFraction).toFixed(0)} % of the field at {lines.vsysKms} km/s
        </p>
      )}
      {check.problems.map((p, i) => <p key={i} className="small" style={{ color: 'var(--bad)' }} data-testid="profile-check-problem">{formatProblem(p)}</p>)}
      {check.warnings.map((w, i) => <p key={i} className="small dim">{w}</p>)}
      {svg && <img alt="the profile drawn in the mask frame" style={{ width: '100%' }} src={`data:image/svg+xml;charset=utf-8,${encodeURIComponent(svg)}`} />}
      <button
        data-testid="profile-check-apply"
        disabled={!changed || check.problems.length > 0 || !check.profile}
        onClick={() => {
          if (!check.profile) return;
          const next = asEditedProfile(check.profile, profile, [...BUNDLED_PROFILES.keys()]);
          c.run((d) => setProfileCommand(d, next));
          setEdited(null);
        }}
      >
        Use these numbers
      </button>
      {changed && <button onClick={() => setEdited(null)}>Back to the profile's numbers</button>}
    </Panel>
  );
});
