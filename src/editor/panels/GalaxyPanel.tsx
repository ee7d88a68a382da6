/** Galaxy model and science goals of the plan, editable (each change is one undoable command). */
import type { EditorController } from '../controller';
import { setGalaxyFieldCommand, setGoalCommand } from '../store/commands';
import { formatDecDms, formatRaHms } from '../../core/sky/sexagesimal';
import type { GalaxyModel, PlanFile } from '../../core/plan/schema';
import { memo } from 'react';
import { NumberField, Panel } from './Panel';

/** Memoised on the plan it shows: a drag preview (not an edit) does not re-render it. */
export const GalaxyPanel = memo(function GalaxyPanel({ c, galaxy, plan }: { c: EditorController; galaxy: GalaxyModel; plan: PlanFile }) {
  const g = plan.galaxy;
  const goals = plan.goals;
  return (
    <Panel title="Galaxy & goals" testId="panel-galaxy">
      <div className="kv"><span>name</span><b data-testid="galaxy-id">{g.id}</b></div>
      <div className="kv"><span>centre</span><span className="mono">{formatRaHms(galaxy.raDeg, 1)} {formatDecDms(galaxy.decDeg, 0)}</span></div>
      <div className="grid2">
        <NumberField label="Re" unit="″" value={g.reArcsec} min={0.01} onCommit={(v) => c.run((d) => setGalaxyFieldCommand(d, 'reArcsec', v))} testId="galaxy-re" />
        <NumberField label="b/a" value={g.axisRatio} min={0.01} max={1} onCommit={(v) => c.run((d) => setGalaxyFieldCommand(d, 'axisRatio', v))} testId="galaxy-axis-ratio" />
        <NumberField label="PA" unit="°" value={g.paDeg} min={-360} max={360} onCommit={(v) => c.run((d) => setGalaxyFieldCommand(d, 'paDeg', v))} testId="galaxy-pa" />
        <NumberField label="Sérsic n" value={g.sersicN} min={0.2} max={20} onCommit={(v) => c.run((d) => setGalaxyFieldCommand(d, 'sersicN', v))} testId="galaxy-sersic-n" />
        <NumberField label="μe" unit="mag/″²" value={g.muE} min={10} max={35} onCommit={(v) => c.run((d) => setGalaxyFieldCommand(d, 'muE', v))} testId="galaxy-mu-e" />
        <NumberField label="vsys" unit="km/s" value={g.vsysKms} min={-1000} max={30000} onCommit={(v) => c.run((d) => setGalaxyFieldCommand(d, 'vsysKms', v))} testId="galaxy-vsys" />
        <NumberField label="dist." unit="Mpc" value={g.distanceMpc} min={0.001} onCommit={(v) => c.run((d) => setGalaxyFieldCommand(d, 'distanceMpc', v))} testId="galaxy-distance" />
      </div>
      {/* The goal counts the masks the plan lists at least (a plan file with more masks than goals.masks is refused). */}
      <h4>Goals</h4>
      <div className="grid1">
        <NumberField label="masks" value={goals.masks} min={Math.max(1, plan.masks?.length ?? 0)} max={50} onCommit={(v) => c.run((d) => setGoalCommand(d, 'masks', Math.round(v)))} testId="goal-masks" />
        <NumberField label="tracers out to" unit="Re" value={goals.tracerReachRe} min={0.1} onCommit={(v) => c.run((d) => setGoalCommand(d, 'tracerReachRe', v))} testId="goal-tracer-reach" />
        <NumberField label="starlight out to" unit="Re" value={goals.starlightReachRe} min={0} onCommit={(v) => c.run((d) => setGoalCommand(d, 'starlightReachRe', v))} testId="goal-starlight-reach" />
      </div>
      <div className="kv"><span>lines</span><span className="mono">{goals.linesA.map((l) => l.toFixed(1)).join(', ')} Å</span></div>
    </Panel>
  );
});
