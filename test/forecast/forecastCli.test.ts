/** `haloweave forecast DIR`: forecast.json with the contract keys, the SVG plots, --against, and input errors (exit 2). */
import { beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/main';

function capture() {
  const out: string[] = [], err: string[] = [];
  return { out, err, io: { out: (t: string) => out.push(t), err: (t: string) => err.push(t) } };
}

let dir: string;
beforeAll(async () => {
  dir = join(mkdtempSync(join(tmpdir(), 'haloweave-forecast-')), 'demo');
  expect(await main(['demo', '--out', dir], capture().io)).toBe(0);
}, 120_000);

describe('haloweave forecast', () => {
  it('writes forecast.json with the revision 2 keys, the plots and a summary', async () => {
    const c = capture();
    expect(await main(['forecast', dir, '--trials', '30', '--seed', '9'], c.io)).toBe(0);
    const f = JSON.parse(readFileSync(join(dir, 'forecast.json'), 'utf8'));
    expect(f.format).toBe('haloweave.forecast/1');
    expect(f.trials).toBe(30);
    expect(f.expectedVelocities).toBeGreaterThan(50);
    expect(f.dispersionProfile.length).toBeGreaterThan(2);
    for (const b of f.dispersionProfile) {
      expect(b.toRe).toBeGreaterThan(b.fromRe);
      expect(b.sigmaFracError).toBeGreaterThan(0);
    }
    expect(f.rotation.amplitudeErrorKms).toBeGreaterThan(0);
    expect(f.rotation.kinematicPaErrorDeg).toBeGreaterThan(0);
    expect(f.mass.radiusKpc).toBeGreaterThan(0);
    expect(f.mass.fracError).toBeGreaterThan(0);
    expect(f.starlightBins.length).toBeGreaterThan(0);
    expect(f.hours.perMask).toHaveLength(4);
    expect(f.hours.total).toBeCloseTo(f.hours.perMask.reduce((a: number, b: number) => a + b, 0), 3);
    for (const p of ['forecast-dispersion.svg', 'forecast-rotation.svg', 'forecast-starlight.svg']) expect(readFileSync(join(dir, p), 'utf8')).toMatch(/^<svg[^>]+xmlns/);
    expect(c.out.join('\n')).toMatch(/expected cluster velocities/);
  }, 60_000);

  it('--against prints both folders side by side', async () => {
    const c = capture();
    expect(await main(['forecast', dir, '--trials', '20', '--against', dir], c.io)).toBe(0);
    expect(c.out.join('\n')).toMatch(/Side by side/);
    expect(existsSync(join(dir, 'forecast-dispersion-against.svg'))).toBe(true);
  }, 60_000);

  it('--from/--to: nights of the semester from the observable dark hours', async () => {
    const c = capture();
    expect(await main(['forecast', dir, '--trials', '10', '--from', '2027-03-01', '--to', '2027-03-10', '--json'], c.io)).toBe(0);
    const f = JSON.parse(c.out.join(''));
    expect(f.hours.nights).toMatchObject({ from: '2027-03-01', to: '2027-03-10' });
    expect(f.hours.nights.nightsUsable).toBeGreaterThan(0);
    expect(f.hours.nights.nightsUsable).toBeLessThanOrEqual(10);
    // Either the nights cover the hours, or the ten nights' hours fall short of them.
    if (f.hours.nights.nightsNeeded === null) expect(f.hours.nights.hoursAvailable).toBeLessThan(f.hours.total);
    else expect(f.hours.nights.nightsNeeded).toBeLessThanOrEqual(f.hours.nights.nightsUsable);
  }, 60_000);

  it('bad options and missing folders are input errors (exit 2) naming what to fix', async () => {
    const c = capture();
    expect(await main(['forecast', dir, '--trials', 'many', '--from', '2027-02-01'], c.io)).toBe(2);
    const err = c.err.join('\n');
    expect(err).toMatch(/--trials/);
    expect(err).toMatch(/--to/);
    const d = capture();
    expect(await main(['forecast', join(dir, 'nowhere')], d.io)).toBe(2);
    const before = readFileSync(join(dir, 'forecast.json'), 'utf8');
    const e = capture();
    expect(await main(['forecast', dir, '--trials', '10', '--seed', '77', '--against', join(dir, 'nowhere')], e.io)).toBe(2);
    expect(readFileSync(join(dir, 'forecast.json'), 'utf8')).toBe(before); // nothing written when B cannot be read
    expect(d.err.join('\n')).toMatch(/folder not found/);
    expect(d.err.join('\n')).not.toMatch(/at .*\.ts:/);
  });
});
