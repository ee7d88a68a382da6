/**
 * A continuum-normalised absorption spectrum of Gaussian lines on a pixel grid, and its derivative with respect to
 * the line-of-sight velocity: the model of the velocity calibration (forecast/velocityCalibration.ts). Wavelengths
 * in Angstrom (air), velocities km/s, flux in units of the continuum. Each line is a Gaussian of sigma sigmaA (the
 * instrumental line-spread function, the lines' own width and the pixel box, in quadrature) and depth
 * W / (sqrt(2 pi) sigma), so its equivalent width is W; the lines are taken not to overlap (windows are separate).
 */
import { PMath } from '../numeric/portableMath';
import { SPEED_OF_LIGHT_KMS } from '../profile/wavelength';

/** An absorption line: rest wavelength (Angstrom, air) and equivalent width (Angstrom). */
export interface AbsorptionLine {
  restA: number;
  ewA: number;
}

/**
 * The calcium triplet with equivalent widths typical of old populations (rest air wavelengths 8498.02, 8542.09,
 * 8662.14 A, common practice values; widths 1.2, 3.5, 2.8 A as in the photon-noise check of the project's
 * references, from memory: metal-poor to solar clusters span roughly half to one and a half of these).
 */
export const CALCIUM_TRIPLET: readonly AbsorptionLine[] = [
  { restA: 8498.02, ewA: 1.2 },
  { restA: 8542.09, ewA: 3.5 },
  { restA: 8662.14, ewA: 2.8 },
];

/** A wavelength grid of the pixels inside windows of +-halfWindowA about each line at systemic velocity 0 (pixel centres, Angstrom). */
export interface LineGrid {
  wavelengthA: Float64Array;
  /** Index of the line whose window holds each pixel. */
  lineIndex: Int32Array;
}

/** Pixel centres (Angstrom) at dispersionAPerPixel within +-halfWindowA of each rest line; phaseA shifts the grid (0..1 pixel). */
export function lineWindowGrid(lines: readonly AbsorptionLine[], dispersionAPerPixel: number, halfWindowA: number, phaseA = 0): LineGrid {
  const wl: number[] = [], idx: number[] = [];
  lines.forEach((line, i) => {
    const first = Math.ceil((line.restA - halfWindowA - phaseA) / dispersionAPerPixel);
    const last = Math.floor((line.restA + halfWindowA - phaseA) / dispersionAPerPixel);
    for (let p = first; p <= last; p++) {
      wl.push(p * dispersionAPerPixel + phaseA);
      idx.push(i);
    }
  });
  return { wavelengthA: Float64Array.from(wl), lineIndex: Int32Array.from(idx) };
}

/**
 * Flux of the lines at velocity velocityKms on the grid (into `out`), and, when `dOut` is given, dF/dv per km/s.
 * Line i is centred at restA (1 + v/c); only the line of a pixel's own window contributes.
 */
export function lineSpectrum(grid: LineGrid, lines: readonly AbsorptionLine[], sigmaA: number, velocityKms: number, out: Float64Array, dOut?: Float64Array): void {
  const depthPerEw = 1 / (Math.sqrt(2 * Math.PI) * sigmaA);
  const inv2s2 = 1 / (2 * sigmaA * sigmaA);
  const shift = 1 + velocityKms / SPEED_OF_LIGHT_KMS;
  for (let p = 0; p < grid.wavelengthA.length; p++) {
    const line = lines[grid.lineIndex[p]];
    const x = grid.wavelengthA[p] - line.restA * shift;
    const g = line.ewA * depthPerEw * PMath.exp(-x * x * inv2s2);
    out[p] = 1 - g;
    // dF/dv = dF/dmu * dmu/dv; F = 1 - g(x), x = lambda - mu: dF/dmu = -g x / sigma^2; dmu/dv = restA / c.
    if (dOut) dOut[p] = -g * (x / (sigmaA * sigmaA)) * (line.restA / SPEED_OF_LIGHT_KMS);
  }
}
