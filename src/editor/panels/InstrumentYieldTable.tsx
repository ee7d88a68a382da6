/** Yield per spectrograph of a plan with several (plan key instruments): masks, tracer and starlight slits, tracer weight. */
import type { EditorController } from '../controller';
import { instrumentYields } from '../../core/pipeline/instrumentYield';
import type { InstrumentsObservingReport } from '../../core/pipeline/instrumentsReport';

export function InstrumentYieldTable({ c }: { c: EditorController }) {
  const sol = c.session.solution;
  const doc = c.store!.doc;
  if (!sol || !doc.plan.instruments?.length) return null;
  const yields = instrumentYields(sol.result.masks, sol.result.extra.observingReport as InstrumentsObservingReport | undefined, doc.profile.id);
  return (
    <table className="mini yield" data-testid="instrument-yield">
      <thead><tr><th>instrument</th><th>masks</th><th>tracers</th><th>weight</th><th>starlight</th></tr></thead>
      <tbody>
        {yields.map((y) => (
          <tr key={y.instrument} data-testid={`instrument-yield-${y.instrument}`} title={y.site ? `site latitude ${y.site.latDeg.toFixed(2)}°, longitude ${y.site.lonDeg.toFixed(2)}°` : ''}>
            <td>{y.instrument}</td>
            <td>{y.maskIds.join(', ')}</td>
            <td className="num">{y.tracerSlits}</td>
            <td className="num">{y.tracerWeight.toFixed(1)}</td>
            <td className="num">{y.starlightSlits}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
