/**
 * Mixed-instrument plans solved end to end over the shipped profiles and generated ones (different footprints,
 * detectors with and without gaps, different telescopes and sites): every mask follows its own profile, as the
 * independent core checker (src/core/check, which shares no solver bookkeeping) confirms; tracers appear once.
 */
import { describe, expect, it } from 'vitest';
import { generatedProfiles, shippedProfile, solveMixed, violationsOf } from './mixedCase';

const ids = ['ridge10-narrow', 'quad8-square', 'broad65-wide'];
const galaxy = { reArcsec: 70, id: 'Mixed Test' };

describe('mixed plans: each mask by its own profile', () => {
  const pairs: [string, string][] = [['ridge10-narrow', 'broad65-wide'], ['quad8-square', 'ridge10-narrow'], ['broad65-wide', 'quad8-square']];
  for (const [a, b] of pairs) {
    it(`${a} + ${b}: every row passes the checker against its mask's profile`, () => {
      const c = solveMixed({ seed: `${a}/${b}`, candidates: 1800, galaxy, fieldHalfSizeRe: 14, alignmentStars: 400 }, [{ profile: shippedProfile(a), masks: 2 }, { profile: shippedProfile(b), masks: 1 }]);
      expect(c.solution.problems).toEqual([]);
      expect(violationsOf(c)).toEqual([]);
      expect(c.solution.masks.map((m) => m.mask.instrument)).toEqual([a, a, b]);
      for (const m of c.solution.masks) {
        const p = m.mask.instrument === a ? shippedProfile(a) : shippedProfile(b);
        const boxes = m.slits.filter((s) => s.role === 'alignment');
        // Each mask's own rules, not the plan's first profile's: box size and count, slit width.
        expect(boxes.length).toBeGreaterThanOrEqual(p.alignment.minCount);
        for (const s of boxes) expect(s.widthArcsec).toBe(p.alignment.boxSizeArcsec);
        for (const s of m.slits.filter((r) => r.role === 'tracer')) expect(s.widthArcsec).toBe(p.slits.widthArcsec);
        expect(m.slits.filter((s) => s.role === 'tracer').length).toBeGreaterThan(0);
      }
      const objects = c.solution.masks.flatMap((m) => m.slits.filter((s) => s.role !== 'alignment').map((s) => s.objectId));
      expect(new Set(objects).size).toBe(objects.length);
    });
  }

  it('generated profiles (hexagonal field without gaps, strip with two gaps) with a shipped one pass the checker', () => {
    const [hex, strip] = generatedProfiles();
    const c = solveMixed({ seed: 'gen', candidates: 1800, galaxy, fieldHalfSizeRe: 14, alignmentStars: 400 }, [{ profile: strip, masks: 1 }, { profile: hex, masks: 1 }, { profile: shippedProfile('quad8-square'), masks: 1 }]);
    expect(c.solution.problems).toEqual([]);
    expect(violationsOf(c)).toEqual([]);
    expect(new Set(c.solution.masks.map((m) => m.mask.instrument))).toEqual(new Set(['gen-strip8', 'gen-hex4', 'quad8-square']));
  });

  it('the checker does fail a mask checked against the other profile (the per-mask check is not vacuous)', () => {
    const c = solveMixed({ seed: 'swap', candidates: 1200, galaxy, fieldHalfSizeRe: 14, alignmentStars: 400 }, [{ profile: shippedProfile('ridge10-narrow'), masks: 1 }, { profile: shippedProfile('broad65-wide'), masks: 1 }]);
    expect(violationsOf(c)).toEqual([]);
    for (const m of c.solution.masks) m.mask.instrument = m.mask.instrument === 'ridge10-narrow' ? 'broad65-wide' : 'ridge10-narrow';
    const rules = new Set(violationsOf(c).map((v) => v.rule));
    expect(rules.has('footprint') || rules.has('minimal length') || rules.has('alignment box')).toBe(true);
  });

  it('with identical profiles, a mixed plan places exactly the slits of the same plan with one instrument', () => {
    // The per-mask machinery must not change anything when the profiles agree (same numbers under two ids): the value
    // factor is then the same on both masks (near 1 with a tiny target S/N). Starlight off: the mixed stage places
    // starlight mask by mask, the single-profile stage all masks at once.
    const p = shippedProfile('quad8-square');
    const twin = { ...p, id: 'quad8-twin' };
    const mixed = solveMixed({ seed: 'twin', candidates: 1500, galaxy, fieldHalfSizeRe: 14, alignmentStars: 400 }, [{ profile: p, masks: 1 }, { profile: twin, masks: 1 }], { search: { enabled: false }, observing: { targetSnPerA: 0.001 }, goals: { masks: 2, tracerReachRe: 10, starlightReachRe: 0, linesA: [8498.0, 8542.1, 8662.1] } });
    const single = solveMixed({ seed: 'twin', candidates: 1500, galaxy, fieldHalfSizeRe: 14, alignmentStars: 400 }, [{ profile: p, masks: 2 }], { search: { enabled: false }, goals: { masks: 2, tracerReachRe: 10, starlightReachRe: 0, linesA: [8498.0, 8542.1, 8662.1] } });
    const rows = (c: typeof mixed) => c.solution.masks.flatMap((m) => m.slits.map((s) => `${m.mask.id} ${s.role} ${s.objectId} ${s.yArcsec.toFixed(6)}`));
    expect(rows(mixed)).toEqual(rows(single));
    expect(rows(mixed).filter((r) => r.includes(' tracer ')).length).toBeGreaterThan(50);
  });
});
