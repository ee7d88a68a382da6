/**
 * `haloweave profile`: a profile checked on its own and drawn. The usable mask-x ranges are checked against a
 * hand-worked example of the interface contract's wavelength rule p = pixels/2 + x/xArcsecPerPixel + (L - Lc)/dispersion
 * (round numbers, worked in the comments); impossible profiles give exit 2 with the reason.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/main';

const dir = mkdtempSync(join(tmpdir(), 'haloweave-profile-check-'));
const SHIPPED = ['ridge10-narrow', 'quad8-square', 'broad65-wide'];

function capture() {
  const out: string[] = [], err: string[] = [];
  return { out, err, io: { out: (t: string) => out.push(t), err: (t: string) => err.push(t) } };
}

/** A round-number profile: 2000 pixels of 1 A and 0.1 arcsec, centred on 8600 A; field 400 x 100 arcsec. */
function roundProfile(change: (p: Record<string, any>) => void = () => {}): string {
  const p: Record<string, any> = {
    id: 'round-test', label: 'round numbers for a worked example',
    telescope: { apertureM: 8 },
    site: { latDeg: -30, lonDeg: -70, elevationM: 2500, pressureHPa: 750, temperatureC: 10, relativeHumidity: 0.2 },
    footprint: [[-200, -50], [200, -50], [200, 50], [-200, 50]],
    slits: { minLengthArcsec: 5, gapArcsec: 0.5, widthArcsec: 1, maxTiltDeg: 30 },
    alignment: { boxSizeArcsec: 4, minCount: 3, magRange: [15, 19] },
    detector: { pixels: 2000, dispersionAPerPixel: 1, centralWavelengthA: 8600, xArcsecPerPixel: 0.1, gapsPixels: [], edgeMarginPixels: 0 },
  };
  change(p);
  const path = join(dir, `${Math.random().toString(36).slice(2)}.json`);
  writeFileSync(path, JSON.stringify(p));
  return path;
}

async function check(args: string[]) {
  const c = capture();
  const code = await main(['profile', ...args], c.io);
  return { code, out: c.out.join('\n'), err: c.err.join('\n') };
}

describe('haloweave profile on usable profiles', () => {
  it('the shipped profiles are usable for the calcium triplet at 1180 km/s, and each drawing shows field, strips and slit', async () => {
    for (const id of SHIPPED) {
      const svg = join(dir, `${id}.svg`);
      const r = await check([id, '--vsys', '1180', '--svg', svg]);
      expect(r.code, r.err).toBe(0);
      expect(r.out).toMatch(new RegExp(`profile ${id} is usable`));
      const text = readFileSync(svg, 'utf8');
      expect(text).toMatch(/^<svg xmlns="http:\/\/www.w3.org\/2000\/svg"/);
      expect(text).toContain('<polygon');
      expect((text.match(/<title>on the detector/g) ?? []).length).toBeGreaterThanOrEqual(3);
      expect(text).toContain('minimal slit');
      expect(text).toContain('alignment box');
    }
  });

  it('hand-worked: one line at the central wavelength covers x from -100 to +100 arcsec, half the field', async () => {
    // p = 1000 + x / 0.1 for L = Lc = 8600 A; usable 0 <= p <= 2000 gives -100 <= x <= 100 arcsec; the field spans 400 arcsec.
    const r = await check([roundProfile(), '--lines', '8600', '--velocity-range', '0', '--line-window', '0']);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toContain('science slits possible at x -100.0 to 100.0 arcsec: 50 %');
  });

  it('hand-worked: a gap [900, 1100] with a 10-pixel margin removes -11 < x < 11 and the ends shrink by 1 arcsec', async () => {
    // Usable pixels [10, 890] and [1110, 1990]; x = (p - 1000) * 0.1 gives [-99, -11] and [11, 99].
    const r = await check([roundProfile((p) => { p.detector.gapsPixels = [[900, 1100]]; p.detector.edgeMarginPixels = 10; }), '--lines', '8600', '--velocity-range', '0', '--line-window', '0']);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toContain('science slits possible at x -99.0 to -11.0, 11.0 to 99.0 arcsec');
  });

  it('hand-worked: a window of +-500 km/s and +-10 A about 8600 A at 0 km/s narrows the range by the window half-width', async () => {
    // 8600 * 500 / 299792.458 = 14.343 A; the window is 8600 -+ 24.343 A = 24.343 pixels = 2.434 arcsec on each side.
    const r = await check([roundProfile(), '--lines', '8600']);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toContain('science slits possible at x -97.6 to 97.6 arcsec');
  });
});

describe('haloweave profile on impossible profiles: exit 2 and the reason', () => {
  it('a degenerate footprint: corners on one line (the loader), or an outline smaller than one slit', async () => {
    const line = await check([roundProfile((p) => { p.footprint = [[-100, 0], [0, 0], [100, 0]]; })]);
    expect(line.code).toBe(2);
    expect(line.err).toMatch(/footprint: the polygon crosses or touches itself/);
    const tiny = await check([roundProfile((p) => { p.footprint = [[0, 0], [3, 0], [0, 2]]; })]);
    expect(tiny.code).toBe(2);
    expect(tiny.err).toMatch(/footprint: the outline encloses 3\.000 square arcsec, less than one minimal slit \(5\.0 x 1\.0 arcsec\)/);
  });

  it('lines never on the detector: the fix names the central wavelength that would centre them', async () => {
    // At 4000 A central, 8600 A lands at p = 1000 + x / 0.1 + 4600: on the 2000 pixels only for x <= -560 arcsec, outside the field.
    const r = await check([roundProfile((p) => { p.detector.centralWavelengthA = 4000; }), '--vsys', '0', '--velocity-range', '0', '--line-window', '0', '--lines', '8600']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/no slit anywhere in the field .* gets them all on the detector/);
    expect(r.err).toMatch(/8600 A would centre the lines/);
  });

  it('a minimum slit longer than the field along the slits', async () => {
    const r = await check([roundProfile((p) => { p.slits.minLengthArcsec = 150; })]);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/minimal slit \(150\.0 arcsec\) is longer than the field along the slits \(100\.0 arcsec/);
  });

  it('an alignment box that fits nowhere, and a schema error by its key', async () => {
    // A 50 arcsec box (inside the loader's range of box sizes) in a field 40 arcsec high.
    const box = await check([roundProfile((p) => { p.alignment.boxSizeArcsec = 50; p.footprint = [[-200, -20], [200, -20], [200, 20], [-200, 20]]; })]);
    expect(box.code).toBe(2);
    expect(box.err).toMatch(/alignment\.boxSizeArcsec: an alignment box of 50\.0 arcsec fits nowhere/);
    const schema = await check([roundProfile((p) => { delete p.detector.pixels; })]);
    expect(schema.code).toBe(2);
    expect(schema.err).toMatch(/detector\.pixels: missing/);
  });

  it('an unknown profile id lists the known ones', async () => {
    const r = await check(['no-such-profile']);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/unknown instrument profile "no-such-profile" \(known: .*quad8-square/);
  });
});
