/**
 * The catalog rows as columns (catalog/targetColumns.ts) from the reader on: the same rows as the Target objects in every
 * field (missing colour and priority, roles, lines, extra columns), objects made only when read, a structured clone
 * (the editor's worker message) carrying the objects, and the solver's path (weighting, excluded-targets.csv, the
 * allocation context) giving the same result from the table as from the objects.
 */
import { describe, expect, it } from 'vitest';
import { readCatalog } from '../../src/core/catalog/read';
import { catalogTargetColumns, usableRowCount } from '../../src/core/catalog/validate';
import { TargetColumns, targetColumnsOf } from '../../src/core/catalog/targetColumns';
import { generateScenario } from '../../src/core/scenario/generator';
import { weighTargets, exclusionCounts, excludedCount } from '../../src/core/solver/weighting';
import { weightingSchema } from '../../src/core/plan/weightingSection';
import { excludedTargetsCsv } from '../../src/core/pipeline/summary';
import { allocationContext } from '../../src/core/solver/allocateMasks';
import { toCsv } from '../../src/core/export/csvText';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseProfile } from '../../src/core/profile/load';

/** Rest wavelengths (Angstrom) of the near-infrared calcium triplet (common practice). */
const LINES_A = [8498.0, 8542.1, 8662.1];

const CSV = [
  'id,ra,dec,mag,color,priority,role,note,band',
  'a1,187.5,-5.1,21.5,0.9,,tracer,first,I',
  'a2,12:30:01.0,-05:06:07.8,20.25,,2.5,alignment,,I',
  'a3,187.6,-5.2,bad,1.0,,tracer,x,I', // rejected: mag is not a number
  'a4,187.7,-5.3,22.75,1.25,0.5,,"with, comma",R',
].join('\n');

describe('catalog rows as columns', () => {
  const r = readCatalog(CSV, 'cat.csv');

  it('hold every field of every usable row, as the Target objects give them', () => {
    const t = catalogTargetColumns(r);
    expect(t).toBeInstanceOf(TargetColumns);
    expect(usableRowCount(r)).toBe(3);
    expect(t.ids).toEqual(['a1', 'a2', 'a4']);
    expect(Array.from(t.line)).toEqual([2, 3, 5]);
    expect(Array.from(t.color)).toEqual([0.9, NaN, 1.25]);
    expect(Array.from(t.priority)).toEqual([NaN, 2.5, 0.5]);
    expect(t.extraNames).toEqual(['note', 'band']);
    // Objects: null for the missing colour and priority, the role by name, the other columns as text.
    expect(r.targets).toEqual([
      { id: 'a1', raDeg: 187.5, decDeg: -5.1, mag: 21.5, color: 0.9, priority: null, role: 'tracer', line: 2, extra: { note: 'first', band: 'I' } },
      { id: 'a2', raDeg: 187.5 + 1 / 240, decDeg: -(5 + 6 / 60 + 7.8 / 3600), mag: 20.25, color: null, priority: 2.5, role: 'alignment', line: 3, extra: { note: '', band: 'I' } },
      { id: 'a4', raDeg: 187.7, decDeg: -5.3, mag: 22.75, color: 1.25, priority: 0.5, role: 'tracer', line: 5, extra: { note: 'with, comma', band: 'R' } },
    ]);
    expect(r.targets).toBe(r.targets); // made once, then kept
    expect(r.rejects.map((x) => x.line)).toEqual([4]);
  });

  it('excluded rows are written with their catalog line, role, rule and reason', () => {
    const galaxy = { id: 'g', raDeg: 187.5, decDeg: -5.1, reArcsec: 30, axisRatio: 1, paDeg: 0, distanceMpc: 15, vsysKms: 1000, sersicN: 4, muE: 21 };
    const w = weighTargets(catalogTargetColumns(r), galaxy, { magRange: [21, 22] }, { a1: { force: 'out' } });
    expect(excludedTargetsCsv(w)).toBe('id,line,role,rule,reason\na1,2,tracer,override,forced out by targetOverrides\na4,5,tracer,magRange,mag 22.75 outside 21.0..22.0\n');
    expect(w.kept!.index.length).toBe(1); // the alignment star: the magnitude window applies to tracers only
  });

  it('a table of objects gives the same objects back, and a list is wrapped once', () => {
    const again = TargetColumns.of(r.targets);
    expect(again.toTargets()).toEqual(r.targets);
    const list = r.targets.slice();
    expect(targetColumnsOf(list)).toBe(targetColumnsOf(list));
    expect(TargetColumns.of([]).length).toBe(0);
    expect(TargetColumns.of([]).raDeg.length).toBe(0);
  });

  it('a structured clone of a read result carries the objects (the table stays behind)', () => {
    const clone = structuredClone(r);
    expect(clone.targets).toEqual(r.targets);
    expect(clone.table).toBeUndefined();
    expect(catalogTargetColumns(clone).ids).toEqual(['a1', 'a2', 'a4']);
  });
});

describe('the solver path from the table equals the path from the objects', () => {
  const s = generateScenario({ seed: 'target-table', candidates: 2500 });
  const table = TargetColumns.of(s.targets);
  const rules = weightingSchema.parse({
    magRange: [19, 23.5], colorRange: [0.8, 1.3], radiusRangeRe: [0, 12],
    exclusions: [{ label: 'companion', uArcsec: 60, vArcsec: 0, radiusArcsec: 40 }],
  });
  const overrides = { [s.targets[3].id]: { force: 'out' as const }, [s.targets[7].id]: { weight: 0 } };
  const fromTable = weighTargets(table, s.galaxy, rules, overrides);
  const fromObjects = weighTargets(s.targets, s.galaxy, rules, overrides);

  it('same kept columns, same excluded rows with the same rules and reasons', () => {
    expect(fromTable.kept).toEqual(fromObjects.kept);
    expect(fromTable.excluded).toEqual(fromObjects.excluded);
    expect(excludedCount(fromTable)).toBe(fromObjects.excluded.length);
    const rulesSeen = new Set(fromTable.excluded.map((e) => e.rule));
    for (const rule of ['override', 'magRange', 'colorRange', 'exclusion:companion']) expect(rulesSeen.has(rule)).toBe(true);
    expect(exclusionCounts(fromTable)).toEqual(exclusionCounts(fromObjects.excluded));
  });

  it('excluded-targets.csv from the columns is the CSV of the excluded objects', () => {
    const objects = fromObjects.excluded.map((e) => [e.id, e.line, e.role, e.rule, e.reason]);
    expect(excludedTargetsCsv(fromTable)).toBe(toCsv(['id', 'line', 'role', 'rule', 'reason'], objects, { neutraliseFormulas: true }));
    expect(excludedTargetsCsv(fromObjects)).toBe(excludedTargetsCsv(fromTable));
  });

  it('the allocation context reads the table and makes the objects only when asked', () => {
    const weights = Float64Array.from(s.targets, (_, i) => (i % 3 === 0 ? 0 : 1));
    const profile = parseProfile(JSON.parse(readFileSync(join(__dirname, '../../instrument-profiles/ridge10-narrow.json'), 'utf8')), 'ridge10-narrow');
    const ctx = allocationContext(profile, s.galaxy, LINES_A, table, weights);
    const ctxObjects = allocationContext(profile, s.galaxy, LINES_A, s.targets, weights);
    expect(ctx.tracerIndices.length).toBeGreaterThan(1000);
    expect(Array.from(ctx.tracerIndices)).toEqual(Array.from(ctxObjects.tracerIndices));
    expect(Array.from(ctx.alignmentIndices)).toEqual(Array.from(ctxObjects.alignmentIndices));
    expect(ctx.unit).toEqual(ctxObjects.unit);
    expect(Object.keys(ctx)).not.toContain('targets'); // not enumerable: a spread of the context leaves it out
    expect(ctx.targets).toEqual(s.targets);
  });
});
