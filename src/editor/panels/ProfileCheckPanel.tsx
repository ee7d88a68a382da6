/**
 * Check and edit the instrument profile's numbers with the same checks as `haloweave profile`: every edit redraws the
 * profile (footprint, where the plan's lines land on the detector, the gaps projected onto the mask, a slit and a box
 * to scale) and lists what makes it impossible; "Use these numbers" puts the edited profile in the document (undoable).
 */
import { memo, useMemo, useState } from 'react';
import type { EditorController } from '../controller';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { PlanFile } from '../../core/plan/schema';
import { profileSvg } from '../../core/profile/profileSvg';
import { formatProblem } from '../../core/result';
import { BUNDLED_PROFILES } from '../io/profiles';
import { setProfileCommand } from '../store/commands';
import { Panel, NumberField } from './Panel';
import { asEditedProfile, checkEditedProfile, EDITABLE_PROFILE_NUMBERS, numberAt, planLineSettings, withNumber } from './profileEdit';

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
