/** The instrument profile in use: pick a bundled one or open a profile file; key numbers shown. */
import type { EditorController } from '../controller';
import { BUNDLED_PROFILES } from '../io/profiles';
import { setProfileCommand } from '../store/commands';
import { polygonBounds } from '../../core/geometry/polygon';
import { Panel } from './Panel';
import { memo } from 'react';
import type { InstrumentProfile } from '../../core/profile/schema';

/** Memoised on the profile it shows: a drag preview (not an edit) does not re-render it. */
export const ProfilePanel = memo(function ProfilePanel({ c, profile: p }: { c: EditorController; profile: InstrumentProfile }) {
  const b = polygonBounds(p.footprint);
  const ids = [...BUNDLED_PROFILES.keys()];
  if (!ids.includes(p.id)) ids.push(p.id);
  return (
    <Panel title="Instrument" testId="panel-profile">
      <select
        data-testid="profile-select"
        value={p.id}
        onChange={(e) => {
          const next = BUNDLED_PROFILES.get(e.target.value);
          if (next) c.run((d) => setProfileCommand(d, next));
        }}
      >
        {ids.map((id) => <option key={id} value={id}>{id}</option>)}
      </select>
      <p className="dim small">{p.label}</p>
      <div className="kv"><span>field</span><span>{((b.maxX - b.minX) / 60).toFixed(1)}′ × {((b.maxY - b.minY) / 60).toFixed(1)}′ ({p.footprint.length} corners)</span></div>
      <div className="kv"><span>slits</span><span>≥ {p.slits.minLengthArcsec}″ long, {p.slits.widthArcsec}″ wide, gap {p.slits.gapArcsec}″</span></div>
      <div className="kv"><span>alignment</span><span>{p.alignment.minCount}+ boxes of {p.alignment.boxSizeArcsec}″, mag {p.alignment.magRange[0]}–{p.alignment.magRange[1]}</span></div>
      <div className="kv"><span>detector</span><span>{p.detector.pixels} px, {p.detector.dispersionAPerPixel} Å/px at {p.detector.centralWavelengthA} Å, {p.detector.gapsPixels.length} gap(s)</span></div>
      <div className="kv"><span>telescope</span><span>{p.telescope.apertureM} m, site {p.site.latDeg.toFixed(1)}°, {p.site.elevationM} m</span></div>
      <p className="dim small">Illustrative numbers: take real values from your observatory before cutting masks.</p>
    </Panel>
  );
});
