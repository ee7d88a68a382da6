/**
 * Before a solve: can any science slit exist at all with this profile and plan? Names the rule that removes every
 * candidate: the redshifted lines off the detector at every x of the field, detector gaps covering every x where
 * they land, or a minimum slit longer than the field. Mask frame arcsec (x along dispersion, y along slits);
 * wavelengths in Angstrom (air); the wavelength rule of profile/wavelength.ts at the lines' observed wavelengths.
 */
import type { InstrumentProfile } from '../profile/schema';
import type { Problem } from '../result';
import { detectorPixel, observedLineWindowsA, observedWavelengthA, usableXIntervalsArcsec, usableXIntervalsForWindowsArcsec, type LineWindowSettings } from '../profile/wavelength';

/** The x and y extents of a footprint (arcsec, mask frame). */
function extents(footprint: readonly (readonly number[])[]): { x0: number; x1: number; y0: number; y1: number } {
  const xs = footprint.map((c) => c[0]), ys = footprint.map((c) => c[1]);
  return { x0: Math.min(...xs), x1: Math.max(...xs), y0: Math.min(...ys), y1: Math.max(...ys) };
}

const overlapsField = (ivs: [number, number][], x0: number, x1: number) => ivs.some(([a, b]) => a <= x1 && b >= x0);

/**
 * Problems that leave no science slit possible anywhere on a mask (empty when some slit may exist). `profileSource`
 * names the profile in messages. `window` (goals.velocityHalfRangeKms, goals.lineHalfWindowA) widens each line into the
 * window that must stay clear of edges and gaps; without it, the bare rule at v_sys.
 */
export function scienceSlitProblems(profile: InstrumentProfile, linesRestA: readonly number[], vsysKms: number, profileSource: string, window?: LineWindowSettings): Problem[] {
  const out: Problem[] = [];
  const f = extents(profile.footprint);
  const fieldY = f.y1 - f.y0;
  if (profile.slits.minLengthArcsec > fieldY) {
    out.push({
      where: `${profileSource}: slits.minLengthArcsec`,
      what: `${profile.slits.minLengthArcsec} arcsec is longer than the field, which spans ${fieldY.toFixed(2)} arcsec along the slits (footprint y from ${f.y0} to ${f.y1}): no slit fits`,
      fix: 'check the profile: slits.minLengthArcsec and the footprint are both in arcsec',
    });
  }
  const det = profile.detector;
  const observed = linesRestA.map((l) => observedWavelengthA(l, vsysKms));
  if (overlapsField(usableXIntervalsArcsec(det, observed), f.x0, f.x1)) {
    if (!window || overlapsField(usableXIntervalsForWindowsArcsec(det, observedLineWindowsA(linesRestA, vsysKms, window)), f.x0, f.x1)) return out;
    out.push({
      where: `${profileSource}: detector`,
      what: `the lines ${linesRestA.join(', ')} A land on the detector at v_sys, but not with their windows (v_sys +- ${window.velocityHalfRangeKms} km/s, +- ${window.lineHalfWindowA} A) clear of the edges and gaps at any x of the field; no science slit is possible`,
      fix: 'lower goals.velocityHalfRangeKms or goals.lineHalfWindowA, or choose a profile (detector.centralWavelengthA) that takes the lines with room around them',
    });
    return out;
  }
  const fix = 'choose a profile (detector.centralWavelengthA) that takes these lines at this velocity, or check goals.linesA and galaxy.vsysKms';
  const noGaps = { ...det, gapsPixels: [] };
  const m = det.edgeMarginPixels;
  const offDetector = observed.map((o, j) => ({ o, rest: linesRestA[j] })).filter(({ o }) => !overlapsField(usableXIntervalsArcsec(noGaps, [o]), f.x0, f.x1));
  for (const { o, rest } of offDetector) {
    const p0 = detectorPixel(det, f.x0, o), p1 = detectorPixel(det, f.x1, o);
    out.push({
      where: `${profileSource}: detector`,
      what: `the line ${rest} A (observed at ${o.toFixed(1)} A for ${vsysKms} km/s) falls off the detector at every x of the field: pixels ${p0.toFixed(0)} to ${p1.toFixed(0)}, while the usable pixels run from ${m} to ${det.pixels - m}; no science slit is possible`,
      fix,
    });
  }
  if (offDetector.length) return out;
  if (!overlapsField(usableXIntervalsArcsec(noGaps, observed), f.x0, f.x1)) {
    out.push({ where: `${profileSource}: detector`, what: `the lines ${linesRestA.join(', ')} A cannot all land on the detector at one x of the field (they span more pixels than the detector's usable ${det.pixels - 2 * m}); no science slit is possible`, fix });
  } else {
    out.push({
      where: `${profileSource}: detector.gapsPixels`,
      what: `the detector gaps ${det.gapsPixels.map(([a, b]) => `[${a}, ${b}]`).join(', ')} with the ${m}-pixel margin cover every x of the field where the lines ${linesRestA.join(', ')} A land on the detector; no science slit is possible`,
      fix: 'check detector.gapsPixels and detector.edgeMarginPixels (pixels along the dispersion), or choose another profile',
    });
  }
  return out;
}
