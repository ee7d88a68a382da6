import { describe, expect, it } from 'vitest';
import { alignmentBoxFits, eligibilityRules, scienceSlitEligible } from '../../src/core/profile/eligibility';
import { parseProfileText } from '../../src/core/profile/load';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';

const profile = parseProfileText(readFileSync(resolve(__dirname, '../../instrument-profiles/ridge10-narrow.json'), 'utf8'));

describe('eligibility on the notched long-field profile', () => {
  // Footprint: x -150..150, y -500..500 with the corner (95..150, 420..500) cut away and a cut (-150,-420)-(-150,-500)... see the file.
  const rules = eligibilityRules(profile, [8498.0, 8542.1, 8662.1], 1200);
  const xOk = rules.usableXArcsec.map(([a, b]) => (a + b) / 2).find((x) => x > -140 && x < 90)!;

  it('takes a target whose minimal slit and lines fit, and refuses one whose slit would cross the outline', () => {
    expect(xOk).toBeDefined();
    expect(scienceSlitEligible(rules, xOk, 0)).toBe(true);
    const half = profile.slits.minLengthArcsec / 2;
    expect(scienceSlitEligible(rules, xOk, 500 - half)).toBe(true); // touches the top edge
    expect(scienceSlitEligible(rules, xOk, 500 - half + 0.01)).toBe(false);
  });

  it('refuses a target below the notch corner when its slit would reach into the cut', () => {
    // In the cut-away corner region x in (95, 150), the top edge is at y = 420.
    const x = rules.usableXArcsec.map(([a, b]) => [Math.max(a, 100), Math.min(b, 145)]).find(([a, b]) => a < b);
    if (!x) return expect.fail('the profile should have usable x inside the notch region');
    const half = profile.slits.minLengthArcsec / 2;
    expect(scienceSlitEligible(rules, x[0], 420 - half)).toBe(true);
    expect(scienceSlitEligible(rules, x[0], 420 - half + 0.01)).toBe(false);
  });

  it('needs the lines on the detector for science slits only; boxes need only the footprint', () => {
    const xBad = [-149, ...rules.usableXArcsec.flat()].map((v) => v + 0.01).find((x) => x > -149.5 && x < 149.5 && !rules.usableXArcsec.some(([a, b]) => x >= a && x <= b));
    expect(xBad).toBeDefined();
    expect(scienceSlitEligible(rules, xBad!, 0)).toBe(false);
    const h = profile.alignment.boxSizeArcsec / 2;
    expect(alignmentBoxFits(rules, 150 - h, 0)).toBe(true);
    expect(alignmentBoxFits(rules, 150 - h + 0.01, 0)).toBe(false);
  });
});
