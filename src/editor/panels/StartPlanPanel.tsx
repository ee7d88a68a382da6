/**
 * Start a plan from your own catalog with the profile in use, as `haloweave draft` does: give the galaxy's centre, size,
 * shape and velocity, pick the catalog file; its columns and units are found, the goals chosen, and each choice
 * explained here. The drafted plan opens in the editor (asking first when there is unsaved work).
 */
import { useState } from 'react';
import type { EditorController } from '../controller';
import { loadedFileFrom } from '../controller';
import type { InstrumentProfile } from '../../core/profile/schema';
import { formatProblem } from '../../core/result';
import { parseDecDeg, parseRaDeg } from '../../core/sky/sexagesimal';
import { draftFromFile, type DraftFromFile } from '../io/draftFromFile';
import { Panel } from './Panel';

const CALCIUM_TRIPLET_A = [8498.0, 8542.1, 8662.1];

const FIELDS = [
  { key: 'id', label: 'name', placeholder: 'my galaxy' },
  { key: 'ra', label: 'RA', placeholder: '10:47:15.0 or degrees' },
  { key: 'dec', label: 'Dec', placeholder: '-21:24:18 or degrees' },
  { key: 're', label: 'Re (″, circularised)', placeholder: '40' },
  { key: 'q', label: 'axis ratio b/a', placeholder: '0.8' },
  { key: 'pa', label: 'major-axis PA (°)', placeholder: '35' },
  { key: 'vsys', label: 'velocity (km/s)', placeholder: '1180' },
  { key: 'distance', label: 'distance (Mpc, optional)', placeholder: 'from the velocity' },
  { key: 'muE', label: 'μe (mag/″², optional)', placeholder: 'starlight off' },
] as const;
type Key = (typeof FIELDS)[number]['key'];

/** The galaxy from the form, or the fields that are not valid. */
function galaxyFrom(v: Partial<Record<Key, string>>): { galaxy?: Parameters<typeof draftFromFile>[2]; bad: string[] } {
  const bad: string[] = [];
  const ra = parseRaDeg(v.ra ?? ''), dec = parseDecDeg(v.dec ?? '');
  const num = (k: Key, ok: (x: number) => boolean, optional = false) => {
    const t = (v[k] ?? '').trim();
    if (t === '' && optional) return undefined;
    const x = Number(t);
    if (t === '' || !Number.isFinite(x) || !ok(x)) bad.push(FIELDS.find((f) => f.key === k)!.label);
    return x;
  };
  if (!ra.ok) bad.push('RA');
  if (!dec.ok) bad.push('Dec');
  const reArcsec = num('re', (x) => x > 0), axisRatio = num('q', (x) => x > 0 && x <= 1), paDeg = num('pa', (x) => Math.abs(x) <= 360);
  const vsysKms = num('vsys', (x) => x >= -1000 && x <= 30000), distanceMpc = num('distance', (x) => x > 0, true), muE = num('muE', (x) => x >= 10 && x <= 35, true);
  if (bad.length || !ra.ok || !dec.ok) return { bad };
  return { galaxy: { id: (v.id ?? '').trim() || 'my galaxy', raDeg: ra.value, decDeg: dec.value, reArcsec: reArcsec!, axisRatio: axisRatio!, paDeg: paDeg!, vsysKms: vsysKms!, distanceMpc, muE }, bad };
}

export function StartPlanPanel({ c, profile }: { c: EditorController; profile: InstrumentProfile }) {
  const [values, setValues] = useState<Partial<Record<Key, string>>>({});
  const [file, setFile] = useState<File | null>(null);
  const [result, setResult] = useState<DraftFromFile | null>(null);
  const [bad, setBad] = useState<string[]>([]);
  const start = async () => {
    const g = galaxyFrom(values);
    setBad(g.bad);
    if (!g.galaxy || !file) return;
    const { file: loaded } = await loadedFileFrom(file);
    const r = draftFromFile(loaded, profile, g.galaxy, CALCIUM_TRIPLET_A);
    setResult(r);
    if (r.planText) c.openPlanText({ name: r.planName, content: r.planText }, loaded, { ask: true, profile });
  };
  return (
    <Panel title="Start a plan" testId="panel-start-plan" startOpen={false}>
      <p className="dim small">Your catalog, the instrument above and the galaxy: columns and units are found, goals chosen and explained.</p>
      {FIELDS.map((f) => (
        <label key={f.key} className="field">
          <span className="field-label">{f.label}</span>
          <input type="text" data-testid={`start-${f.key}`} placeholder={f.placeholder} value={values[f.key] ?? ''} onChange={(e) => setValues({ ...values, [f.key]: e.target.value })} />
        </label>
      ))}
      <input type="file" data-testid="start-catalog" onChange={(e) => setFile(e.target.files?.[0] ?? null)} />
      <button data-testid="start-plan" disabled={!file} onClick={() => void start()}>Start the plan</button>
      {bad.length > 0 && <p className="small" style={{ color: 'var(--bad)' }} data-testid="start-bad">check: {bad.join(', ')}</p>}
      {result?.problems.map((p, i) => <p key={i} className="small" style={{ color: 'var(--bad)' }} data-testid="start-problem">{formatProblem(p)}</p>)}
      {result?.notes.map((n, i) => <p key={i} className="small dim" data-testid="start-note">{n}</p>)}
      {result?.choices.map((ch) => <p key={ch.key} className="small" data-testid="start-choice"><b>{ch.key} = {JSON.stringify(ch.value)}</b>: {ch.why}</p>)}
    </Panel>
  );
}
