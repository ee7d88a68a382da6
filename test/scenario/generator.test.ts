import { describe, expect, it } from 'vitest';
import { generateScenario, distanceModulusMag, DEMO_GALAXY } from '../../src/core/scenario/generator';
import { makeRng } from '../../src/core/numeric/random';
import { weighTargets } from '../../src/core/solver/weighting';
import { parsePlan } from '../../src/core/plan/validate';

describe('seeded random numbers', () => {
  it('repeat for a seed and differ between seeds', () => {
    const a = makeRng(42), b = makeRng(42), c = makeRng(43);
    const xa = Array.from({ length: 5 }, () => a.next());
    expect(Array.from({ length: 5 }, () => b.next())).toEqual(xa);
    expect(Array.from({ length: 5 }, () => c.next())).not.toEqual(xa);
    expect(xa.every((x) => x >= 0 && x < 1)).toBe(true);
  });
  it('normal draws have the asked mean and sigma', () => {
    const r = makeRng('n');
    const xs = Array.from({ length: 20000 }, () => r.normal(3, 2));
    const m = xs.reduce((s, x) => s + x, 0) / xs.length;
    const sd = Math.sqrt(xs.reduce((s, x) => s + (x - m) ** 2, 0) / xs.length);
    expect(m).toBeCloseTo(3, 1);
    expect(sd).toBeCloseTo(2, 1);
  });
});

describe('scenario generator', () => {
  it('is deterministic for a seed and has the asked size', () => {
    const a = generateScenario({ seed: 7, candidates: 500 });
    const b = generateScenario({ seed: 7, candidates: 500 });
    expect(a.catalogCsv).toBe(b.catalogCsv);
    expect(a.targets.length).toBe(500);
    expect(generateScenario({ seed: 8, candidates: 500 }).catalogCsv).not.toBe(a.catalogCsv);
    expect(new Set(a.targets.map((t) => t.id)).size).toBe(500);
  });

  it('writes a plan that validates and a CSV with the contract columns', () => {
    const s = generateScenario({ seed: 1, candidates: 200 });
    expect(() => parsePlan(s.plan)).not.toThrow();
    expect(s.catalogCsv.split('\n')[0]).toBe('id,ra,dec,mag,color,role,kind');
    expect(s.galaxy.id).toBe(DEMO_GALAXY.id);
  });

  it('clusters follow the luminosity function, colours are bimodal, radii reach 15 Re', () => {
    const s = generateScenario({ seed: 3, candidates: 6000, contaminantFraction: 0, alignmentStars: 0, magLimit: 40 });
    const w = weighTargets(s.targets, s.galaxy);
    const gcs = w.targets;
    // Harris (1991, from memory) peak M_V = -7.4: with V - I ~ 1.05 the I-band peak sits at -7.4 + (m - M) - 1.05.
    const dm = distanceModulusMag(s.galaxy.distanceMpc);
    expect(dm).toBeCloseTo(5 * Math.log10(12e6 / 10), 10);
    const mags = gcs.map((t) => t.mag).sort((a, b) => a - b);
    expect(mags[mags.length >> 1]).toBeCloseTo(-7.4 + dm - 1.05, 0);
    const blue = gcs.filter((t) => t.color! < 1.06).length / gcs.length;
    expect(blue).toBeGreaterThan(0.5);
    expect(blue).toBeLessThan(0.7);
    // Few clusters at the colour between the peaks compared with at a peak (bimodality).
    const near = (c: number) => gcs.filter((t) => Math.abs(t.color! - c) < 0.02).length;
    expect(near(1.065)).toBeLessThan(0.8 * near(0.95));
    const rMax = Math.max(...gcs.map((t) => t.radiusRe));
    expect(rMax).toBeGreaterThan(13);
    expect(rMax).toBeLessThanOrEqual(15.001);
    // Surface density falls outwards: more clusters within 2 Re than between 8 and 10 Re per unit area.
    const dens = (a: number, b: number) => gcs.filter((t) => t.radiusRe >= a && t.radiusRe < b).length / (b * b - a * a);
    expect(dens(0, 2)).toBeGreaterThan(5 * dens(8, 10));
  });

  it('alignment stars fall in the asked magnitude range', () => {
    const s = generateScenario({ seed: 5, candidates: 1000, alignmentMagRange: [16, 20] });
    const stars = s.targets.filter((t) => t.role === 'alignment');
    expect(stars.length).toBe(40);
    expect(stars.every((t) => t.mag > 16 && t.mag < 20)).toBe(true);
  });
});
