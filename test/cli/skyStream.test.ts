/**
 * `haloweave sky --json --curve` is written night by night: the streamed text must be exactly the JSON array of the
 * rows (as JSON.stringify(rows, null, 2) would print it), curves included, also at half-minute steps.
 */
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { FIXTURES, cli } from './runCli';
import { nightTable } from '../../src/core/observe/night';
import { roundedRow, loadPlanAndProfile } from '../../src/cli/commands/sky';

describe('sky --json --curve streamed', () => {
  it('equals the whole array printed at once, 5 nights at half-minute steps', () => {
    const plan = join(FIXTURES, 'small.plan.json');
    const r = cli(['sky', plan, '--from', '2027-03-01', '--to', '2027-03-05', '--json', '--curve', '--step-min', '0.5'], FIXTURES);
    expect(r.code, r.err).toBe(0);
    const { galaxy, profile } = loadPlanAndProfile(plan);
    const site = { latDeg: profile.site.latDeg, lonDeg: profile.site.lonDeg, elevationM: profile.site.elevationM };
    const rows = nightTable('2027-03-01', '2027-03-05', galaxy, site, { maxAirmass: 2, stepMinutes: 0.5, includeCurve: true });
    expect(r.out).toBe(JSON.stringify(rows.map(roundedRow), null, 2) + '\n');
    const parsed = JSON.parse(r.out);
    expect(parsed).toHaveLength(5);
    // A night is sampled every half minute: well over a thousand points each.
    for (const n of parsed) expect(n.curve.length).toBeGreaterThan(1000);
  }, 60_000);
});
