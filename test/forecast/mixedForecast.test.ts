/**
 * Forecast of a plan of several spectrographs (examples/mixed: two masks on a 10 m northern profile, two on a 6.5 m
 * southern one): each mask's slits follow their own profile's exposure model, resolution and velocity-error relation,
 * and the nights are counted per site.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { main } from '../../src/cli/main';
import { loadForecastInput } from '../../src/cli/commands/forecast';
import { forecastPlan, type Forecast } from '../../src/core/forecast/forecast';
import { planExposures } from '../../src/core/forecast/planExposures';
import { editorMaskProfiles } from '../../src/editor/io/planProfiles';

const quiet = { out: () => {}, err: () => {} };
let dir: string;
let mixed: Forecast;
let input: ReturnType<typeof loadForecastInput>;
beforeAll(async () => {
  dir = join(mkdtempSync(join(tmpdir(), 'haloweave-mixed-forecast-')), 'out');
  expect(await main(['plan', resolve('examples/mixed/two-telescopes.plan.json'), '--out', dir], quiet)).toBe(0);
  input = loadForecastInput(dir, { from: '2027-03-01', to: '2027-03-20' }, []);
  mixed = forecastPlan({ ...input, trials: 20, seed: 3 });
}, 180_000);

describe('forecast of a mixed plan', () => {
  it('knows every mask\'s own profile from masks.csv', () => {
    const ids = [...input.maskProfiles!.values()].map((p) => p.id);
    expect(new Set(ids)).toEqual(new Set(['ridge10-narrow', 'broad65-wide']));
    expect(input.maskProfiles!.size).toBe(4);
  });

  it('the editor finds the same profile for every mask from the solved plan', () => {
    const editor = editorMaskProfiles(input.plan, input.profile)!;
    expect(editor.size).toBe(4);
    for (const [id, p] of input.maskProfiles!) expect(editor.get(id)!.id).toBe(p.id);
  });

  it('takes each tracer\'s S/N from its own profile\'s exposure model', () => {
    for (const [maskId, profile] of input.maskProfiles!) {
      const own = planExposures(input.plan, profile, input.galaxy, input.masks.filter((m) => m.mask.id === maskId)).exposures[0];
      const tracers = mixed.tracers.filter((t) => t.maskId === maskId);
      expect(tracers.length).toBeGreaterThan(0);
      for (const t of tracers) expect(t.snPerA).toBeCloseTo(own.slits.find((x) => x.slitId === t.slitId)!.snPerA, 9);
    }
  });

  it('gives the coarser spectrograph larger velocity errors at the same S/N (photon bound ~ sigma^(3/2))', () => {
    // ridge10-narrow: 1" slit on 0.1185"/px at 0.33 A/px; broad65-wide: 1" on 0.2"/px at 0.6 A/px. FWHM 2.78 A vs 3.0 A.
    const single = forecastPlan({ ...input, maskProfiles: undefined, trials: 20, seed: 3 });
    const broadMasks = [...input.maskProfiles!].filter(([, p]) => p.id === 'broad65-wide').map(([id]) => id);
    const narrowMasks = [...input.maskProfiles!].filter(([, p]) => p.id === 'ridge10-narrow').map(([id]) => id);
    const pairs = (f: Forecast, masks: string[]) => f.tracers.filter((t) => masks.includes(t.maskId) && t.velocityErrorKms !== null);
    // The first profile's masks are forecast the same either way.
    const a = pairs(mixed, narrowMasks), b = pairs(single, narrowMasks);
    expect(a.length).toBeGreaterThan(0);
    a.forEach((t, i) => expect(t.velocityErrorKms).toBeCloseTo(b[i].velocityErrorKms!, 9));
    // The second profile's masks now use their own resolution: at equal S/N per A the error is larger than with the
    // first profile's finer lines. Compare as error x S/N (the photon part at unit S/N) with the floor removed.
    const floor = mixed.settings.velocityErrors.floorKms;
    const atUnitSn = (t: { velocityErrorKms: number | null; snPerA: number }) => Math.sqrt(t.velocityErrorKms! ** 2 - floor ** 2) * t.snPerA;
    const own = pairs(mixed, broadMasks).filter((t) => t.snPerA > 15), first = pairs(single, broadMasks).filter((t) => t.snPerA > 15);
    expect(own.length).toBeGreaterThan(3);
    const ratio = own.reduce((s, t) => s + atUnitSn(t), 0) / own.length / (first.reduce((s, t) => s + atUnitSn(t), 0) / first.length);
    console.log(`broad65-wide vs ridge10-narrow photon error at unit S/N: ${ratio.toFixed(3)}`);
    // Expected from the photon bound (sigma^(3/2) at fixed equivalent widths): Gaussian sigma = FWHM / 2.3548 with the
    // lines' own 1.5 A and the pixel box (dx^2/12) in quadrature; the calibrated fit-to-bound ratio is the same to ~1 %.
    const total = (fwhmA: number, dxA: number) => Math.sqrt((fwhmA / 2.3548) ** 2 + 1.5 ** 2 + dxA ** 2 / 12);
    const expected = Math.pow(total((1 / 0.2) * 0.6, 0.6) / total((1 / 0.1185) * 0.33, 0.33), 1.5);
    expect(Math.abs(ratio / expected - 1)).toBeLessThan(0.03);
  });

  it('counts nights per site: the two telescopes observe in parallel, the plan needs the longer of the two', () => {
    const sites = mixed.hours.sites!;
    expect(sites).toHaveLength(2);
    expect(sites.map((s) => s.profileIds[0]).sort()).toEqual(['broad65-wide', 'ridge10-narrow']);
    expect(sites[0].hours + sites[1].hours).toBeCloseTo(mixed.hours.total, 9);
    // The northern and southern sites see different nights.
    expect(sites[0].nights.hoursAvailable).not.toBeCloseTo(sites[1].nights.hoursAvailable, 1);
    const needed = sites.map((s) => s.nights.nightsNeeded);
    if (needed.every((n) => n !== null)) expect(mixed.hours.nights!.nightsNeeded).toBe(Math.max(...(needed as number[])));
    else expect(mixed.hours.nights!.nightsNeeded).toBeNull();
  });

  it('uses each spectrograph\'s own observing keys (instruments[].observing): a longer exposure on one telescope only', () => {
    // CCD equation (Howell 2006, section 4.4): S/N = N*t / sqrt(t (N* + n_pix (sky + dark)) + n_pix R^2), so doubling
    // t multiplies S/N by sqrt(2) when read noise is negligible and by up to 2 when it dominates.
    const instruments = input.plan.instruments!.map((e) => (e.profile === 'broad65-wide' ? { ...e, observing: { exposureTimeS: 21600 } } : e));
    const longer = forecastPlan({ ...input, plan: { ...input.plan, instruments }, trials: 20, seed: 3 });
    let compared = 0;
    for (const [maskId, profile] of input.maskProfiles!) {
      const before = new Map(mixed.tracers.filter((t) => t.maskId === maskId).map((t) => [t.slitId, t.snPerA]));
      for (const t of longer.tracers.filter((x) => x.maskId === maskId)) {
        const ratio = t.snPerA / before.get(t.slitId)!;
        if (profile.id === 'broad65-wide') {
          expect(ratio).toBeGreaterThan(Math.SQRT2 - 1e-9);
          expect(ratio).toBeLessThan(2 + 1e-9);
          compared++;
        } else expect(ratio).toBeCloseTo(1, 12);
      }
    }
    expect(compared).toBeGreaterThan(0);
  });

  it('the CLI prints the per-site nights', async () => {
    const out: string[] = [];
    expect(await main(['forecast', dir, '--trials', '10', '--from', '2027-03-01', '--to', '2027-03-20'], { out: (t) => out.push(t), err: () => {} })).toBe(0);
    expect(out.join('\n')).toMatch(/site 28\.10, -112\.70 deg \(ridge10-narrow\)/);
    expect(JSON.parse(readFileSync(join(dir, 'forecast.json'), 'utf8')).hours.sites).toHaveLength(2);
  });
});
