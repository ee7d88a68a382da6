import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEFAULT_LINE_WINDOW, detectorPixel, lineWindowSettings, linesUsableAtX, observedLineWindowsA, observedWavelengthA, pixelUsable, SPEED_OF_LIGHT_KMS, usableXIntervalsArcsec, usableXIntervalsForWindowsArcsec, windowsUsableAtX } from '../../src/core/profile/wavelength';

const detector = { pixels: 4096, dispersionAPerPixel: 0.4, centralWavelengthA: 8500, xArcsecPerPixel: 0.16, gapsPixels: [[2040, 2100]] as [number, number][], edgeMarginPixels: 15 };

describe('wavelength rule (contract: p = pixels/2 + x/xArcsecPerPixel + (L - centralWavelengthA)/dispersionAPerPixel)', () => {
  it('redshifts by (1 + v/c) with c = 299792.458 km/s (SI definition)', () => {
    expect(SPEED_OF_LIGHT_KMS).toBe(299792.458);
    // 1500 km/s: 8542.1 * (1 + 1500/299792.458) = 8584.840... (computed by hand: 8542.1 * 0.0050035 = 42.740)
    expect(observedWavelengthA(8542.1, 1500)).toBeCloseTo(8542.1 + (8542.1 * 1500) / 299792.458, 10);
    expect(observedWavelengthA(8542.1, 1500)).toBeCloseTo(8584.840, 2);
    expect(observedWavelengthA(8000, 0)).toBe(8000);
  });

  it('puts the central wavelength of a slit at x = 0 on the middle pixel, and moves 1 pixel per xArcsecPerPixel', () => {
    expect(detectorPixel(detector, 0, 8500)).toBe(2048);
    expect(detectorPixel(detector, 0.16, 8500)).toBeCloseTo(2049, 12);
    expect(detectorPixel(detector, 0, 8500.4)).toBeCloseTo(2049, 9);
  });

  it('honours the edge margins and keeps lines at least the margin away from the gap', () => {
    expect(pixelUsable(detector, 15)).toBe(true);
    expect(pixelUsable(detector, 14.9)).toBe(false);
    expect(pixelUsable(detector, 4081)).toBe(true);
    expect(pixelUsable(detector, 4081.1)).toBe(false);
    expect(pixelUsable(detector, 2025)).toBe(true); // 2040 - 15
    expect(pixelUsable(detector, 2025.1)).toBe(false);
    expect(pixelUsable(detector, 2070)).toBe(false);
    expect(pixelUsable(detector, 2115)).toBe(true); // 2100 + 15
  });

  it('the usable x intervals agree with the rule applied line by line at random x (property)', () => {
    const lines = [8498.0, 8542.1, 8662.1].map((l) => observedWavelengthA(l, 1200));
    const iv = usableXIntervalsArcsec(detector, lines);
    expect(iv.length).toBeGreaterThan(0);
    fc.assert(fc.property(fc.double({ min: -400, max: 400, noNaN: true }), (x) => {
      const inIv = iv.some(([a, b]) => x >= a && x <= b);
      return inIv === linesUsableAtX(detector, x, lines);
    }), { numRuns: 5000 });
  });
});

describe('wavelength rule over the velocity range and line windows (contract revision 2)', () => {
  const c = 299792.458; // speed of light, SI definition
  const goalsWindow = { velocityHalfRangeKms: 500, lineHalfWindowA: 10 };

  it('defaults to +-500 km/s and +-10 A, and both 0 gives the bare rule', () => {
    expect(lineWindowSettings({})).toEqual(DEFAULT_LINE_WINDOW);
    expect(DEFAULT_LINE_WINDOW).toEqual({ velocityHalfRangeKms: 500, lineHalfWindowA: 10 });
    expect(lineWindowSettings({ velocityHalfRangeKms: 0, lineHalfWindowA: 0 })).toEqual({ velocityHalfRangeKms: 0, lineHalfWindowA: 0 });
    const lines = [8498.0, 8542.1, 8662.1];
    const bare = usableXIntervalsForWindowsArcsec(detector, observedLineWindowsA(lines, 1200, { velocityHalfRangeKms: 0, lineHalfWindowA: 0 }));
    const old = usableXIntervalsArcsec(detector, lines.map((l) => observedWavelengthA(l, 1200)));
    expect(bare.length).toBe(old.length);
    bare.forEach(([a, b], i) => { expect(a).toBeCloseTo(old[i][0], 9); expect(b).toBeCloseTo(old[i][1], 9); });
  });

  it('the observed window of 8542.1 A at v_sys = 1180 +- 500 km/s, +-10 A (computed by hand from the contract)', () => {
    // 8542.1 (1 + 680/299792.458) - 10 = 8542.1 + 19.3755 - 10 = 8551.4755; 8542.1 (1 + 1680/c) + 10 = 8599.9688
    const [w] = observedLineWindowsA([8542.1], 1180, goalsWindow);
    expect(w.loA).toBeCloseTo(8551.4755, 3);
    expect(w.hiA).toBeCloseTo(8599.9688, 3);
    expect(w.loA).toBeCloseTo(8542.1 * (1 + 680 / c) - 10, 9);
  });

  it('the window intervals agree with the bare rule applied at every velocity and offset of the window (independent route, property)', () => {
    // The bare per-pixel rule (pixelUsable) sampled over dv in [-500, 500] km/s and offsets in [-10, 10] A: the
    // window's pixels are dense enough (< 1 pixel apart) that a sample falls in any gap band (>= 2 margins wide).
    const lines = [8498.0, 8542.1, 8662.1];
    const vsys = 1200;
    const iv = usableXIntervalsForWindowsArcsec(detector, observedLineWindowsA(lines, vsys, goalsWindow));
    expect(iv.length).toBeGreaterThan(0);
    const samples: number[] = [];
    for (const l of lines) for (let dv = -500; dv <= 500; dv += 10) for (let off = -10; off <= 10; off += 0.25) samples.push(observedWavelengthA(l, vsys + dv) + off);
    // The extreme ends are sampled exactly.
    for (const l of lines) samples.push(observedWavelengthA(l, vsys - 500) - 10, observedWavelengthA(l, vsys + 500) + 10);
    fc.assert(fc.property(fc.double({ min: -400, max: 400, noNaN: true }), (x) => {
      const inIv = iv.some(([a, b]) => x >= a && x <= b);
      const brute = samples.every((L) => pixelUsable(detector, detectorPixel(detector, x, L)));
      const windows = windowsUsableAtX(detector, x, observedLineWindowsA(lines, vsys, goalsWindow));
      return inIv === brute && windows === brute;
    }), { numRuns: 3000 });
  });

  it('a line that misses the gap at v_sys but whose +-500 km/s range reaches it is refused', () => {
    // Choose x so 8542.1 A at v_sys lands 20 px beyond the gap's far edge (2100 + 15 margin + 5): usable bare, but
    // -500 km/s moves it by 8542.1 * 500 / c / 0.4 = 35.6 px towards the gap.
    const vsys = 1200;
    const L = observedWavelengthA(8542.1, vsys);
    const x = (2120 - detector.pixels / 2 - (L - detector.centralWavelengthA) / detector.dispersionAPerPixel) * detector.xArcsecPerPixel;
    expect(detectorPixel(detector, x, L)).toBeCloseTo(2120, 9);
    expect(linesUsableAtX(detector, x, [L])).toBe(true);
    expect(windowsUsableAtX(detector, x, observedLineWindowsA([8542.1], vsys, goalsWindow))).toBe(false);
    expect(windowsUsableAtX(detector, x, observedLineWindowsA([8542.1], vsys, { velocityHalfRangeKms: 0, lineHalfWindowA: 0 }))).toBe(true);
  });
});
