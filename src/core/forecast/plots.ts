/**
 * SVG plots of a forecast (pure text; the CLI writes them, the editor shows them): the dispersion profile with its
 * 1-sigma band against radius (Re below, kpc above), the rotation curve against position angle with the band of
 * the amplitude error, and the starlight bins in the galaxy frame (major axis to the right) coloured by S/N.
 * An optional second forecast is drawn dashed for comparison.
 */
import { PMath } from '../numeric/portableMath';
import type { Forecast } from './forecast';

const W = 480, H = 300, L = 56, R = 16, T = 34, B = 44;

const esc = (t: string) => t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
const f1 = (v: number | null) => (v === null || !Number.isFinite(v) ? '\u2013' : (Math.round(v * 10) / 10).toString());

/** "Nice" tick values covering [lo, hi] (about n of them). */
export function niceTicks(lo: number, hi: number, n = 5): number[] {
  const span = hi - lo || 1;
  const raw = span / n, mag = PMath.pow(10, Math.floor(PMath.log10(raw)));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + 1e-9 * span; v += step) out.push(Math.round(v / step) * step);
  return out;
}

interface Frame {
  x: (v: number) => number;
  y: (v: number) => number;
  parts: string[];
}

/** Axes, ticks and labels of a plot of [x0, x1] x [y0, y1]. */
function frame(title: string, xLabel: string, yLabel: string, x0: number, x1: number, y0: number, y1: number, xTop?: { label: string; scale: number }): Frame {
  const x = (v: number) => L + ((v - x0) / (x1 - x0 || 1)) * (W - L - R);
  const y = (v: number) => H - B - ((v - y0) / (y1 - y0 || 1)) * (H - T - B);
  const parts = [`<rect x="${L}" y="${T}" width="${W - L - R}" height="${H - T - B}" fill="none" stroke="#444"/>`];
  for (const t of niceTicks(x0, x1)) parts.push(`<line x1="${x(t)}" y1="${H - B}" x2="${x(t)}" y2="${H - B + 4}" stroke="#444"/><text x="${x(t)}" y="${H - B + 16}" text-anchor="middle">${f1(t)}</text>`);
  for (const t of niceTicks(y0, y1)) parts.push(`<line x1="${L - 4}" y1="${y(t)}" x2="${L}" y2="${y(t)}" stroke="#444"/><text x="${L - 6}" y="${y(t) + 4}" text-anchor="end">${f1(t)}</text>`);
  if (xTop) for (const t of niceTicks(x0 * xTop.scale, x1 * xTop.scale)) parts.push(`<line x1="${x(t / xTop.scale)}" y1="${T}" x2="${x(t / xTop.scale)}" y2="${T - 4}" stroke="#444"/><text x="${x(t / xTop.scale)}" y="${T - 6}" text-anchor="middle">${f1(t)}</text>`);
  parts.push(`<text x="${(L + W - R) / 2}" y="${H - 8}" text-anchor="middle">${esc(xLabel)}</text>`);
  parts.push(`<text transform="translate(14 ${(T + H - B) / 2}) rotate(-90)" text-anchor="middle">${esc(yLabel)}</text>`);
  parts.push(`<text x="${L}" y="14" font-weight="bold">${esc(title)}</text>`);
  if (xTop) parts.push(`<text x="${W - R}" y="14" text-anchor="end">${esc(xTop.label)}</text>`);
  return { x, y, parts };
}

const svg = (parts: string[]) =>
  `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif" font-size="11">\n${parts.join('\n')}\n</svg>\n`;

/** Dispersion profile: model sigma per bin with the 1-sigma band (filled), the comparison forecast dashed. */
export function dispersionProfileSvg(f: Forecast, other?: Forecast): string {
  const bins = f.dispersionProfile;
  const all = [...bins, ...(other?.dispersionProfile ?? [])];
  const x1 = Math.max(1, ...all.map((b) => b.toRe));
  const hi = Math.max(10, ...all.map((b) => b.sigmaKms * (1 + (b.sigmaFracError ?? 0))));
  const fr = frame(`Velocity dispersion of the clusters (${f.trials} mocks)`, 'R / Re', 'sigma (km/s)', 0, x1, 0, hi * 1.1, { label: 'kpc', scale: f.kpcPerRe });
  const draw = (list: typeof bins, dashed: boolean, colour: string) => {
    for (const b of list) {
      const e = b.sigmaErrorKms;
      if (e !== null) fr.parts.push(`<rect x="${fr.x(b.fromRe)}" y="${fr.y(b.sigmaKms + e)}" width="${fr.x(b.toRe) - fr.x(b.fromRe)}" height="${fr.y(b.sigmaKms - e) - fr.y(b.sigmaKms + e)}" fill="${dashed ? 'none' : colour}" fill-opacity="0.25" stroke="${colour}"${dashed ? ' stroke-dasharray="4 3"' : ''}/>`);
      fr.parts.push(`<line x1="${fr.x(b.fromRe)}" y1="${fr.y(b.sigmaKms)}" x2="${fr.x(b.toRe)}" y2="${fr.y(b.sigmaKms)}" stroke="${colour}" stroke-width="2"${dashed ? ' stroke-dasharray="4 3"' : ''}/>`);
      // Counts where the bin is wide enough to hold them, else turned upright.
      const cx = (fr.x(b.fromRe) + fr.x(b.toRe)) / 2, wide = fr.x(b.toRe) - fr.x(b.fromRe) > 34;
      if (!dashed) fr.parts.push(wide ? `<text x="${cx}" y="${fr.y(0) - 4}" text-anchor="middle" fill="#555">n=${Math.round(b.n)}</text>` : `<text transform="translate(${cx + 4} ${fr.y(0) - 4}) rotate(-90)" fill="#555">n=${Math.round(b.n)}</text>`);
    }
  };
  draw(bins, false, '#1f5fa8');
  if (other) draw(other.dispersionProfile, true, '#b0451c');
  return svg(fr.parts);
}

/** Rotation curve: v = A cos(PA - PAkin) with the band A +- its error, and a rug of the expected velocities' PAs. */
export function rotationSvg(f: Forecast, other?: Forecast): string {
  const a = f.rotation.amplitudeKms, e = f.rotation.amplitudeErrorKms ?? 0, eShown = f.rotation.amplitudeErrorKms;
  const top = Math.max(20, (a + e) * 1.2, other ? (other.rotation.amplitudeKms + (other.rotation.amplitudeErrorKms ?? 0)) * 1.2 : 0);
  const fr = frame(`Rotation: ${f1(a)} \u00b1 ${f1(eShown)} km/s, kinematic PA ${f1(f.rotation.kinematicPaDeg)} \u00b1 ${f1(f.rotation.kinematicPaErrorDeg)} deg (${f.trials} mocks)`, 'position angle (deg E of N)', 'v - vsys (km/s)', 0, 360, -top, top);
  const curve = (amp: number, pa: number) => {
    const pts: string[] = [];
    for (let p = 0; p <= 360; p += 5) pts.push(`${fr.x(p).toFixed(1)},${fr.y(amp * PMath.cos(((p - pa) * Math.PI) / 180)).toFixed(1)}`);
    return pts;
  };
  const band = [...curve(a + e, f.rotation.kinematicPaDeg), ...curve(Math.max(0, a - e), f.rotation.kinematicPaDeg).reverse()];
  fr.parts.push(`<polygon points="${band.join(' ')}" fill="#1f5fa8" fill-opacity="0.25" stroke="none"/>`);
  fr.parts.push(`<polyline points="${curve(a, f.rotation.kinematicPaDeg).join(' ')}" fill="none" stroke="#1f5fa8" stroke-width="2"/>`);
  if (other) fr.parts.push(`<polyline points="${curve(other.rotation.amplitudeKms, other.rotation.kinematicPaDeg).join(' ')}" fill="none" stroke="#b0451c" stroke-dasharray="4 3"/>`);
  for (const t of f.tracers) if (t.velocityErrorKms !== null) fr.parts.push(`<line x1="${fr.x(t.paDeg).toFixed(1)}" y1="${H - B}" x2="${fr.x(t.paDeg).toFixed(1)}" y2="${H - B - 6}" stroke="#333" stroke-opacity="${t.clusterProbability.toFixed(2)}"/>`);
  return svg(fr.parts);
}

/** Colour of a value 0..1 on a dark-blue to yellow ramp. */
export function rampColour(t: number): string {
  const stops = [[38, 30, 90], [33, 110, 160], [40, 170, 120], [240, 220, 60]];
  const x = Math.min(1, Math.max(0, t)) * (stops.length - 1), i = Math.min(stops.length - 2, Math.floor(x)), u = x - i;
  const c = stops[i].map((v, k) => Math.round(v + (stops[i + 1][k] - v) * u));
  return `rgb(${c[0]},${c[1]},${c[2]})`;
}

/** Starlight bins as annular sectors in the galaxy frame (major axis to the right), coloured by co-added S/N per A. */
export function starlightMapSvg(f: Forecast): string {
  const bins = f.starlightBins;
  const rMax = Math.max(0.5, ...bins.map((b) => b.toRe));
  const snMax = Math.max(1, ...bins.map((b) => b.snPerA));
  const cx = 170, cy = 160, scale = 125 / rMax;
  const parts = [`<text x="10" y="14" font-weight="bold">Starlight bins: co-added S/N per A (galaxy frame, major axis to the right)</text>`];
  const pt = (r: number, deg: number) => `${(cx + r * scale * PMath.cos((deg * Math.PI) / 180)).toFixed(1)},${(cy - r * scale * PMath.sin((deg * Math.PI) / 180)).toFixed(1)}`;
  for (const b of bins) {
    const a0 = b.sectorDeg, a1 = b.sectorDeg + b.sectorWidthDeg;
    const large = b.sectorWidthDeg > 180 ? 1 : 0;
    const d = `M${pt(b.fromRe, a0)} L${pt(b.toRe, a0)} A${b.toRe * scale},${b.toRe * scale} 0 ${large} 0 ${pt(b.toRe, a1)} L${pt(b.fromRe, a1)}` + (b.fromRe > 0 ? ` A${b.fromRe * scale},${b.fromRe * scale} 0 ${large} 1 ${pt(b.fromRe, a0)}` : '') + ' Z';
    parts.push(`<path d="${d}" fill="${rampColour(b.snPerA / snMax)}" stroke="#fff"><title>${b.fromRe}-${b.toRe} Re, sector ${b.sectorDeg}-${a1} deg: ${b.slits} slits, S/N ${f1(b.snPerA)} per A, dV ${b.velocityErrorKms === null ? '--' : f1(b.velocityErrorKms)} km/s</title></path>`);
  }
  // Ring labels along a line 30 deg below the major axis, so neighbouring rings do not overlap.
  for (const r of f.settings.starlightBinsRe.filter((r) => r > 0 && r <= rMax)) parts.push(`<circle cx="${cx}" cy="${cy}" r="${r * scale}" fill="none" stroke="#999" stroke-dasharray="2 3"/><text x="${(cx + r * scale * 0.866 + 2).toFixed(1)}" y="${(cy + r * scale * 0.5 + 4).toFixed(1)}" fill="#555">${r} Re</text>`);
  parts.push(`<line x1="${cx - rMax * scale}" y1="${cy}" x2="${cx + rMax * scale}" y2="${cy}" stroke="#999"/>`);
  for (let i = 0; i <= 4; i++) {
    const y = 260 - i * 45;
    parts.push(`<rect x="330" y="${y - 45}" width="18" height="45" fill="${rampColour(i / 4)}"/><text x="354" y="${y - 19}">${f1((snMax * i) / 4)}</text>`);
  }
  parts.push(`<text x="330" y="282">S/N per A</text>`, `<text x="${cx - rMax * scale}" y="${cy + 12}" fill="#555">major axis (u); +u to the right</text>`, `<text x="${cx + 4}" y="${cy - rMax * scale + 10}" fill="#555">+v</text>`);
  if (!bins.length) parts.push(`<text x="${cx}" y="${cy}" text-anchor="middle">no starlight slits</text>`);
  return svg(parts);
}
