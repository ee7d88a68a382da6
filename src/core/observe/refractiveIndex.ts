/**
 * Refractivity n - 1 of moist air at a wavelength (Angstrom, in air, as everywhere in Haloweave) for the
 * site's pressure (hPa), temperature (deg C) and relative humidity (0..1).
 * Main formula: Edlén (1953) in the form of Filippenko (1982, PASP 94, 715). Cross-check: Ciddor (1996,
 * Applied Optics 35, 1566), written from the paper's procedure as remembered (constants marked below) and
 * confirmed against Edlén to better than 1 % (test/observe/refractiveIndex.test.ts).
 */
import { PMath } from '../numeric/portableMath';

/** Site air: pressure in hPa, temperature in deg C, relative humidity 0..1, CO2 molar fraction in ppm (Ciddor only). */
export interface AirConditions {
  pressureHPa: number;
  temperatureC: number;
  relativeHumidity: number;
  co2Ppm?: number;
}

/** hPa per mm of mercury (1 mmHg = 133.322 Pa). */
export const HPA_PER_MMHG = 1.33322387415;

/**
 * Saturation vapour pressure of water in Pa at temperature tC (deg C): the CIPM-81/91 formula (Davis 1992)
 * that Ciddor (1996) uses, svp = exp(A T^2 + B T + C + D/T), T in K (constants from memory; gives the
 * textbook 2339 Pa at 20 deg C).
 */
export function saturationVapourPressurePa(temperatureC: number): number {
  const t = temperatureC + 273.15;
  return PMath.exp(1.2378847e-5 * t * t - 1.9121316e-2 * t + 33.93711047 - 6.3431645e3 / t);
}

/** Partial pressure of water vapour in Pa: relative humidity times the saturation pressure. */
export function waterVapourPressurePa(air: AirConditions): number {
  return air.relativeHumidity * saturationVapourPressurePa(air.temperatureC);
}

/** Edlén (1953) refractivity of standard dry air (15 deg C, 760 mmHg) for vacuum wavenumber sigma (1/micron). */
export function edlenStandardRefractivity(sigmaPerUm: number): number {
  const s2 = sigmaPerUm * sigmaPerUm;
  return (64.328 + 29498.1 / (146 - s2) + 255.4 / (41 - s2)) * 1e-6;
}

/** Vacuum wavenumber (1/micron) of an air wavelength in Angstrom, using standard-air Edlén (one iteration suffices). */
export function vacuumWavenumberPerUm(airWavelengthA: number): number {
  const sigmaAir = 1e4 / airWavelengthA;
  const n = 1 + edlenStandardRefractivity(sigmaAir);
  return sigmaAir / n;
}

/**
 * Refractivity n - 1 of moist air by Edlén (1953) as in Filippenko (1982): the standard value times
 * P[1 + (1.049 - 0.0157 T) 1e-6 P] / (720.883 (1 + 0.003661 T)), minus f (0.0624 - 0.000680 sigma^2) / (1 + 0.003661 T) 1e-6,
 * with P and the water vapour pressure f in mmHg and T in deg C.
 */
export function edlenRefractivity(airWavelengthA: number, air: AirConditions): number {
  const sigma = vacuumWavenumberPerUm(airWavelengthA);
  const t = air.temperatureC;
  const pMmHg = air.pressureHPa / HPA_PER_MMHG;
  const fMmHg = waterVapourPressurePa(air) / 100 / HPA_PER_MMHG;
  const dry = edlenStandardRefractivity(sigma) * (pMmHg * (1 + (1.049 - 0.0157 * t) * 1e-6 * pMmHg)) / (720.883 * (1 + 0.003661 * t));
  const wet = (fMmHg * (0.0624 - 0.00068 * sigma * sigma)) / (1 + 0.003661 * t) * 1e-6;
  return dry - wet;
}

// Ciddor (1996) constants, from memory of the paper's Appendix; confirmed only through agreement with Edlén.
const K0 = 238.0185, K1 = 5792105, K2 = 57.362, K3 = 167917;
const W0 = 295.235, W1 = 2.6422, W2 = -0.03238, W3 = 0.004028, CF = 1.022;
const A0 = 1.58123e-6, A1 = -2.9331e-8, A2 = 1.1043e-10, B0 = 5.707e-6, B1 = -2.051e-8, C0 = 1.9898e-4, C1 = -2.376e-6;
const D = 1.83e-11, E = -0.765e-8;
const GAS_R = 8.31451, MW = 0.018015;

/** Compressibility Z of moist air (Ciddor eq. 12, after Davis 1992) at pressure pPa, temperature tC and water fraction xw. */
function compressibility(pPa: number, tC: number, xw: number): number {
  const tK = tC + 273.15;
  const pt = pPa / tK;
  return 1 - pt * (A0 + A1 * tC + A2 * tC * tC + (B0 + B1 * tC) * xw + (C0 + C1 * tC) * xw * xw) + pt * pt * (D + E * xw * xw);
}

/** Density term p M / (Z R T) of Ciddor's procedure for pressure pPa, temperature tC, water fraction xw and molar mass M. */
function molarDensity(pPa: number, tC: number, xw: number): number {
  return pPa / (compressibility(pPa, tC, xw) * GAS_R * (tC + 273.15));
}

/** Refractivity n - 1 of moist air by Ciddor (1996) for an air wavelength (Angstrom) and site conditions. */
export function ciddorRefractivity(airWavelengthA: number, air: AirConditions): number {
  const sigma = vacuumWavenumberPerUm(airWavelengthA);
  const s2 = sigma * sigma;
  const xc = air.co2Ppm ?? 450;
  const nas = (K1 / (K0 - s2) + K3 / (K2 - s2)) * 1e-8;
  const naxs = nas * (1 + 0.534e-6 * (xc - 450));
  const nws = CF * (W0 + W1 * s2 + W2 * s2 * s2 + W3 * s2 * s2 * s2) * 1e-8;
  const ma = 1e-3 * (28.9635 + 12.011e-6 * (xc - 400));
  const pPa = air.pressureHPa * 100;
  const tC = air.temperatureC;
  const enhancement = 1.00062 + 3.14e-8 * pPa + 5.6e-7 * tC * tC;
  const xw = (enhancement * waterVapourPressurePa(air)) / pPa;
  const rhoAxs = ma * molarDensity(101325, 15, 0);
  const rhoWs = MW * molarDensity(1333, 20, 1);
  const m = molarDensity(pPa, tC, xw);
  const rhoA = ma * (1 - xw) * m;
  const rhoW = MW * xw * m;
  return (rhoA / rhoAxs) * naxs + (rhoW / rhoWs) * nws;
}
