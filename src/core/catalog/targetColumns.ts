/**
 * The usable catalog rows as columns (struct of arrays): what the readers fill and the solver reads, without one
 * object per row. Positions are ICRS degrees; magnitudes as given in the catalog's band; a missing colour or priority
 * is NaN in its column (null in a Target). `target(i)` and `toTargets()` give the rows as Target objects for code
 * that wants them (the editor's panels, exports of a few rows); `TargetColumns.of` wraps such a list the other way.
 */
import type { Target, TargetRole } from './types';

/** Role codes of the `role` column, in the order of these names. */
export const TARGET_ROLES: readonly TargetRole[] = ['tracer', 'alignment'];
/** Role code of an alignment star in the `role` column. */
export const ALIGNMENT_ROLE = 1;

/**
 * The `extra` of every row when the catalog has no other columns: one shared, frozen empty object
 * (a million catalog rows need not make a million empty objects). Treat `Target.extra` as read-only.
 */
const NO_EXTRA: Record<string, string> = Object.freeze({}) as Record<string, string>;

/** Rows of a catalog as typed columns (index i is the i-th usable row, in catalog order). */
export class TargetColumns {
  /** Number of rows. */
  length = 0;
  ids: string[] = [];
  raDeg: Float64Array;
  decDeg: Float64Array;
  mag: Float64Array;
  /** Colour, NaN when the row has none. */
  color: Float64Array;
  /** Explicit catalog priority (positive), NaN when the row has none. */
  priority: Float64Array;
  /** Index into TARGET_ROLES. */
  role: Uint8Array;
  /** 1-based file line (CSV/ECSV) or 1-based row (VOTable/FITS) of each row. */
  line: Int32Array;
  /** Every other column, carried through as text: its name and one value per row. */
  readonly extraNames: readonly string[];
  readonly extraValues: string[][];

  constructor(extraNames: readonly string[] = [], capacity = 1024) {
    const n = Math.max(1, capacity);
    this.raDeg = new Float64Array(n);
    this.decDeg = new Float64Array(n);
    this.mag = new Float64Array(n);
    this.color = new Float64Array(n);
    this.priority = new Float64Array(n);
    this.role = new Uint8Array(n);
    this.line = new Int32Array(n);
    this.extraNames = [...extraNames];
    this.extraValues = extraNames.map(() => []);
  }

  /** Append a row (color and priority NaN when absent; extra values in the order of extraNames). */
  push(id: string, raDeg: number, decDeg: number, mag: number, color: number, priority: number, role: number, line: number): number {
    const i = this.length;
    if (i === this.raDeg.length) this.resize(2 * i);
    this.ids.push(id);
    this.raDeg[i] = raDeg;
    this.decDeg[i] = decDeg;
    this.mag[i] = mag;
    this.color[i] = color;
    this.priority[i] = priority;
    this.role[i] = role;
    this.line[i] = line;
    this.length = i + 1;
    return i;
  }

  /** The columns cut to the rows held (called once every row is in; a table without spare room is left as it is). */
  trim(): this {
    if (this.raDeg.length !== this.length) this.resize(this.length);
    return this;
  }

  private resize(n: number): void {
    const grow = <A extends Float64Array | Int32Array | Uint8Array>(a: A, make: (k: number) => A): A => {
      const b = make(n);
      b.set(a.subarray(0, Math.min(n, this.length)));
      return b;
    };
    this.raDeg = grow(this.raDeg, (k) => new Float64Array(k));
    this.decDeg = grow(this.decDeg, (k) => new Float64Array(k));
    this.mag = grow(this.mag, (k) => new Float64Array(k));
    this.color = grow(this.color, (k) => new Float64Array(k));
    this.priority = grow(this.priority, (k) => new Float64Array(k));
    this.role = grow(this.role, (k) => new Uint8Array(k));
    this.line = grow(this.line, (k) => new Int32Array(k));
  }

  /** True when row i is an alignment star. */
  isAlignment(i: number): boolean {
    return this.role[i] === ALIGNMENT_ROLE;
  }

  /** Row i as a Target object (a new object at each call). */
  target(i: number): Target {
    const c = this.color[i], p = this.priority[i];
    let extra = NO_EXTRA;
    if (this.extraNames.length > 0) {
      extra = {};
      for (let k = 0; k < this.extraNames.length; k++) extra[this.extraNames[k]] = this.extraValues[k][i];
    }
    return {
      id: this.ids[i], raDeg: this.raDeg[i], decDeg: this.decDeg[i], mag: this.mag[i], color: c === c ? c : null,
      priority: p === p ? p : null, role: TARGET_ROLES[this.role[i]], line: this.line[i], extra,
    };
  }

  /** Every row as a Target object. */
  toTargets(): Target[] {
    const out: Target[] = new Array(this.length);
    for (let i = 0; i < this.length; i++) out[i] = this.target(i);
    return out;
  }

  /** A table of Target objects (each row's extra columns as the first row names them; a row lacking one gives ''). */
  static of(targets: readonly Target[]): TargetColumns {
    const names = targets.length > 0 ? Object.keys(targets[0].extra) : [];
    const t = new TargetColumns(names, targets.length);
    for (const r of targets) {
      t.push(r.id, r.raDeg, r.decDeg, r.mag, r.color ?? NaN, r.priority ?? NaN, r.role === 'alignment' ? ALIGNMENT_ROLE : 0, r.line);
      for (let k = 0; k < names.length; k++) t.extraValues[k].push(r.extra[names[k]] ?? '');
    }
    return t.trim();
  }
}

/** Tables made by `targetColumnsOf` from Target lists, so a list is wrapped once however often it is asked for. */
const tablesOfLists = new WeakMap<readonly Target[], TargetColumns>();

/** The rows as a TargetColumns: the table itself, or (once per list) a table of a list of Target objects. */
export function targetColumnsOf(targets: readonly Target[] | TargetColumns): TargetColumns {
  if (targets instanceof TargetColumns) return targets;
  let t = tablesOfLists.get(targets);
  if (!t) tablesOfLists.set(targets, (t = TargetColumns.of(targets)));
  return t;
}
