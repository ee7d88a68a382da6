import { describe, expect, it } from 'vitest';
import { weighTargets, formulaWeight, exclusionCounts } from '../../src/core/solver/weighting';
import { weightingSchema } from '../../src/core/plan/weightingSection';
import type { Target } from '../../src/core/catalog/types';
import type { GalaxyModel } from '../../src/core/plan/schema';
import { galaxyToSkyArcsec } from '../../src/core/sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../../src/core/sky/tangentPlane';

// A galaxy at PA 0 with q = 1, so R = plain distance and Re = 10".
const galaxy: GalaxyModel = { id: 'g', raDeg: 30, decDeg: 10, reArcsec: 10, axisRatio: 1, paDeg: 0, distanceMpc: 10, vsysKms: 1000, sersicN: 4, muE: 21 };
const centre = tangentCentre(galaxy.raDeg, galaxy.decDeg);

/** A hand-made row at sky offset (xi East, eta North) arcsec from the galaxy centre. */
function row(id: string, xi: number, eta: number, mag: number, color: number | null = null, extra: Partial<Target> = {}): Target {
  const p = tangentToSkyDeg(centre, xi, eta);
  return { id, raDeg: p.raDeg, decDeg: p.decDeg, mag, color, priority: null, role: 'tracer', line: 2, extra: {}, ...extra };
}

describe('weight formula (docs/weighting.md)', () => {
  it('gives the documented weights for hand-made rows', () => {
    const rules = weightingSchema.parse({ formula: { magPivot: 22, magSlope: 0.5, radiusExponent: 0.5 } });
    const r = weighTargets([row('a', 0, 30, 22), row('b', 0, 30, 21), row('c', 0, 80, 22)], galaxy, rules);
    const w = Object.fromEntries(r.targets.map((t) => [t.id, t.weight]));
    // a: R/Re = 3, mag at the pivot: 1 * (1 + 3)^0.5 = 2
    expect(w.a).toBeCloseTo(2, 6);
    // b: one mag brighter: 10^(0.2) * 2 = 3.1698
    expect(w.b).toBeCloseTo(Math.pow(10, 0.2) * 2, 6);
    expect(w.b).toBeCloseTo(3.1698, 3);
    // c: R/Re = 8: (1 + 8)^0.5 = 3
    expect(w.c).toBeCloseTo(3, 6);
    expect(r.targets.every((t) => t.weightSource === 'formula')).toBe(true);
  });

  it('the colour term peaks at the colour peaks and falls to the floor far from them', () => {
    const f = { magPivot: 20, magSlope: 0, colorPeaks: [0.9, 1.2], colorSigma: 0.1, colorFloor: 0.25, radiusExponent: 0 };
    expect(formulaWeight(20, 0.9, 0, f)).toBeCloseTo(1, 12);
    // one sigma from the nearer peak: 0.25 + 0.75 * exp(-1/2) = 0.70490
    expect(formulaWeight(20, 1.3, 0, f)).toBeCloseTo(0.25 + 0.75 * Math.exp(-0.5), 12);
    expect(formulaWeight(20, 3, 0, f)).toBeCloseTo(0.25, 10);
    // no colour: neutral
    expect(formulaWeight(20, null, 0, f)).toBe(1);
  });

  it('a catalog priority replaces the formula, and an override weight replaces both', () => {
    const rows = [row('p', 0, 20, 22, null, { priority: 7 }), row('o', 0, 20, 22, null, { priority: 7 }), row('f', 0, 20, 22)];
    const r = weighTargets(rows, galaxy, { formula: { magPivot: 22 } }, { o: { weight: 0.5 } });
    const byId = Object.fromEntries(r.targets.map((t) => [t.id, t]));
    expect(byId.p.weight).toBe(7);
    expect(byId.p.weightSource).toBe('priority');
    expect(byId.o.weight).toBe(0.5);
    expect(byId.o.weightSource).toBe('override');
    expect(byId.f.weightSource).toBe('formula');
  });

  it('magnitude, colour and radius windows exclude tracers and say why; alignment stars are kept', () => {
    const rows = [
      row('bright', 0, 20, 17), row('faint', 0, 20, 24.5), row('blue', 0, 20, 22, 0.3), row('red', 0, 20, 22, 2.0),
      row('inner', 0, 2, 22), row('outer', 0, 200, 22), row('ok', 0, 20, 22, 1.0), row('nocolour', 0, 20, 22, null),
      row('star', 0, 1, 17, 0.5, { role: 'alignment' }),
    ];
    const rules = weightingSchema.parse({ magRange: [18, 24], colorRange: [0.7, 1.4], radiusRangeRe: [0.5, 15] });
    const r = weighTargets(rows, galaxy, rules);
    expect(r.targets.map((t) => t.id).sort()).toEqual(['nocolour', 'ok', 'star']);
    const rule = Object.fromEntries(r.excluded.map((e) => [e.id, e.rule]));
    expect(rule).toEqual({ bright: 'magRange', faint: 'magRange', blue: 'colorRange', red: 'colorRange', inner: 'radiusRangeRe', outer: 'radiusRangeRe' });
    expect(exclusionCounts(r.excluded)).toEqual([{ rule: 'magRange', count: 2 }, { rule: 'colorRange', count: 2 }, { rule: 'radiusRangeRe', count: 2 }]);
    // Every row is either kept or reported.
    expect(r.targets.length + r.excluded.length).toBe(rows.length);
    expect(r.rulesText.some((l) => l.includes('magnitude window 18.0 <= mag <= 24.0'))).toBe(true);
  });

  it('targetOverrides force in past the windows and force out anything', () => {
    const rows = [row('faint', 0, 20, 25), row('good', 0, 20, 22)];
    const r = weighTargets(rows, galaxy, { magRange: [18, 24] }, { faint: { force: 'in' }, good: { force: 'out' } });
    expect(r.targets.map((t) => [t.id, t.forced])).toEqual([['faint', true]]);
    expect(r.excluded).toMatchObject([{ id: 'good', rule: 'override' }]);
  });
});

describe('exclusion regions', () => {
  it('a circle at a sky position excludes exactly the rows inside it, of every role', () => {
    const c = tangentToSkyDeg(centre, 100, 50);
    const rules = weightingSchema.parse({ exclusions: [{ label: 'companion', ra: c.raDeg, dec: c.decDeg, radiusArcsec: 20 }] });
    const rows = [row('in1', 100, 50, 22), row('in2', 115, 60, 22), row('edge-out', 121, 50, 22), row('far', -100, -50, 22), row('star-in', 95, 45, 18, null, { role: 'alignment' })];
    const r = weighTargets(rows, galaxy, rules);
    expect(r.excluded.map((e) => e.id).sort()).toEqual(['in1', 'in2', 'star-in']);
    expect(r.excluded.every((e) => e.rule === 'exclusion:companion')).toBe(true);
    expect(r.targets.map((t) => t.id).sort()).toEqual(['edge-out', 'far']);
  });

  it('an ellipse in galaxy-frame offsets excludes along its major axis only', () => {
    // Galaxy at PA 90: u (major) points East. Region at u = 60", v = 0, a = 30", b/a = 0.2, PA 90 (East-West).
    const g2 = { ...galaxy, paDeg: 90 };
    const rules = weightingSchema.parse({ exclusions: [{ uArcsec: 60, vArcsec: 0, radiusArcsec: 30, axisRatio: 0.2, paDeg: 90 }] });
    const at = (id: string, u: number, v: number) => { const s = galaxyToSkyArcsec(u, v, 90); return row(id, s.xiArcsec, s.etaArcsec, 22); };
    const r = weighTargets([at('along', 85, 0), at('across', 60, 10), at('centre', 60, 0), at('past', 95, 0)], g2, rules);
    expect(r.excluded.map((e) => e.id).sort()).toEqual(['along', 'centre']);
  });

  it('sky-offset circles work and the schema rejects ambiguous centres', () => {
    const r = weighTargets([row('a', -40, 40, 22), row('b', 40, 40, 22)], galaxy, weightingSchema.parse({ exclusions: [{ xiArcsec: -40, etaArcsec: 40, radiusArcsec: 5 }] }));
    expect(r.excluded.map((e) => e.id)).toEqual(['a']);
    expect(weightingSchema.safeParse({ exclusions: [{ xiArcsec: 1, etaArcsec: 1, uArcsec: 0, vArcsec: 0, radiusArcsec: 5 }] }).success).toBe(false);
    expect(weightingSchema.safeParse({ exclusions: [{ xiArcsec: 1, radiusArcsec: 5 }] }).success).toBe(false);
    expect(weightingSchema.safeParse({ magRange: [24, 18] }).success).toBe(false);
  });
});
