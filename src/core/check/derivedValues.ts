/**
 * Values of an output folder that `haloweave check` re-derives from the catalog, the plan and the instrument profile
 * rather than trusting the folder: slit widths and alignment magnitudes against the profile, each object's sky
 * position, magnitude, role and weight against its catalog row, the sector convention of coverage.json, and the
 * contract's column order. Sky positions in ICRS degrees; lengths in arcsec (mask frame).
 */
import type { InstrumentProfile } from '../profile/schema';
import type { Slit } from '../geometry/maskSolution';
import type { Target } from '../catalog/types';
import { separationDeg } from '../sky/separation';
import { SKY_TOL_ARCSEC, LENGTH_TOL_ARCSEC, type CheckedMask, type Violation } from './checkOutput';

/** Relative tolerance for numbers written at full double precision and read back (mag, priority). */
export const VALUE_REL_TOL = 1e-9;

const same = (a: number, b: number) => Math.abs(a - b) <= VALUE_REL_TOL * Math.max(1, Math.abs(a), Math.abs(b));

/** Where a slits.csv row is named in messages. */
export type RowWhere = (i: number, s: Slit) => string;

/** Widths of slits (the profile's slits.widthArcsec) and alignment stars' magnitudes (alignment.magRange). */
export function checkProfileValues(masks: readonly CheckedMask[], slits: readonly Slit[], profileFor: (instrument: string) => InstrumentProfile | null, rowWhere: RowWhere): Violation[] {
  const out: Violation[] = [];
  const profileOf = new Map(masks.map((m) => [m.maskId, profileFor(m.instrument)]));
  slits.forEach((s, i) => {
    const p = profileOf.get(s.maskId);
    if (!p) return; // an unknown mask or profile is reported by the mask rules
    if (s.role !== 'alignment') {
      const w = p.slits.widthArcsec;
      if (!(Math.abs(s.widthArcsec - w) <= LENGTH_TOL_ARCSEC)) out.push({ where: rowWhere(i, s), rule: 'width', what: `width_arcsec ${s.widthArcsec}, but the profile's slits.widthArcsec is ${w}` });
    } else {
      const [bright, faint] = p.alignment.magRange;
      if (s.mag === null || !(s.mag >= bright && s.mag <= faint)) out.push({ where: rowWhere(i, s), rule: 'alignment magnitude', what: `mag ${s.mag ?? '(empty)'} is outside the profile's alignment.magRange [${bright}, ${faint}]` });
    }
  });
  return out;
}

/**
 * Tracer and alignment rows against their catalog rows: the same sky position (within SKY_TOL_ARCSEC), magnitude and
 * role, and for tracers the weight the plan's rules give the object (`weightOf`, null when not known).
 */
export function checkCatalogValues(slits: readonly Slit[], targetsById: ReadonlyMap<string, readonly Target[]>, weightOf: (t: Target) => number | null, rowWhere: RowWhere, catalogSource: string): Violation[] {
  const out: Violation[] = [];
  slits.forEach((s, i) => {
    if (s.role !== 'tracer' && s.role !== 'alignment') return;
    const rows = targetsById.get(s.objectId);
    if (!rows || rows.length === 0) return; // reported by the catalog-use rule
    const where = rowWhere(i, s);
    // An id written twice in the catalog: the row this slit sits on.
    const t = rows.reduce((a, b) => (separationDeg(a.raDeg, a.decDeg, s.raDeg, s.decDeg) <= separationDeg(b.raDeg, b.decDeg, s.raDeg, s.decDeg) ? a : b));
    const offArcsec = separationDeg(t.raDeg, t.decDeg, s.raDeg, s.decDeg) * 3600;
    if (!(offArcsec <= SKY_TOL_ARCSEC)) out.push({ where, rule: 'catalog position', what: `ra_deg/dec_deg is ${offArcsec.toPrecision(4)} arcsec from object ${s.objectId} on ${catalogSource} line ${t.line} (${t.raDeg}, ${t.decDeg})` });
    if (s.mag === null || !same(s.mag, t.mag)) out.push({ where, rule: 'catalog mag', what: `mag ${s.mag ?? '(empty)'}, but ${catalogSource} line ${t.line} gives ${t.mag}` });
    if (t.role !== s.role) out.push({ where, rule: 'catalog role', what: `a ${s.role} row, but ${catalogSource} line ${t.line} has role ${t.role}` });
    if (s.role === 'tracer') {
      const w = weightOf(t);
      if (w !== null && !same(s.priority, w)) out.push({ where, rule: 'catalog priority', what: `priority ${s.priority}, but the plan's weighting gives object ${s.objectId} (${catalogSource} line ${t.line}) the weight ${w}` });
    }
  });
  return out;
}

const isObj = (x: unknown): x is Record<string, unknown> => !!x && typeof x === 'object' && !Array.isArray(x);

/** coverage.json's sector convention: 8 sectors of 45 degrees from the major axis (+u) towards +v, folded stated. */
export function checkSectorConvention(coverage: unknown, source: string): Violation[] {
  const out: Violation[] = [];
  const bad = (key: string, what: string) => out.push({ where: `${source} ${key}`, rule: 'sector convention', what });
  const c = isObj(coverage) ? coverage.sectorConvention : undefined;
  if (!isObj(c)) return [{ where: `${source} sectorConvention`, rule: 'sector convention', what: 'missing: coverage.json must state its azimuthal sectors (count, widthDeg, zero, direction, folded)' }];
  if (c.count !== 8) bad('sectorConvention.count', `${String(c.count)}, but the contract counts 8 sectors`);
  if (c.widthDeg !== 45) bad('sectorConvention.widthDeg', `${String(c.widthDeg)}, but the contract's sectors are 45 degrees wide`);
  if (typeof c.folded !== 'boolean') bad('sectorConvention.folded', 'must say true or false (whether azimuths are folded)');
  if (typeof c.zero !== 'string' || !/^major axis/.test(c.zero)) bad('sectorConvention.zero', `"${String(c.zero)}", but sectors count from the major axis`);
  if (typeof c.direction !== 'string' || !c.direction.includes('+v')) bad('sectorConvention.direction', `"${String(c.direction)}", but azimuth runs from +u towards +v (phi = atan2(v, u))`);
  const roles = isObj(coverage) && isObj(coverage.roles) ? coverage.roles : {};
  for (const [role, rc] of Object.entries(roles)) {
    if (!isObj(rc) || !Array.isArray(rc.sectors)) continue;
    rc.sectors.forEach((b, i) => {
      const from = isObj(b) ? b.fromDeg : undefined, to = isObj(b) ? b.toDeg : undefined;
      if (from !== 45 * i || to !== 45 * (i + 1)) bad(`roles.${role}.sectors[${i}]`, `spans [${String(from)}, ${String(to)}), but sector ${i + 1} is [${45 * i}, ${45 * (i + 1)}) deg from the major axis`);
    });
  }
  return out;
}

/** The header of one of the folder's CSV files: the contract's columns first, spelled and ordered exactly. */
export function checkColumnOrder(header: readonly string[], expected: readonly string[], source: string): Violation[] {
  const got = header.slice(0, expected.length).map((h) => h.trim());
  if (got.length === expected.length && got.every((h, i) => h === expected[i])) return [];
  const k = expected.findIndex((e, i) => got[i] !== e);
  return [{ where: `${source} line 1`, rule: 'column order', what: `column ${k + 1} is "${got[k] ?? '(missing)'}", but the contract's columns are ${expected.join(',')} in this order (extra columns may follow)` }];
}
