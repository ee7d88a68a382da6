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
import { draftSummary, type DraftSummary } from '../../core/plan/draftSummary';
import { parsePlan } from '../../core/plan/validate';
import { inspectProfile } from '../../core/profile/inspect';
import { LINE_WINDOW_DEFAULTS } from '../../core/profile/lineWindows';

export interface DraftFromFile {
  /** The plan file text (null when it could not be made) and its name. */
  planText: string | null;
  planName: string;
  choices: DraftChoice[];
  /** What the catalog inspection found, worded as `haloweave draft` prints it; null when the catalog could not be read. */
  summary: DraftSummary | null;
  /** The column guess's findings and the draft's warnings (units guessed, too few alignment stars...). */
  notes: string[];
  problems: Problem[];
  guess: ColumnGuess | null;
}

/**
 * Draft a plan from a catalog file for the galaxy with the given profile and rest lines (Angstrom). `instrument` is the
 * plan's `instrument` value (default the profile's id; the profile file's name for a profile of the user's own).
 */
export function draftFromFile(file: LoadedFile, profile: InstrumentProfile, galaxy: DraftGalaxy, linesA: number[], opts: { instrument?: string } = {}): DraftFromFile {
  const planName = `${file.name.replace(/\.[^.]+$/, '')}.plan.json`;
  const fail = (problems: Problem[], guess: ColumnGuess | null = null): DraftFromFile => ({ planText: null, planName, choices: [], summary: null, notes: guess?.notes ?? [], problems, guess });
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
  if (catalog.targets.length === 0) {
    const first = catalog.rejects.slice(0, 3).map((r) => `line ${r.line}, ${r.column}: ${r.reason}`).join('; ');
    return fail([{ where: file.name, what: `none of the ${catalog.rowsRead} rows can be used${first ? ` (first: ${first})` : ''}`, fix: 'check the columns found below and the file' }], guess);
  }
  const draft = draftPlan({ galaxy, profile, instrument: opts.instrument ?? profile.id, catalogPath: file.name, catalogColumns: guess.mapping, targets: catalog.targets, linesA });
  parsePlan(draft.plan, planName);
  return {
    planText: JSON.stringify(draft.plan, null, 2) + '\n',
    planName,
    choices: draft.choices,
    summary: draftSummary({ catalogName: file.name, catalog, guess, facts: draft.facts, profile, lines, usableXFraction: insp.usableXFraction }),
    notes: [...guess.notes, ...insp.warnings, ...draft.warnings],
    problems: [],
    guess,
  };
}
