/**
 * Observability and refraction benchmarks: a semester (184 nights at 5-minute steps) of `haloweave sky` rows, and
 * the refraction/hour-angle report of four masks of 100 tracer slits each. Invented site, target and masks.
 */
import { medianMs, printTable } from './harness';
import { nightTable } from '../src/core/observe/night';
import { maskRefractionReport } from '../src/core/observe/maskRefraction';
import { maskToSkyArcsec } from '../src/core/sky/frames';
import { tangentCentre, tangentToSkyDeg } from '../src/core/sky/tangentPlane';
import type { Slit } from '../src/core/geometry/maskSolution';

const SITE = { latDeg: 28.1, lonDeg: -112.7, elevationM: 3100 };
const TARGET = { raDeg: 30, decDeg: 10 };

function mask(id: string, raDeg: number, decDeg: number, paDeg: number, n: number) {
  const c = tangentCentre(raDeg, decDeg);
  const slits: Slit[] = [];
  for (let i = 0; i < n; i++) {
    const x = ((i * 37) % 280) - 140, y = -480 + (i * 960) / n;
    const s = maskToSkyArcsec(x, y, paDeg);
    const p = tangentToSkyDeg(c, s.xiArcsec, s.etaArcsec);
    slits.push({ maskId: id, slitId: `s${i}`, objectId: `o${i}`, role: 'tracer', raDeg: p.raDeg, decDeg: p.decDeg, xArcsec: x, yArcsec: y, lenBelowArcsec: 2, lenAboveArcsec: 2, widthArcsec: 1, tiltDeg: 0, priority: 1, mag: 21 });
  }
  return { mask: { id, raDeg, decDeg, paDeg, locked: true }, slits };
}

export default async function skyBench(): Promise<void> {
  const semester = () => nightTable('2026-10-01', '2027-04-02', TARGET, SITE, { maxAirmass: 2, stepMinutes: 5 });
  const rows = semester();
  const semesterMs = await medianMs(semester, 7);
  const withCurve = await medianMs(() => nightTable('2026-10-01', '2027-04-02', TARGET, SITE, { stepMinutes: 5, includeCurve: true }), 5);
  const polar = await medianMs(() => nightTable('2026-04-01', '2026-10-01', { raDeg: 200, decDeg: 60 }, { latDeg: 78.2, lonDeg: 15.6, elevationM: 20 }), 5);
  const masks = [mask('m1', 30.05, 10.05, 30, 100), mask('m2', 29.95, 10.05, 120, 100), mask('m3', 29.95, 9.95, 210, 100), mask('m4', 30.05, 9.95, 300, 100)];
  const settings = { seeingFwhmArcsec: 0.8, maxLossFraction: 0.1, guideWavelengthA: 6500, scienceRangeA: [7800, 9000] as [number, number], hourAngleRangeH: [-4, 4] as [number, number], hourAngleStepH: 0.25, maxAirmass: 2 };
  const air = { pressureHPa: 690, temperatureC: 2, relativeHumidity: 0.2 };
  const refraction = await medianMs(() => masks.map((m) => maskRefractionReport({ ...m, designHourAngleH: 0, latDeg: SITE.latDeg, air, settings })), 5);
  await printTable('Observability and refraction (observe/)', [
    { name: 'semester: 184 nights at 5-min steps', value: semesterMs, unit: 'ms', goal: 300, lowerIsBetter: true, note: `${rows.length} rows` },
    { name: 'same, with the 5-min altitude/airmass curve kept', value: withCurve, unit: 'ms' },
    { name: 'polar site, 184 nights through summer', value: polar, unit: 'ms' },
    { name: 'refraction report: 4 masks x 100 tracer slits, 33 hour angles + window', value: refraction, unit: 'ms' },
  ]);
}
