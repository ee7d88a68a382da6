/**
 * Sky brightness added by the Moon: Krisciunas & Schaefer 1991, PASP 103, 1033 (V band, nanoLamberts).
 *   X(Z) = (1 - 0.96 sin^2 Z)^(-1/2)                                  (their eq. 3, airmass for scattering)
 *   m_moon = -12.73 + 0.026 |alpha| + 4e-9 alpha^4                    (eq. 20, alpha = phase angle, degrees)
 *   I* = 10^(-0.4 (m_moon + 16.57))                                   (eq. 20)
 *   f(rho) = 10^5.36 (1.06 + cos^2 rho) + 10^(6.15 - rho/40)          (eq. 21, rho >= 10 deg; 6.2e7 / rho^2 below)
 *   B_moon = f(rho) I* 10^(-0.4 k X(Z_moon)) [1 - 10^(-0.4 k X(Z))]   (eq. 15)
 *   V = (20.7233 - ln(B / 34.08)) / 0.92104                           (nL to mag/arcsec^2)
 * Angles in degrees; k is the V-band extinction coefficient (mag per airmass). Below the horizon the Moon adds nothing.
 * At the science wavelength (near 8500 A) the Moon's light is taken as scattered sunlight of colour
 * moonColourVMinusBandMag (V - band, Vega; default the Sun's V - I = 0.70, an approximation: Rayleigh scattering
 * makes moonlit sky bluer, so this somewhat overstates the Moon in the red).
 */
import { PMath } from '../numeric/portableMath';

const DEG = Math.PI / 180;

/** Scattering airmass of K&S 1991 eq. 3 at zenith distance zDeg. */
export function scatteringAirmass(zDeg: number): number {
  const s = PMath.sin(zDeg * DEG);
  return 1 / Math.sqrt(1 - 0.96 * s * s);
}

/** Scattering function f(rho) of K&S 1991 eq. 21, rho = Moon-target separation in degrees. */
export function moonScattering(rhoDeg: number): number {
  if (rhoDeg < 10) return 6.2e7 / (rhoDeg * rhoDeg);
  const c = PMath.cos(rhoDeg * DEG);
  return PMath.pow(10, 5.36) * (1.06 + c * c) + PMath.pow(10, 6.15 - rhoDeg / 40);
}

export interface MoonGeometry {
  /** Lunar phase angle (0 = full, 180 = new), degrees. */
  phaseAngleDeg: number;
  /** Angular separation Moon-target, degrees. */
  separationDeg: number;
  /** Zenith distances of the Moon and of the target, degrees. */
  moonZenithDeg: number;
  targetZenithDeg: number;
  /** V-band extinction, mag per airmass. */
  extinctionV: number;
}

/** Moonlight in the sky at the target, nanoLamberts (K&S 1991 eq. 15); 0 with the Moon below the horizon. */
export function moonSkyNanoLambert(g: MoonGeometry): number {
  if (g.moonZenithDeg >= 90) return 0;
  const a = Math.abs(g.phaseAngleDeg);
  const mMoon = -12.73 + 0.026 * a + 4e-9 * a * a * a * a;
  const iStar = PMath.pow(10, -0.4 * (mMoon + 16.57));
  return moonScattering(g.separationDeg) * iStar * PMath.pow(10, -0.4 * g.extinctionV * scatteringAirmass(g.moonZenithDeg)) * (1 - PMath.pow(10, -0.4 * g.extinctionV * scatteringAirmass(g.targetZenithDeg)));
}

/** nanoLamberts to V mag/arcsec^2 (K&S 1991): V = (20.7233 - ln(B / 34.08)) / 0.92104. */
export function nanoLambertToVMag(bNanoLambert: number): number {
  return (20.7233 - PMath.log(bNanoLambert / 34.08)) / 0.92104;
}

/** Sun's V - I colour (Vega), the default colour of moonlight; an approximation (see the module comment). */
export const SUN_V_MINUS_I_MAG = 0.7;

/**
 * Sky surface brightness (AB mag/arcsec^2 at the science wavelength) with the Moon: the dark sky (AB) plus the Moon's
 * light converted from V as V_moon - (V - band) + (AB - Vega of the band), summed in flux. Unchanged without moonlight.
 */
export function moonlitSkyMagPerArcsec2(darkSkyAbMagPerArcsec2: number, g: MoonGeometry, bandAbMinusVegaMag: number, moonColourVMinusBandMag = SUN_V_MINUS_I_MAG): number {
  const b = moonSkyNanoLambert(g);
  if (!(b > 0)) return darkSkyAbMagPerArcsec2;
  const moonAb = nanoLambertToVMag(b) - moonColourVMinusBandMag + bandAbMinusVegaMag;
  return -2.5 * PMath.log10(PMath.pow(10, -0.4 * darkSkyAbMagPerArcsec2) + PMath.pow(10, -0.4 * moonAb));
}
