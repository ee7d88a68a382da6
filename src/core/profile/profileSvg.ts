/**
 * An SVG drawing of an instrument profile in the mask frame (x along the dispersion to the right, y along the slits
 * upwards, arcsec from the mask centre): the footprint, where a science slit gets every line on the detector for a
 * galaxy's velocity (green) and where a line falls off the detector or into a gap (one strip per line, the detector's
 * gaps projected onto mask x), a minimal slit and an alignment box to scale, and a scale bar.
 */
import type { InstrumentProfile } from './schema';
import type { ProfileInspection } from './inspect';
import { windowXIntervalsArcsec, type LineSettings } from './lineWindows';
import { escapeXml } from '../formats/xmlText';
import { intersectIntervals } from './wavelength';

const W = 960;
const PLOT_W = 800;
const PLOT_H = 440;
const LEFT = 110;

/** Parts of [lo, hi] not covered by the intervals (ascending, inside [lo, hi]). */
function complement(intervals: readonly [number, number][], lo: number, hi: number): [number, number][] {
  const out: [number, number][] = [];
  let at = lo;
  for (const [a, b] of intervals) {
    if (a > at) out.push([at, Math.min(a, hi)]);
    at = Math.max(at, b);
  }
  if (at < hi) out.push([at, hi]);
  return out.filter(([a, b]) => b > a);
}

/** A "nice" scale-bar length (arcsec) near a fifth of the field width. */
function scaleBarArcsec(widthArcsec: number): number {
  const target = widthArcsec / 5;
  for (const v of [3600, 1800, 600, 300, 120, 60, 30, 10, 5, 2, 1]) if (v <= target) return v;
  return 1;
}

/** The SVG text of the drawing; the inspection must come from the same profile and line settings. */
export function profileSvg(profile: InstrumentProfile, lines: LineSettings, insp: ProfileInspection): string {
  const b = insp.boundsArcsec;
  const xr = Math.max(b.maxX - b.minX, 1e-6), yr = Math.max(b.maxY - b.minY, 1e-6);
  const s = Math.min(PLOT_W / xr, PLOT_H / yr);
  const stripTop = 70, stripH = 16;
  const top = stripTop + lines.linesA.length * (stripH + 6) + 24;
  const plotH = yr * s;
  const X = (x: number) => LEFT + (x - b.minX) * s;
  const Y = (y: number) => top + (b.maxY - y) * s;
  const n = (v: number) => v.toFixed(1);
  const el: string[] = [];
  el.push(`<rect x="0" y="0" width="100%" height="100%" fill="#ffffff"/>`);
  el.push(`<text x="20" y="28" font-size="17" font-weight="bold">${escapeXml(profile.label)} (${escapeXml(profile.id)})</text>`);
  el.push(`<text x="20" y="50" font-size="13">lines ${lines.linesA.map((l) => l.toFixed(1)).join(', ')} A at ${lines.vsysKms.toFixed(0)} +- ${lines.velocityHalfRangeKms.toFixed(0)} km/s, windows +- ${lines.lineHalfWindowA.toFixed(1)} A; mask frame, arcsec from the mask centre</text>`);
  // One strip per line: where on mask x its window lands usably (green) or falls off the detector or into a gap (grey).
  insp.windowsA.forEach((w, i) => {
    const y = stripTop + i * (stripH + 6);
    const ok = intersectIntervals(windowXIntervalsArcsec(profile.detector, w), [[b.minX, b.maxX]]);
    el.push(`<text x="${LEFT - 8}" y="${n(y + stripH - 3)}" font-size="12" text-anchor="end">${lines.linesA[i].toFixed(1)} A</text>`);
    for (const [a, c] of complement(ok, b.minX, b.maxX)) el.push(`<rect x="${n(X(a))}" y="${y}" width="${n((c - a) * s)}" height="${stripH}" fill="#9e9e9e" fill-opacity="0.7"><title>off the detector or in a gap: x ${n(a)} to ${n(c)} arcsec</title></rect>`);
    for (const [a, c] of ok) el.push(`<rect x="${n(X(a))}" y="${y}" width="${n((c - a) * s)}" height="${stripH}" fill="#1b9e77"><title>on the detector: x ${n(a)} to ${n(c)} arcsec</title></rect>`);
  });
  // Where every line is usable, shaded over the footprint.
  for (const [a, c] of insp.usableXArcsec) el.push(`<rect x="${n(X(a))}" y="${n(top)}" width="${n((c - a) * s)}" height="${n(plotH)}" fill="#1b9e77" fill-opacity="0.18"/>`);
  const pts = profile.footprint.map(([x, y]) => `${n(X(x))},${n(Y(y))}`).join(' ');
  el.push(`<polygon points="${pts}" fill="none" stroke="#222222" stroke-width="2"/>`);
  // Mask axes through the centre, with the slit direction.
  if (b.minX <= 0 && b.maxX >= 0) el.push(`<line x1="${n(X(0))}" y1="${n(top)}" x2="${n(X(0))}" y2="${n(top + plotH)}" stroke="#666666" stroke-dasharray="4 4"/>`);
  if (b.minY <= 0 && b.maxY >= 0) el.push(`<line x1="${LEFT}" y1="${n(Y(0))}" x2="${n(LEFT + xr * s)}" y2="${n(Y(0))}" stroke="#666666" stroke-dasharray="4 4"/>`);
  // A minimal slit and an alignment box at the centre, to scale (drawn at least 2 px so they stay visible).
  const cx = (b.minX + b.maxX) / 2, cy = (b.minY + b.maxY) / 2;
  const sw = Math.max(profile.slits.widthArcsec * s, 2), sl = Math.max(profile.slits.minLengthArcsec * s, 2);
  el.push(`<rect x="${n(X(cx) - sw / 2)}" y="${n(Y(cy) - sl / 2)}" width="${n(sw)}" height="${n(sl)}" fill="#d95f02"><title>minimal slit ${profile.slits.widthArcsec} x ${profile.slits.minLengthArcsec} arcsec</title></rect>`);
  const bs = Math.max(profile.alignment.boxSizeArcsec * s, 2);
  const bx = X(cx) + Math.max(30, 4 * bs);
  el.push(`<rect x="${n(bx - bs / 2)}" y="${n(Y(cy) - bs / 2)}" width="${n(bs)}" height="${n(bs)}" fill="none" stroke="#7570b3" stroke-width="2"><title>alignment box ${profile.alignment.boxSizeArcsec} arcsec</title></rect>`);
  el.push(`<text x="${n(X(cx))}" y="${n(Y(cy) - sl / 2 - 6)}" font-size="11" text-anchor="middle" fill="#d95f02">slit</text>`);
  el.push(`<text x="${n(bx)}" y="${n(Y(cy) - bs / 2 - 6)}" font-size="11" text-anchor="middle" fill="#7570b3">box</text>`);
  // Direction arrows: slits run along y, the dispersion along x.
  const ax = 30, ay = top + plotH;
  el.push(`<defs><marker id="arrow" markerWidth="8" markerHeight="8" refX="7" refY="4" orient="auto"><path d="M0,0 L8,4 L0,8 z" fill="#222222"/></marker></defs>`);
  el.push(`<line x1="${ax}" y1="${n(ay)}" x2="${ax}" y2="${n(ay - 70)}" stroke="#222222" stroke-width="2" marker-end="url(#arrow)"/>`);
  el.push(`<text x="${ax + 6}" y="${n(ay - 74)}" font-size="12">y: along the slits</text>`);
  el.push(`<line x1="${ax}" y1="${n(ay)}" x2="${ax + 70}" y2="${n(ay)}" stroke="#222222" stroke-width="2" marker-end="url(#arrow)"/>`);
  el.push(`<text x="${ax}" y="${n(ay + 18)}" font-size="12">x: dispersion (redder wavelengths on higher pixels)</text>`);
  const bar = scaleBarArcsec(xr);
  const by = ay + 42;
  el.push(`<line x1="${LEFT}" y1="${n(by)}" x2="${n(LEFT + bar * s)}" y2="${n(by)}" stroke="#222222" stroke-width="3"/>`);
  el.push(`<text x="${n(LEFT + bar * s + 8)}" y="${n(by + 4)}" font-size="12">${bar} arcsec</text>`);
  const summary = [
    `field ${n(xr)} x ${n(yr)} arcsec (x ${n(b.minX)} to ${n(b.maxX)}, y ${n(b.minY)} to ${n(b.maxY)}), area ${insp.areaArcmin2.toFixed(2)} square arcmin`,
    `every line usable on ${(100 * insp.usableXFraction).toFixed(0)} % of the field's x range (green); detector ${profile.detector.pixels} pixels, ${profile.detector.gapsPixels.length} gap(s), a slit at x = 0 records ${n(insp.rangeAtCentreA[0])}-${n(insp.rangeAtCentreA[1])} A`,
    ...insp.problems.map((p) => `IMPOSSIBLE: ${p.what}`),
  ];
  summary.forEach((t, i) => el.push(`<text x="20" y="${n(by + 30 + i * 18)}" font-size="12"${t.startsWith('IMPOSSIBLE') ? ' fill="#b00020"' : ''}>${escapeXml(t)}</text>`));
  const h = by + 30 + summary.length * 18 + 10;
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${n(h)}" viewBox="0 0 ${W} ${n(h)}" font-family="sans-serif">\n${el.join('\n')}\n</svg>\n`;
}
