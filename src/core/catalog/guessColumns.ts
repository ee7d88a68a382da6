/**
 * Guess which columns of an unfamiliar catalog hold the contract fields (id, ra, dec, mag, color, role) and in which
 * unit RA and Dec are written, from the column names (the reader's aliases) and, failing that, from the values: the
 * galaxy's centre tells degrees from hours and finds position columns under any name. RA/Dec in ICRS degrees.
 * Used by the plan-drafting command, which writes the result as the plan's `catalogColumns`.
 */
import { angleUnitOf, COLUMN_ALIASES, normaliseColumnName, type ContractField } from './columns';
import type { Cell, ColumnMapping, RawTable } from './types';
import { parseDecDeg, parseRaDeg } from '../sky/sexagesimal';

/** What is known of one column from its values. */
export interface ColumnProfile {
  name: string;
  unit?: string;
  /** Cells read as numbers, and the median of them (NaN when none). */
  numeric: number;
  median: number;
  min: number;
  max: number;
  /** Non-empty cells that are not numbers, and how many of them read as sexagesimal angles. */
  text: number;
  sexagesimal: number;
  /** Distinct non-empty values (counted up to a cap) and the lower-case distinct texts (up to 20). */
  distinct: number;
  texts: string[];
  filled: number;
}

/** A guessed field: the column, how it was recognised, and the unit for RA/Dec. */
export interface GuessedField {
  column: string;
  how: 'name' | 'values';
  /** RA/Dec only: unit of the numbers, or 'text' for sexagesimal text. */
  unit?: 'deg' | 'hour' | 'text' | 'file';
}

export interface ColumnGuess {
  fields: Partial<Record<ContractField, GuessedField>>;
  /** The plan's catalogColumns to write (empty when the contract names and degrees are used throughout). */
  mapping: ColumnMapping;
  /** Findings worth telling the user: unit guesses, columns not near the galaxy... */
  notes: string[];
  /** Blocking findings: a required field not found, positions in a unit the plan cannot state. */
  problems: string[];
  profiles: ColumnProfile[];
}

const DISTINCT_CAP = 100_000;

/** Number of a cell, or NaN. */
function numberOf(c: Cell): number {
  if (typeof c === 'number') return c;
  if (typeof c === 'string' && c.trim() !== '') return Number(c.trim());
  return NaN;
}

/** Profile every column of a table (one pass over the rows). */
export function profileColumns(table: RawTable): ColumnProfile[] {
  const n = table.columns.length;
  const nums: number[][] = table.columns.map(() => []);
  const text = new Array(n).fill(0), sexa = new Array(n).fill(0), filled = new Array(n).fill(0);
  const seen = table.columns.map(() => new Set<string>());
  table.forEachRow((cells) => {
    for (let k = 0; k < n; k++) {
      const c = cells[k];
      if (c === null || c === undefined || (typeof c === 'string' && c.trim() === '')) continue;
      filled[k]++;
      const s = String(c).trim();
      if (seen[k].size < DISTINCT_CAP) seen[k].add(s.toLowerCase());
      const v = numberOf(c);
      if (Number.isFinite(v)) nums[k].push(v);
      else {
        text[k]++;
        if (/^[+-]?\d{1,3}\s*[:hd°\s]\s*\d{1,2}\s*[:m'\s]\s*\d{1,2}(\.\d*)?\s*s?"?$/i.test(s)) sexa[k]++;
      }
    }
  });
  return table.columns.map((c, k) => {
    const v = nums[k].sort((a, b) => a - b);
    return {
      name: c.name,
      unit: c.unit,
      numeric: v.length,
      median: v.length ? v[Math.floor(v.length / 2)] : NaN,
      min: v.length ? v[0] : NaN,
      max: v.length ? v[v.length - 1] : NaN,
      text: text[k],
      sexagesimal: sexa[k],
      distinct: seen[k].size,
      texts: [...seen[k]].filter((t) => !Number.isFinite(Number(t))).slice(0, 20),
      filled: filled[k],
    };
  });
}

/** The first column whose name matches an alias of the field, not already taken. */
function byName(profiles: readonly ColumnProfile[], field: ContractField, taken: Set<string>): ColumnProfile | undefined {
  for (const alias of COLUMN_ALIASES[field]) {
    const hit = profiles.find((p) => !taken.has(p.name) && normaliseColumnName(p.name) === normaliseColumnName(alias));
    if (hit) return hit;
  }
  return undefined;
}

/** Angular distance between two RA values in degrees, across 0/360. */
const raDiffDeg = (a: number, b: number) => Math.abs(((a - b + 540) % 360) - 180);

/** How the numbers of a column relate to the galaxy's RA: 'deg', 'hour', 'rad', or null (not near the galaxy). */
function raUnitOfValues(p: ColumnProfile, raDeg: number, toleranceDeg: number): 'deg' | 'hour' | 'rad' | null {
  if (!Number.isFinite(p.median)) return null;
  if (raDiffDeg(p.median, raDeg) <= toleranceDeg) return 'deg';
  if (raDiffDeg(p.median * 15, raDeg) <= toleranceDeg) return 'hour';
  if (raDiffDeg((p.median * 180) / Math.PI, raDeg) <= toleranceDeg) return 'rad';
  return null;
}

/** How the numbers of a column relate to the galaxy's Dec: 'deg', 'rad', or null. */
function decUnitOfValues(p: ColumnProfile, decDeg: number, toleranceDeg: number): 'deg' | 'rad' | null {
  if (!Number.isFinite(p.median)) return null;
  if (Math.abs(p.median - decDeg) <= toleranceDeg) return 'deg';
  if (Math.abs((p.median * 180) / Math.PI - decDeg) <= toleranceDeg && Math.abs(decDeg) > 3 * toleranceDeg) return 'rad';
  return null;
}

/** True when most non-empty cells of a text column read as sexagesimal and the median angle is near `targetDeg`. */
function sexagesimalNear(table: RawTable, k: number, targetDeg: number, isRa: boolean, toleranceDeg: number): boolean {
  const vals: number[] = [];
  table.forEachRow((cells) => {
    if (vals.length >= 200) return;
    const c = cells[k];
    if (typeof c !== 'string' || c.trim() === '') return;
    const r = isRa ? parseRaDeg(c) : parseDecDeg(c);
    if (r.ok) vals.push(r.value);
  });
  if (vals.length === 0) return false;
  vals.sort((a, b) => a - b);
  const m = vals[Math.floor(vals.length / 2)];
  return isRa ? raDiffDeg(m, targetDeg) <= toleranceDeg : Math.abs(m - targetDeg) <= toleranceDeg;
}

/**
 * Guess the column mapping of a table for a galaxy at (raDeg, decDeg); `toleranceDeg` is how far the catalog's median
 * position may lie from the galaxy (default 2 degrees).
 */
export function guessColumns(table: RawTable, galaxy: { raDeg: number; decDeg: number }, toleranceDeg = 2): ColumnGuess {
  const profiles = profileColumns(table);
  const taken = new Set<string>();
  const fields: ColumnGuess['fields'] = {};
  const notes: string[] = [];
  const problems: string[] = [];
  const mapping: ColumnMapping = {};
  const take = (f: ContractField, p: ColumnProfile, how: GuessedField['how'], unit?: GuessedField['unit']) => {
    fields[f] = { column: p.name, how, unit };
    taken.add(p.name);
    if (p.name !== f) mapping[f] = p.name;
  };
  const index = (p: ColumnProfile) => profiles.indexOf(p);

  for (const f of ['ra', 'dec'] as const) {
    const isRa = f === 'ra';
    const target = isRa ? galaxy.raDeg : galaxy.decDeg;
    const named = byName(profiles, f, taken);
    const candidates = named ? [named, ...profiles.filter((p) => p !== named && !taken.has(p.name))] : profiles.filter((p) => !taken.has(p.name));
    let done = false;
    for (const p of candidates) {
      const how = p === named ? 'name' : 'values';
      const fileUnit = angleUnitOf(p.unit);
      if (fileUnit) {
        // The file states the unit and the reader converts it: take the column when its values, so converted, are near.
        const deg = fileUnit.kind === 'number' ? p.median * fileUnit.factorDeg : NaN;
        const near = fileUnit.kind === 'sexagesimal' ? sexagesimalNear(table, index(p), target, isRa, toleranceDeg)
          : isRa ? raDiffDeg(deg, target) <= toleranceDeg : Math.abs(deg - target) <= toleranceDeg;
        if (near) { take(f, p, how, 'file'); done = true; break; }
        continue;
      }
      if (p.numeric >= Math.max(1, 0.5 * p.filled)) {
        const u = isRa ? raUnitOfValues(p, target, toleranceDeg) : decUnitOfValues(p, target, toleranceDeg);
        if (u === 'deg' || u === 'hour') {
          take(f, p, how, u);
          if (u === 'hour') {
            mapping.raUnit = 'hour';
            notes.push(`${p.name}: the values (median ${p.median.toFixed(4)}) are hours of RA (the galaxy is at ${(galaxy.raDeg / 15).toFixed(4)} h), so catalogColumns.raUnit is "hour"`);
          }
          done = true;
          break;
        }
        if (u === 'rad') {
          problems.push(`${p.name}: the values (median ${p.median.toFixed(5)}) look like radians; a plan cannot state radians for a CSV column: convert the column to degrees, or use a table format with units (ECSV, VOTable, FITS) and unit "rad"`);
          taken.add(p.name);
          done = true;
          break;
        }
        if (p === named) notes.push(`${p.name}: named like ${isRa ? 'RA' : 'Dec'}, but its median ${p.median.toFixed(4)} is not within ${toleranceDeg} deg of the galaxy (${target.toFixed(4)} deg) in degrees or hours; looking at the other columns`);
      } else if (p.sexagesimal >= Math.max(1, 0.5 * p.filled) && sexagesimalNear(table, index(p), target, isRa, toleranceDeg)) {
        take(f, p, how, 'text');
        notes.push(`${p.name}: sexagesimal text (${isRa ? 'hours' : 'degrees'}, minutes, seconds), read as such`);
        done = true;
        break;
      }
    }
    if (!done) problems.push(`no column holds ${isRa ? 'RA' : 'Dec'} values near the galaxy's ${isRa ? `RA ${galaxy.raDeg.toFixed(4)} deg` : `Dec ${galaxy.decDeg.toFixed(4)} deg`} (in degrees, hours or sexagesimal text): check the galaxy centre, or name the column with catalogColumns.${f}`);
  }

  // Magnitude: by name, else a numeric column of plausible magnitudes whose name has "mag" in it.
  const magNamed = byName(profiles, 'mag', taken);
  const plausibleMag = (p: ColumnProfile) => p.numeric > 0 && p.min >= -5 && p.max <= 40 && p.numeric >= 0.5 * p.filled;
  const magByValue = profiles.find((p) => !taken.has(p.name) && /mag/i.test(p.name) && !/err|sig|unc/i.test(p.name) && plausibleMag(p));
  if (magNamed) take('mag', magNamed, 'name');
  else if (magByValue) {
    take('mag', magByValue, 'values');
    notes.push(`${magByValue.name}: taken as the magnitude (values ${magByValue.min.toFixed(2)} to ${magByValue.max.toFixed(2)}); every magnitude in the plan (alignment range, weighting) is in this column's band`);
  } else problems.push('no magnitude column found (looked for mag, magnitude, imag, rmag... and any column with "mag" in its name): name it with catalogColumns.mag');

  // Identifier: by name, else the first text or whole-number column whose values are all different.
  const idNamed = byName(profiles, 'id', taken);
  const idByValue = profiles.find((p) => !taken.has(p.name) && p.filled > 0 && p.distinct === p.filled && (p.text > 0 || p.min === Math.floor(p.min)));
  if (idNamed) take('id', idNamed, 'name');
  else if (idByValue) {
    take('id', idByValue, 'values');
    notes.push(`${idByValue.name}: taken as the object identifier (every value different)`);
  } else problems.push('no identifier column found (looked for id, name, source_id, objid...): name it with catalogColumns.id');

  // Colour: by name, else a numeric column named like a colour (colour_vi, g-i colour...).
  const colorNamed = byName(profiles, 'color', taken) ?? profiles.find((p) => !taken.has(p.name) && /colou?r/i.test(p.name) && !/err|sig|unc/i.test(p.name) && p.numeric > 0);
  if (colorNamed) take('color', colorNamed, 'name');
  const prio = byName(profiles, 'priority', taken);
  if (prio) { fields.priority = { column: prio.name, how: 'name' }; taken.add(prio.name); if (prio.name !== 'priority') mapping.priority = prio.name; }

  // Role: a column of "tracer"/"alignment" values; one that marks alignment stars wins over one named like a role.
  const roleNamed = byName(profiles, 'role', taken);
  const onlyRoles = (p: ColumnProfile) => p.text > 0 && p.texts.every((t) => t === 'tracer' || t === 'alignment');
  const marksStars = (p: ColumnProfile) => onlyRoles(p) && p.texts.includes('alignment');
  const roleByValue = roleNamed && marksStars(roleNamed) ? undefined : profiles.find((p) => p !== roleNamed && !taken.has(p.name) && marksStars(p));
  if (roleByValue) {
    take('role', roleByValue, 'values');
    notes.push(`${roleByValue.name}: marks alignment stars ("alignment", the rest "tracer"), taken as the role column`);
  } else if (roleNamed && onlyRoles(roleNamed)) take('role', roleNamed, 'name');
  else if (roleNamed) {
    problems.push(`${roleNamed.name}: the reader takes this column as the role (tracer or alignment), but it holds other values (${roleNamed.texts.slice(0, 5).join(', ')}): rename it, or mark alignment stars in a column named role`);
  }
  return { fields, mapping, notes, problems, profiles };
}
