/**
 * The start panel's galaxy form: the galaxy's name, centre (RA/Dec, sexagesimal or degrees), circularised effective
 * radius (arcsec), axis ratio b/a, major-axis PA (degrees East of North), systemic velocity (km/s) and, optionally,
 * distance (Mpc) and surface brightness at Re (mag/arcsec^2). The same ranges as `haloweave draft`'s options; each
 * field that cannot be used is one Problem naming the field as the form shows it. Pure: no React.
 */
import type { Problem } from '../../core/result';
import type { DraftGalaxy } from '../../core/plan/draftPlan';
import { parseDecDeg, parseRaDeg } from '../../core/sky/sexagesimal';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { LoadedFile } from '../session';
import type { DraftFromFile } from './draftFromFile';

/** The form's fields: key, label shown, placeholder, and what to give when the field cannot be used. */
export const START_FIELDS = [
  { key: 'id', label: 'name', placeholder: 'my galaxy', fix: 'any name; it becomes the plan\'s galaxy id' },
  { key: 'ra', label: 'RA', placeholder: '10:47:15.0 or degrees', fix: "the galaxy centre's RA, as 10:47:15.0 (hours) or 161.81 (degrees)" },
  { key: 'dec', label: 'Dec', placeholder: '-21:24:18 or degrees', fix: "the galaxy centre's Dec, as -21:24:18 or -21.405 (degrees)" },
  { key: 're', label: 'Re (″, circularised)', placeholder: '40', fix: 'the effective radius in arcsec, greater than 0' },
  { key: 'q', label: 'axis ratio b/a', placeholder: '0.8', fix: 'the minor-to-major axis ratio, in (0, 1]' },
  { key: 'pa', label: 'major-axis PA (°)', placeholder: '35', fix: "the major axis's position angle, degrees East of North" },
  { key: 'vsys', label: 'velocity (km/s)', placeholder: '1180', fix: 'the systemic velocity in km/s, -1000 to 30000' },
  { key: 'distance', label: 'distance (Mpc, optional)', placeholder: 'from the velocity', fix: 'a distance in Mpc greater than 0, or leave it empty' },
  { key: 'muE', label: 'μe (mag/″², optional)', placeholder: 'starlight off', fix: 'the surface brightness at Re, 10 to 35 mag/arcsec², or leave it empty' },
] as const;

export type StartKey = (typeof START_FIELDS)[number]['key'];
export type StartValues = Partial<Record<StartKey, string>>;

/** Where a form problem is: the panel's name and the field's label. */
export const startWhere = (key: StartKey): string => `start a plan: ${START_FIELDS.find((f) => f.key === key)!.label}`;

/** The galaxy the form describes, or one problem per field that is missing or cannot be used. */
export function galaxyFromForm(v: StartValues): { galaxy: DraftGalaxy | null; problems: Problem[] } {
  const problems: Problem[] = [];
  const field = (k: StartKey) => START_FIELDS.find((f) => f.key === k)!;
  const say = (k: StartKey, what: string) => problems.push({ where: startWhere(k), what, fix: field(k).fix });
  const text = (k: StartKey) => (v[k] ?? '').trim();
  const angle = (k: 'ra' | 'dec') => {
    if (text(k) === '') { say(k, 'is empty'); return NaN; }
    const r = (k === 'ra' ? parseRaDeg : parseDecDeg)(text(k));
    if (!r.ok) { say(k, r.error); return NaN; }
    return r.value;
  };
  const num = (k: StartKey, ok: (x: number) => boolean, optional = false) => {
    const t = text(k);
    if (t === '') { if (!optional) say(k, 'is empty'); return undefined; }
    const x = Number(t);
    if (!Number.isFinite(x)) say(k, `"${t}" is not a number`);
    else if (!ok(x)) say(k, `${t} is out of range`);
    return x;
  };
  const raDeg = angle('ra'), decDeg = angle('dec');
  const reArcsec = num('re', (x) => x > 0), axisRatio = num('q', (x) => x > 0 && x <= 1), paDeg = num('pa', (x) => Math.abs(x) <= 360);
  const vsysKms = num('vsys', (x) => x >= -1000 && x <= 30000);
  const distanceMpc = num('distance', (x) => x > 0, true), muE = num('muE', (x) => x >= 10 && x <= 35, true);
  if (problems.length) return { galaxy: null, problems };
  return {
    galaxy: { id: text('id') || 'my galaxy', raDeg, decDeg, reArcsec: reArcsec!, axisRatio: axisRatio!, paDeg: paDeg!, vsysKms: vsysKms!, distanceMpc, muE },
    problems,
  };
}

/** The fields a list of problems is about (to mark them in the form). */
export function badStartFields(problems: readonly Problem[]): Set<StartKey> {
  return new Set(START_FIELDS.filter((f) => problems.some((p) => p.where === startWhere(f.key))).map((f) => f.key));
}

/** What the start panel holds between edits: typed fields and given files are kept until replaced, whatever fails. */
export interface StartState {
  values: StartValues;
  /** The catalog given in the panel (dropped or picked). */
  catalog: LoadedFile | null;
  /** A profile file given in the panel; without one the document's profile is used. */
  profile: { fileName: string; profile: InstrumentProfile } | null;
  /** Problems with the files given (a profile that does not validate, a plan or image given here...). */
  fileProblems: Problem[];
  /** Problems with the typed fields at the last start. */
  formProblems: Problem[];
  /** Findings about the catalog held (read as Latin-1), kept while it is held. */
  fileNotes: string[];
  /** The last draft: its summary, choices and problems. */
  result: DraftFromFile | null;
}

/** The start panel before anything is typed or given. */
export function emptyStart(): StartState {
  return { values: {}, catalog: null, profile: null, fileProblems: [], formProblems: [], fileNotes: [], result: null };
}

/** The note for a text file that was not valid UTF-8 and was read as Latin-1 (the shared decoding rule's fallback). */
export function latin1Note(fileName: string): string {
  return `${fileName} is not valid UTF-8: it was read as Latin-1 (Windows-1252); check accented names in it, or save it as UTF-8`;
}
