/**
 * Column mapping: which file column supplies each contract field (`id, ra, dec, mag, color, priority, role`),
 * from an explicit mapping (plan key `catalogColumns`), else the contract name, else a common alias.
 * Names match case-insensitively and ignoring everything but letters and digits (`RA_ICRS` = `raicrs`,
 * `g-i` = `g_i`). Also the angle unit of RA and Dec, from the file's metadata or the mapping.
 */
import { InputError, type Problem } from '../result';
import type { ColumnInfo, ColumnMapping } from './types';

export const CONTRACT_FIELDS = ['id', 'ra', 'dec', 'mag', 'color', 'priority', 'role'] as const;
export type ContractField = (typeof CONTRACT_FIELDS)[number];
export const REQUIRED_FIELDS: readonly ContractField[] = ['id', 'ra', 'dec', 'mag'];

/** Aliases per contract field, in order of preference (the contract name first). */
export const COLUMN_ALIASES: Record<ContractField, readonly string[]> = {
  id: ['id', 'name', 'source_id', 'sourceid', 'objid', 'obj_id', 'object_id', 'object', 'objname', 'source', 'target', 'target_id', 'designation'],
  ra: ['ra', 'raj2000', 'ra_j2000', 'ra_deg', 'radeg', 'ra_icrs', 'alpha', 'alpha_j2000', 'ra2000', 'right_ascension'],
  dec: ['dec', 'dej2000', 'decj2000', 'dec_j2000', 'dec_deg', 'decdeg', 'dec_icrs', 'de_icrs', 'delta', 'delta_j2000', 'dec2000', 'declination', 'de'],
  mag: ['mag', 'magnitude', 'mag_i', 'imag', 'i_mag', 'mag_r', 'rmag', 'r_mag', 'mag_v', 'vmag', 'v_mag', 'mag_g', 'gmag', 'g_mag'],
  color: ['color', 'colour', 'g_i', 'color_gi', 'colour_gi', 'v_i', 'g_r', 'b_v'],
  priority: ['priority', 'prio', 'weight'],
  role: ['role', 'target_role', 'kind'],
};

/** Normal form of a column name for matching: lower case, letters and digits only. */
export function normaliseColumnName(name: string): string {
  return name.toLowerCase().replace(/[^a-z0-9]/g, '');
}

/** How the values of an angle column are written. `factorDeg` converts a number to degrees. */
export type AngleUnit =
  | { kind: 'number'; name: 'deg' | 'rad' | 'arcmin' | 'arcsec' | 'mas' | 'hour'; factorDeg: number }
  | { kind: 'sexagesimal'; name: 'h:m:s' | 'd:m:s' };

const NUMBER_UNITS: Record<string, AngleUnit> = {};
function addUnit(names: string[], unit: AngleUnit) {
  for (const n of names) NUMBER_UNITS[n] = unit;
}
addUnit(['deg', 'degree', 'degrees', '°', 'degr'], { kind: 'number', name: 'deg', factorDeg: 1 });
addUnit(['rad', 'radian', 'radians'], { kind: 'number', name: 'rad', factorDeg: 180 / Math.PI });
addUnit(['arcmin', "'", 'amin'], { kind: 'number', name: 'arcmin', factorDeg: 1 / 60 });
addUnit(['arcsec', '"', 'asec'], { kind: 'number', name: 'arcsec', factorDeg: 1 / 3600 });
addUnit(['mas'], { kind: 'number', name: 'mas', factorDeg: 1 / 3.6e6 });
addUnit(['h', 'hr', 'hour', 'hours', 'hourangle', 'hour_angle'], { kind: 'number', name: 'hour', factorDeg: 15 });
addUnit(['h:m:s', 'hms'], { kind: 'sexagesimal', name: 'h:m:s' });
addUnit(['d:m:s', 'dms'], { kind: 'sexagesimal', name: 'd:m:s' });

/** The angle unit a metadata unit string names, `undefined` for no unit, or `null` when it is not an angle unit. */
export function angleUnitOf(unit: string | undefined): AngleUnit | undefined | null {
  if (unit === undefined) return undefined;
  const u = unit.trim().replace(/^["']|["']$/g, '').trim().toLowerCase();
  if (u === '') return undefined;
  return NUMBER_UNITS[u] ?? null;
}

export const DEGREES: AngleUnit = NUMBER_UNITS.deg;
export const HOURS: AngleUnit = NUMBER_UNITS.hour;

/** The resolved mapping: column index per contract field (-1 when absent), angle units, and the other columns. */
export interface ResolvedColumns {
  index: Record<ContractField, number>;
  /** Contract field -> file column name, for the fields found. */
  mapping: Record<string, string>;
  raUnit: AngleUnit;
  decUnit: AngleUnit;
  /** Indices of the columns carried through in `Target.extra`. */
  extra: number[];
}

/**
 * Resolve the contract fields against a table's columns. Throws InputError listing every problem: a required
 * field with no column, an explicit mapping naming a column the file lacks, an RA/Dec unit that is not an angle.
 */
export function resolveColumns(columns: readonly ColumnInfo[], mapping: ColumnMapping = {}, source = 'catalog'): ResolvedColumns {
  const problems: Problem[] = [];
  const available = columns.map((c) => c.name).join(', ') || '(none)';
  const byExact = new Map<string, number>();
  const byNormal = new Map<string, number>();
  columns.forEach((c, i) => {
    if (!byExact.has(c.name.toLowerCase())) byExact.set(c.name.toLowerCase(), i);
    const n = normaliseColumnName(c.name);
    if (n !== '' && !byNormal.has(n)) byNormal.set(n, i);
  });
  const find = (name: string) => byExact.get(name.toLowerCase()) ?? byNormal.get(normaliseColumnName(name));
  const index = {} as Record<ContractField, number>;
  const used = new Set<number>();
  const out: Record<string, string> = {};
  // Explicit names first, so an alias never takes a column the user assigned to another field.
  for (const f of CONTRACT_FIELDS) {
    const explicit = mapping[f];
    index[f] = -1;
    if (explicit === undefined || explicit === '') continue;
    const i = find(explicit);
    if (i === undefined) {
      problems.push({
        where: `${source}: catalogColumns.${f}`,
        what: `names the column "${explicit}", which the catalog does not have`,
        fix: `use one of: ${available}`,
      });
    } else {
      index[f] = i;
      used.add(i);
    }
  }
  for (const f of CONTRACT_FIELDS) {
    if (index[f] >= 0 || (mapping[f] ?? '') !== '') continue;
    for (const alias of COLUMN_ALIASES[f]) {
      const i = find(alias);
      if (i !== undefined && !used.has(i)) {
        index[f] = i;
        used.add(i);
        break;
      }
    }
    if (index[f] < 0 && REQUIRED_FIELDS.includes(f) && mapping[f] === undefined) {
      problems.push({
        where: source,
        what: `no column for "${f}" (looked for ${COLUMN_ALIASES[f].join(', ')}); the columns are: ${available}`,
        fix: `rename the column to "${f}" or set catalogColumns.${f} in the plan to its name`,
      });
    }
  }
  for (const f of CONTRACT_FIELDS) if (index[f] >= 0) out[f] = columns[index[f]].name;

  const unitFor = (f: 'ra' | 'dec'): AngleUnit => {
    if (index[f] < 0) return DEGREES;
    const col = columns[index[f]];
    const u = angleUnitOf(col.unit);
    if (u === null) {
      problems.push({
        where: `${source}: column ${col.name}`,
        what: `has the unit "${col.unit}", which is not an angle`,
        fix: 'give RA and Dec in deg, h (RA only), rad, arcmin, arcsec or sexagesimal text',
      });
      return DEGREES;
    }
    if (u !== undefined) {
      if (f === 'dec' && (u.name === 'hour' || u.name === 'h:m:s')) {
        problems.push({ where: `${source}: column ${col.name}`, what: `Dec has the unit "${col.unit}"`, fix: 'give Dec in degrees' });
      }
      return u;
    }
    return f === 'ra' && mapping.raUnit === 'hour' ? HOURS : DEGREES;
  };
  const raUnit = unitFor('ra');
  const decUnit = unitFor('dec');
  if (problems.length > 0) throw new InputError(problems);
  const extra = columns.map((_, i) => i).filter((i) => !used.has(i));
  return { index, mapping: out, raUnit, decUnit, extra };
}
