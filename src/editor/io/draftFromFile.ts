/**
 * A first plan from a catalog file and a profile in the editor, the same way `haloweave draft` makes one: the catalog's
 * columns and RA/Dec units found by name or by value near the galaxy, the rows read with that mapping, the goals chosen
 * and explained (core/plan/draftPlan). Pure: the panel gives the file's content, the profile and the galaxy fields.
 */
import type { InstrumentProfile } from '../../core/profile/schema';
import type { Problem } from '../../core/result';
import { InputError } from '../../core/result';
import type { LoadedFile } from '../session';
import { readCatalog, readRawTable } from '../../core/catalog/read';
import { guessColumns, type ColumnGuess } from '../../core/catalog/guessColumns';
import { draftPlan, type DraftChoice, type DraftGalaxy } from '../../core/plan/draftPlan';
import { parsePlan } from '../../core/plan/validate';
import { inspectProfile } from '../../core/profile/inspect';
import { LINE_WINDOW_DEFAULTS } from '../../core/profile/lineWindows';

export interface DraftFromFile {
  /** The plan file text (null when it could not be made) and its name. */
  planText: string | null;
  planName: string;
  choices: DraftChoice[];
  /** What the catalog inspection found (columns by name or value, units) and the draft's warnings. */
  notes: string[];
  problems: Problem[];
  guess: ColumnGuess | null;
}

/** Draft a plan from a catalog file for the galaxy with the given profile and rest lines (Angstrom). */
export function draftFromFile(file: LoadedFile, profile: InstrumentProfile, galaxy: DraftGalaxy, linesA: number[]): DraftFromFile {
  const planName = `${file.name.replace(/\.[^.]+$/, '')}.plan.json`;
  const fail = (problems: Problem[], guess: ColumnGuess | null = null): DraftFromFile => ({ planText: null, planName, choices: [], notes: guess?.notes ?? [], problems, guess });
  const lines = { vsysKms: galaxy.vsysKms, linesA, ...LINE_WINDOW_DEFAULTS };
  const insp = inspectProfile(profile, lines, profile.id);
  if (insp.problems.length) return fail(insp.problems);
  let guess: ColumnGuess;
  let catalog;
  try {
    guess = guessColumns(readRawTable(file.content, file.name), galaxy);
    if (guess.problems.length) return fail(guess.problems.map((what) => ({ where: file.name, what })), guess);
    catalog = readCatalog(file.content, file.name, guess.mapping);
  } catch (e) {
    if (e instanceof InputError) return fail(e.problems);
    throw e;
  }
  if (catalog.targets.length === 0) return fail([{ where: file.name, what: `none of the ${catalog.rowsRead} rows can be used`, fix: 'see the row report after opening the catalog' }], guess);
  const draft = draftPlan({ galaxy, profile, instrument: profile.id, catalogPath: file.name, catalogColumns: guess.mapping, targets: catalog.targets, linesA });
  parsePlan(draft.plan, planName);
  const columns = Object.entries(guess.fields).map(([f, g]) => `${f} ← ${g.column} (by its ${g.how === 'name' ? 'name' : 'values'}${g.unit === 'hour' ? ', hours' : g.unit === 'text' ? ', sexagesimal' : ''})`);
  const f = draft.facts;
  return {
    planText: JSON.stringify(draft.plan, null, 2) + '\n',
    planName,
    choices: draft.choices,
    notes: [
      `${catalog.rowsRead} rows, ${catalog.targets.length} usable; ${f.tracers} tracer candidates; ${f.alignmentInRangeNear} alignment stars of mag ${profile.alignment.magRange[0]}–${profile.alignment.magRange[1]} near the galaxy (about ${f.alignmentPerMaskExpected.toFixed(1)} a field, ${profile.alignment.minCount} needed)`,
      `columns: ${columns.join(', ')}`,
      ...guess.notes,
      ...insp.warnings,
      ...draft.warnings,
    ],
    problems: [],
    guess,
  };
}
