/**
 * An SVG finding chart of one mask for a proposal: the footprint, every slit and box with its id,
 * the galaxy's isophotes at 1, 2, 3 ... Re, North and East arrows and an arcminute scale bar.
 * Drawn as the sky is seen (North up, East left), centred on the mask; positions from the slit's
 * RA/Dec projected about the mask centre (sky frame xi East, eta North, arcsec).
 */
import type { GalaxyModel } from '../../core/plan/schema';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { MaskSolution } from '../../core/geometry/maskSolution';
import { maskToSkyArcsec } from '../../core/sky/frames';
import { skyToTangentArcsec, tangentCentre } from '../../core/sky/tangentPlane';
import { formatDecDms, formatRaHms } from '../../core/sky/sexagesimal';
import { scaleBarArcmin } from '../view/camera';
import { PRINT_ROLE_COLOUR, ROLE_STYLE, ROLES } from '../view/palette';

const esc = (s: string) => s.replace(/[&<>"']/g, (ch) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' })[ch]!);
const f = (v: number) => (Math.round(v * 100) / 100).toString();

/** SVG text of the chart for mask `ms` (width `sizePx`; height follows). */
export function maskChartSvg(ms: MaskSolution, galaxy: GalaxyModel, profile: InstrumentProfile, reachRe: number, sizePx = 900): string {
  const m = ms.mask;
  const corners = profile.footprint.map(([x, y]) => maskToSkyArcsec(x, y, m.paDeg));
  const extent = Math.max(...corners.map((c) => Math.hypot(c.xiArcsec, c.etaArcsec))) * 1.15;
  const plot = sizePx - 40;
  const s = plot / (2 * extent); // px per arcsec
  const ox = sizePx / 2, oy = 70 + plot / 2;
  const height = plot + 150;
  const px = (xi: number, eta: number) => `${f(ox - xi * s)},${f(oy - eta * s)}`;
  const centre = tangentCentre(m.raDeg, m.decDeg);
  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${sizePx}" height="${height}" viewBox="0 0 ${sizePx} ${height}" font-family="Helvetica, Arial, sans-serif">`);
  out.push(`<rect width="100%" height="100%" fill="#ffffff"/>`);
  out.push(`<text x="20" y="28" font-size="20" font-weight="bold">Mask ${esc(m.id)} · ${esc(galaxy.id)}</text>`);
  out.push(`<text x="20" y="50" font-size="13">centre ${esc(formatRaHms(m.raDeg, 2))} ${esc(formatDecDms(m.decDeg, 1))} (ICRS) · PA ${m.paDeg.toFixed(2)}° E of N · ${esc(profile.id)} · ${ms.slits.length} slits and boxes</text>`);
  out.push(`<clipPath id="plot"><rect x="20" y="70" width="${plot}" height="${plot}"/></clipPath>`);
  out.push(`<rect x="20" y="70" width="${plot}" height="${plot}" fill="none" stroke="#999" stroke-width="0.5"/>`);
  // Galaxy isophotes about the galaxy centre, seen from the mask centre.
  const g = skyToTangentArcsec(centre, galaxy.raDeg, galaxy.decDeg);
  if (g) {
    const sq = Math.sqrt(galaxy.axisRatio);
    out.push(`<g class="isophotes" clip-path="url(#plot)" fill="none" stroke="#777" stroke-width="0.8">`);
    const rot = -(90 + galaxy.paDeg);
    for (let k = 1; k <= Math.ceil(reachRe); k++) {
      out.push(`<ellipse class="isophote" data-re="${k}" cx="${f(ox - g.xiArcsec * s)}" cy="${f(oy - g.etaArcsec * s)}" rx="${f((k * galaxy.reArcsec * s) / sq)}" ry="${f(k * galaxy.reArcsec * s * sq)}" transform="rotate(${f(rot)} ${f(ox - g.xiArcsec * s)} ${f(oy - g.etaArcsec * s)})" stroke-dasharray="${k % 5 === 0 ? '' : '3 3'}"/>`);
    }
    out.push(`</g>`);
    out.push(`<circle class="galaxy-centre" cx="${f(ox - g.xiArcsec * s)}" cy="${f(oy - g.etaArcsec * s)}" r="3" fill="#444" clip-path="url(#plot)"/>`);
  }
  out.push(`<polygon class="footprint" points="${corners.map((c) => px(c.xiArcsec, c.etaArcsec)).join(' ')}" fill="none" stroke="#111" stroke-width="1.5"/>`);
  // Slits: from the slit's mask-frame extent, turned by the PA about the mask centre.
  // One group per slit or box, carrying its id and role, with its shape and its label.
  for (const sl of ms.slits) {
    const colour = PRINT_ROLE_COLOUR[sl.role];
    out.push(`<g class="slit slit-${sl.role}" data-slit-id="${esc(sl.slitId)}" data-role="${sl.role}">`);
    if (sl.role === 'alignment') {
      const h = Math.max(sl.widthArcsec / 2, 3 / s);
      const pts = [[-h, -h], [h, -h], [h, h], [-h, h]].map(([dx, dy]) => {
        const p = maskToSkyArcsec(sl.xArcsec + dx, sl.yArcsec + dy, m.paDeg);
        return px(p.xiArcsec, p.etaArcsec);
      });
      out.push(`<polygon points="${pts.join(' ')}" fill="none" stroke="${colour}" stroke-width="1.6"/>`);
    } else {
      const a = maskToSkyArcsec(sl.xArcsec, sl.yArcsec - sl.lenBelowArcsec, m.paDeg);
      const b = maskToSkyArcsec(sl.xArcsec, sl.yArcsec + sl.lenAboveArcsec, m.paDeg);
      const dash = ROLE_STYLE[sl.role].dash.join(' ');
      out.push(`<line x1="${f(ox - a.xiArcsec * s)}" y1="${f(oy - a.etaArcsec * s)}" x2="${f(ox - b.xiArcsec * s)}" y2="${f(oy - b.etaArcsec * s)}" stroke="${colour}" stroke-width="2.2"${dash ? ` stroke-dasharray="${dash}"` : ''}/>`);
    }
    const c = maskToSkyArcsec(sl.xArcsec, sl.yArcsec, m.paDeg);
    out.push(`<text x="${f(ox - c.xiArcsec * s + 4)}" y="${f(oy - c.etaArcsec * s + 3)}" font-size="7" fill="#333">${esc(sl.slitId)}</text>`);
    out.push(`</g>`);
  }
  // Compass (North up, East left) and scale bar.
  const cx = sizePx - 80, cy = 130;
  out.push(`<g class="compass">`);
  out.push(`<g class="arrow-north" stroke="#111" stroke-width="1.6" fill="#111"><line x1="${cx}" y1="${cy}" x2="${cx}" y2="${cy - 40}"/><polygon points="${cx - 5},${cy - 34} ${cx + 5},${cy - 34} ${cx},${cy - 44}"/></g>`);
  out.push(`<g class="arrow-east" stroke="#111" stroke-width="1.6" fill="#111"><line x1="${cx}" y1="${cy}" x2="${cx - 40}" y2="${cy}"/><polygon points="${cx - 34},${cy - 5} ${cx - 34},${cy + 5} ${cx - 44},${cy}"/></g>`);
  out.push(`<text class="label-north" x="${cx - 4}" y="${cy - 50}" font-size="14" font-weight="bold">N</text><text class="label-east" x="${cx - 60}" y="${cy + 5}" font-size="14" font-weight="bold">E</text>`);
  out.push(`</g>`);
  const bar = scaleBarArcmin(s, 160);
  const barPx = bar * 60 * s;
  const by = 70 + plot - 24;
  out.push(`<g class="scale-bar" data-arcmin="${bar}" data-px-per-arcsec="${s}">`);
  out.push(`<rect x="32" y="${by - 22}" width="${f(barPx + 16)}" height="34" fill="#fff" fill-opacity="0.85"/>`);
  out.push(`<line x1="40" y1="${by}" x2="${f(40 + barPx)}" y2="${by}" stroke="#111" stroke-width="2.5"/>`);
  out.push(`<text x="${f(40 + barPx / 2)}" y="${by - 7}" font-size="13" text-anchor="middle">${bar >= 1 ? `${bar} arcmin` : `${Math.round(bar * 60)} arcsec`}</text>`);
  out.push(`</g>`);
  // Legend: colour and line style per role.
  const ly = 70 + plot + 30;
  ROLES.forEach((r, i) => {
    const x = 20 + i * 200;
    const colour = PRINT_ROLE_COLOUR[r];
    const n = ms.slits.filter((sl) => sl.role === r).length;
    if (r === 'alignment') out.push(`<rect x="${x}" y="${ly - 8}" width="10" height="10" fill="none" stroke="${colour}" stroke-width="1.8"/>`);
    else out.push(`<line x1="${x}" y1="${ly - 3}" x2="${x + 24}" y2="${ly - 3}" stroke="${colour}" stroke-width="2.5"${ROLE_STYLE[r].dash.length ? ` stroke-dasharray="${ROLE_STYLE[r].dash.join(' ')}"` : ''}/>`);
    out.push(`<text x="${x + 30}" y="${ly + 1}" font-size="13">${esc(ROLE_STYLE[r].label)} (${n})</text>`);
  });
  out.push(`<text x="20" y="${ly + 26}" font-size="11" fill="#555">Isophotes at 1, 2, 3 … Re (Re = ${galaxy.reArcsec}″, b/a = ${galaxy.axisRatio}, PA ${galaxy.paDeg}°). Illustrative instrument numbers: check the mask with the observatory's own tools before fabrication.</text>`);
  out.push(`</svg>`);
  return out.join('\n');
}
