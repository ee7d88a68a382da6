/**
 * The weighting's kept targets as columns (solver/weighting.ts KeptColumns) and as objects built on first read: both
 * describe the same targets, the objects carry every catalog field plus the weighting's own, and a structured clone
 * (the editor's worker message) or a spread of the result still carries the objects.
 */
import { describe, expect, it } from 'vitest';
import { keptColumnsOf, weighTargets, WEIGHT_SOURCES } from '../../src/core/solver/weighting';
import { weightingSchema } from '../../src/core/plan/weightingSection';
import { generateScenario } from '../../src/core/scenario/generator';

describe('kept targets as columns', () => {
  const s = generateScenario({ seed: 'kept-columns', candidates: 1500 });
  const rules = weightingSchema.parse({ magRange: [19, 23.5], formula: { radiusExponent: 0.5 } });
  const r = weighTargets(s.targets, s.galaxy, rules, { [s.targets[5].id]: { force: 'in' } });

  it('lists the kept targets in catalog order, the objects matching the columns field for field', () => {
    const cols = keptColumnsOf(r, s.targets)!;
    expect(cols).not.toBeNull();
    expect(cols.index.length + r.excluded.length).toBe(s.targets.length);
    expect(r.excluded.length).toBeGreaterThan(0);
    for (let j = 1; j < cols.index.length; j++) expect(cols.index[j]).toBeGreaterThan(cols.index[j - 1]);
    expect(r.targets.length).toBe(cols.index.length);
    r.targets.forEach((t, j) => {
      const row = s.targets[cols.index[j]];
      expect(t).toEqual({ ...row, weight: cols.weight[j], weightSource: WEIGHT_SOURCES[cols.source[j]], forced: cols.forced[j] === 1, radiusRe: cols.radiusRe[j], azimuthDeg: cols.azimuthDeg[j] });
      if (row.role === 'alignment') expect(t.weightSource).toBe('alignment');
      else expect(t.weight).toBeGreaterThan(0);
    });
    expect(r.targets.find((t) => t.id === s.targets[5].id)?.forced).toBe(true);
    // The objects are built once and kept.
    expect(r.targets).toBe(r.targets);
  });

  it('survives a structured clone and a spread; columns of another target list are not used', () => {
    const clone = structuredClone(r);
    expect(clone.targets.map((t) => t.id)).toEqual(r.targets.map((t) => t.id));
    expect({ ...r }.targets.length).toBe(r.targets.length);
    expect(keptColumnsOf(r, s.targets.slice())).toBeNull();
  });
});
