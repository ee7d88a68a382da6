/**
 * The survey calendar as SVG: one panel per telescope, nights across (one column each, local evening dates), hours
 * of the night up (local mean time from the site's longitude, evening at the bottom, morning at the top); the dark
 * window of each night shaded, each scheduled block a rectangle in its galaxy's colour (hover shows galaxy, mask,
 * UTC times and airmass), the Moon's illuminated fraction as a strip of grey squares above each panel, and a legend
 * of galaxies ordered by their first night so it reads in the calendar's order. Readable for 100 galaxies: colours
 * differ in hue by the golden angle and alternate in lightness, and every legend entry carries its masks' count.
 */
import { escapeXml } from '../formats/xmlText';
import { jdOfDateText } from '../observe/night';
import type { SurveySchedule } from './schedule';

const GOLDEN_ANGLE_DEG = 137.508;

/** Colour of the i-th galaxy (0-based): hue by the golden angle, three lightness levels. */
export function galaxyColour(i: number): string {
  const hue = (i * GOLDEN_ANGLE_DEG) % 360;
  const light = [46, 62, 36][i % 3];
  const sat = [78, 70, 85][Math.floor(i / 3) % 3];
  return `hsl(${hue.toFixed(1)}, ${sat}%, ${light}%)`;
}

/** Hours after local mean midnight (negative in the evening) of a JD (UT), for the night of `night` at longitude lonDeg. */
export function localNightHours(jdUt: number, night: string, lonDeg: number): number {
  const midnight = jdOfDateText(night) + 1 - lonDeg / 360;
  return (jdUt - midnight) * 24;
}

const f1 = (v: number) => v.toFixed(1);

/** The calendar SVG text of a schedule (galaxyOrder: ids in the survey's order, for the colours). */
export function calendarSvg(schedule: SurveySchedule, galaxyOrder: readonly string[], title: string): string {
  const colourOf = new Map(galaxyOrder.map((id, i) => [id, galaxyColour(i)]));
  const nNights = schedule.telescopes[0]?.nights.length ?? 0;
  const colW = Math.max(3, Math.min(14, Math.floor(1200 / Math.max(1, nNights))));
  const left = 56, right = 16, top = 40;
  const plotW = colW * nNights;
  const width = left + plotW + right;
  const out: string[] = [];
  let y = top;
  for (const t of schedule.telescopes) {
    const lon = t.site.lonDeg;
    const hours = t.nights.flatMap((n) => (n.darkStartJd !== null && n.darkEndJd !== null ? [localNightHours(n.darkStartJd, n.night, lon), localNightHours(n.darkEndJd, n.night, lon)] : []));
    const h0 = Math.floor(Math.min(-1, ...hours)), h1 = Math.ceil(Math.max(1, ...hours));
    const pxPerH = 28;
    const plotH = (h1 - h0) * pxPerH;
    const moonY = y + 18, plotTop = moonY + colW + 8;
    const yOf = (h: number) => plotTop + (h1 - h) * pxPerH;
    out.push(`<text x="${left}" y="${y + 10}" class="panel">${escapeXml(t.label)} (latitude ${t.site.latDeg.toFixed(2)}, longitude ${t.site.lonDeg.toFixed(2)} deg East)</text>`);
    out.push(`<text x="${left - 6}" y="${moonY + colW - 1}" class="axis" text-anchor="end">Moon</text>`);
    out.push(`<rect x="${left}" y="${plotTop}" width="${plotW}" height="${plotH}" class="day"/>`);
    t.nights.forEach((n, i) => {
      const x = left + i * colW;
      if (n.moonIllumination !== null) {
        const grey = Math.round(40 + 215 * n.moonIllumination);
        out.push(`<rect x="${x}" y="${moonY}" width="${colW}" height="${colW}" fill="rgb(${grey},${grey},${Math.min(255, grey + 10)})"><title>${n.night}: Moon ${(n.moonIllumination * 100).toFixed(0)} % illuminated</title></rect>`);
      }
      if (n.darkStartJd !== null && n.darkEndJd !== null) {
        const a = localNightHours(n.darkStartJd, n.night, lon), b = localNightHours(n.darkEndJd, n.night, lon);
        out.push(`<rect x="${x}" y="${f1(yOf(b))}" width="${colW}" height="${f1((b - a) * pxPerH)}" class="dark"/>`);
      }
      const d = n.night;
      if (d.endsWith('-01') || i === 0) {
        out.push(`<line x1="${x}" y1="${plotTop}" x2="${x}" y2="${plotTop + plotH + 6}" class="month"/>`);
        out.push(`<text x="${x + 2}" y="${plotTop + plotH + 16}" class="axis">${d.slice(0, 7)}</text>`);
      } else if (Number(d.slice(8)) % 7 === 1) out.push(`<line x1="${x}" y1="${plotTop + plotH}" x2="${x}" y2="${plotTop + plotH + 4}" class="tick"/>`);
    });
    for (let h = h0; h <= h1; h++) {
      const clock = ((h % 24) + 24) % 24;
      out.push(`<line x1="${left - 4}" y1="${yOf(h)}" x2="${left + plotW}" y2="${yOf(h)}" class="grid"/>`);
      out.push(`<text x="${left - 6}" y="${yOf(h) + 4}" class="axis" text-anchor="end">${String(clock).padStart(2, '0')}h</text>`);
    }
    const nightIndex = new Map(t.nights.map((n, i) => [n.night, i]));
    for (const b of schedule.blocks.filter((x) => x.telescopeKey === t.key)) {
      const i = nightIndex.get(b.night) ?? 0;
      const a = localNightHours(b.startJd, b.night, lon), e = localNightHours(b.endJd, b.night, lon);
      const tip = `${b.galaxyId} ${b.maskId}: ${b.night}, ${b.startUtc} to ${b.endUtc} UTC, airmass ${b.airmass.map((v) => v.toFixed(2)).join(' / ')}`;
      out.push(`<rect x="${left + i * colW}" y="${f1(yOf(e))}" width="${colW}" height="${f1((e - a) * pxPerH)}" fill="${colourOf.get(b.galaxyId) ?? '#888'}" class="block"><title>${escapeXml(tip)}</title></rect>`);
    }
    out.push(`<text x="14" y="${plotTop + plotH / 2}" class="axis" transform="rotate(-90 14 ${plotTop + plotH / 2})" text-anchor="middle">local mean time</text>`);
    y = plotTop + plotH + 34;
  }
  // Legend: galaxies by their first scheduled night, then those with nothing scheduled.
  const first = new Map<string, number>();
  for (const b of schedule.blocks) if (!first.has(b.galaxyId)) first.set(b.galaxyId, b.startJd);
  const counts = new Map<string, [number, number]>();
  for (const m of schedule.masks) {
    const c = counts.get(m.galaxyId) ?? [0, 0];
    counts.set(m.galaxyId, [c[0] + (m.block ? 1 : 0), c[1] + 1]);
  }
  const legend = [...galaxyOrder].sort((a, b) => (first.get(a) ?? Infinity) - (first.get(b) ?? Infinity) || galaxyOrder.indexOf(a) - galaxyOrder.indexOf(b));
  const colWidth = 230, rowH = 14;
  const perRow = Math.max(1, Math.floor((width - left) / colWidth));
  out.push(`<text x="${left}" y="${y}" class="panel">Galaxies (masks scheduled / masks), in order of their first night</text>`);
  y += 8;
  legend.forEach((id, k) => {
    const x = left + (k % perRow) * colWidth, ly = y + Math.floor(k / perRow) * rowH + rowH;
    const [done, all] = counts.get(id) ?? [0, 0];
    out.push(`<rect x="${x}" y="${ly - 9}" width="10" height="10" fill="${colourOf.get(id) ?? '#888'}"/>`);
    out.push(`<text x="${x + 14}" y="${ly}" class="legend${done < all ? ' short' : ''}">${escapeXml(id)} (${done}/${all})</text>`);
  });
  const height = y + Math.ceil(legend.length / perRow) * rowH + 20;
  const head = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="sans-serif">`,
    '<style>.panel{font-size:13px;font-weight:bold}.axis{font-size:10px;fill:#333}.legend{font-size:11px}.short{fill:#a00}' +
      '.day{fill:#e8e4da}.dark{fill:#1c2440}.block{stroke:#fff;stroke-width:0.4}.grid{stroke:#fff;stroke-opacity:0.25;stroke-width:0.5}' +
      '.month{stroke:#555;stroke-width:0.8}.tick{stroke:#555;stroke-width:0.6}</style>',
    `<rect width="${width}" height="${height}" fill="#fff"/>`,
    `<text x="${left}" y="20" class="panel">${escapeXml(title)}</text>`,
  ];
  return [...head, ...out, '</svg>', ''].join('\n');
}
