/**
 * Refraction cost of a mask position angle over an hour-angle window: the mean, over the window, of the spread of a
 * star's image across the slits (mask x) between the ends of the science range,
 *   |R(blue) - R(red)| |sin(q - PA)|   (arcsec),
 * with R the refraction at the mask centre's zenith distance and q its parallactic angle (Filippenko 1982, PASP 94,
 * 715: a slit along the parallactic angle, PA = q or q + 180, loses nothing to the spread). Hour angles in hours of
 * the mask centre (positive West), angles in degrees. Meant for the pointing search of free masks: it weighs a PA
 * against the light it loses, so the result is small where the PA follows the parallactic angle through the window.
 */
import { refractionArcsec } from './refraction';
import { parallacticAngleDeg } from './parallactic';
import { altitudeDeg } from './horizon';
import { edlenRefractivity, type AirConditions } from './refractiveIndex';
import { PMath } from '../numeric/portableMath';

export interface PaRefractionInput {
  decDeg: number;
  latDeg: number;
  air: AirConditions;
  /** Science range [blue, red], Angstrom (air). */
  scienceRangeA: [number, number];
  /** Hour-angle window [start, end], hours. */
  windowH: [number, number];
  /** Hour-angle samples over the window (default 9). */
  samples?: number;
}

/** Mean across-slit spread (arcsec) of the science range over the window at mask PA paDeg; Infinity if the centre sets. */
export function paRefractionCostArcsec(paDeg: number, input: PaRefractionInput): number {
  const samples = windowSamples(input);
  if (!samples) return Infinity;
  const { spreadArcsec, qDeg } = samples;
  let sum = 0;
  for (let i = 0; i < spreadArcsec.length; i++) sum += spreadArcsec[i] * Math.abs(PMath.sin(((qDeg[i] - paDeg) * Math.PI) / 180));
  return sum / spreadArcsec.length;
}

/** The spread |R(blue) - R(red)| (arcsec) and parallactic angle (deg) at each sample of the window: independent of the PA. */
interface WindowSamples { spreadArcsec: Float64Array; qDeg: Float64Array }

/**
 * Samples of recent windows, by everything they depend on (the pointing search turns a mask in place many times: its
 * Dec and window stay, only the PA changes). Null when the centre sets within the window.
 */
const sampleCache = new Map<string, WindowSamples | null>();

/** A number's text for a cache key: equal texts for equal numbers only (-0 kept apart from 0). */
const keyOf = (x: number) => (Object.is(x, -0) ? '-0' : String(x));

function windowSamples(input: PaRefractionInput): WindowSamples | null {
  const n = Math.max(2, input.samples ?? 9);
  const [h0, h1] = input.windowH;
  const a = input.air;
  const key = [input.decDeg, input.latDeg, h0, h1, n, input.scienceRangeA[0], input.scienceRangeA[1], a.pressureHPa, a.temperatureC, a.relativeHumidity, a.co2Ppm ?? NaN].map(keyOf).join(' ');
  const hit = sampleCache.get(key);
  if (hit !== undefined) return hit;
  let out: WindowSamples | null = { spreadArcsec: new Float64Array(n), qDeg: new Float64Array(n) };
  // differentialRefractionArcsec at each sample, its refractivity difference (independent of the zenith distance) made once.
  const dRefractivity = edlenRefractivity(input.scienceRangeA[0], input.air) - edlenRefractivity(input.scienceRangeA[1], input.air);
  for (let i = 0; i < n; i++) {
    const haDeg = (h0 + ((h1 - h0) * i) / (n - 1)) * 15;
    const alt = altitudeDeg(haDeg, input.decDeg, input.latDeg);
    if (!(alt > 0)) { out = null; break; }
    out.spreadArcsec[i] = Math.abs(refractionArcsec(90 - alt, dRefractivity));
    out.qDeg[i] = parallacticAngleDeg(haDeg, input.decDeg, input.latDeg);
  }
  if (sampleCache.size >= 512) sampleCache.clear();
  sampleCache.set(key, out);
  return out;
}
