/**
 * What a plan draft found, in the observer's words: the catalog's rows, the columns taken for each field (by name or by
 * value, and the unit guessed), the tracer candidates and the alignment stars in range near the galaxy, and the
 * profile's usable field. One wording for the command line (`haloweave draft`) and the editor's start panel.
 */
import type { CatalogReadResult } from '../catalog/types';
import type { ColumnGuess, GuessedField } from '../catalog/guessColumns';
import type { InstrumentProfile } from '../profile/schema';
import type { LineSettings } from '../profile/lineWindows';
import type { DraftFacts } from './draftPlan';

export interface DraftSummary {
  /** Rows read, used and with problems (the first reason named). */
  catalog: string;
  /** One line per contract field: `ra <- alpha (by its name, hours)`. */
  columns: string[];
  /** Columns not taken for a field, carried through; null when every column is used. */
  carried: string | null;
  tracers: string;
  alignment: string;
  /** Where on the field science slits can go for the galaxy's lines. */
  profile: string;
}

/** The unit of a guessed RA/Dec column in words (empty for the other fields). */
function unitWords(f: GuessedField): string {
  return f.unit === 'deg' ? ', degrees' : f.unit === 'hour' ? ', hours' : f.unit === 'text' ? ', sexagesimal text' : f.unit === 'file' ? ', unit from the file' : '';
}

/** Summarise a draft: the catalog as read with the guessed columns, the draft's facts and the profile's usable x fraction. */
export function draftSummary(inp: {
  catalogName: string;
  catalog: Pick<CatalogReadResult, 'format' | 'rowsRead' | 'targets' | 'rejects'>;
  guess: ColumnGuess;
  facts: DraftFacts;
  profile: InstrumentProfile;
  lines: LineSettings;
  usableXFraction: number;
}): DraftSummary {
  const { catalog: c, guess, facts: f, profile: p } = inp;
  const rejected = new Set(c.rejects.map((r) => r.line)).size;
  const first = c.rejects[0];
  const unused = guess.profiles.map((col) => col.name).filter((n) => !Object.values(guess.fields).some((g) => g?.column === n));
  const [bright, faint] = p.alignment.magRange;
  return {
    catalog: `catalog ${inp.catalogName} (${c.format}): ${c.rowsRead} rows, ${c.targets.length} usable, ${rejected} rows with problems${first ? ` (first: line ${first.line}, ${first.column}: ${first.reason})` : ''}`,
    columns: Object.entries(guess.fields).map(([field, g]) => `${field.padEnd(8)} <- ${g!.column} (by ${g!.how === 'name' ? 'its name' : 'its values'}${unitWords(g!)})`),
    carried: unused.length ? `carried through: ${unused.join(', ')}` : null,
    tracers: f.tracers === 0
      ? 'tracer candidates: none (every usable row is an alignment star): the plan can place boxes but no tracer slits'
      : `tracer candidates: ${f.tracers}, R/Re median ${f.tracerRadiusRe[0].toFixed(1)}, 90 % within ${f.tracerRadiusRe[1].toFixed(1)}, farthest ${f.tracerRadiusRe[2].toFixed(1)}; magnitudes ${f.tracerMag[0].toFixed(2)} to ${f.tracerMag[2].toFixed(2)} (median ${f.tracerMag[1].toFixed(2)})`,
    alignment: `alignment stars: ${f.alignmentRows} in the catalog, ${f.alignmentInRangeNear} of mag ${bright}-${faint} within ${(f.nearRadiusArcsec / 60).toFixed(1)} arcmin of the galaxy: about ${f.alignmentPerMaskExpected.toFixed(1)} a field (a mask needs ${p.alignment.minCount})`,
    profile: `profile ${p.id}: science slits possible on ${(100 * inp.usableXFraction).toFixed(0)} % of the field's x range at ${inp.lines.vsysKms} +- ${inp.lines.velocityHalfRangeKms} km/s`,
  };
}
