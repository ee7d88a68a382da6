/**
 * Tracer mass estimator of Watkins, Evans & An (2010, MNRAS 406, 264) for line-of-sight velocities and projected
 * radii: M(< r_out) = (C / G) <v_los^2 R^alpha>, C = (alpha + gamma - 2 beta) / I(alpha, beta) r_out^(1 - alpha),
 * I(alpha, beta) = sqrt(pi) Gamma(alpha/2 + 1) / (4 Gamma(alpha/2 + 5/2)) [alpha + 3 - beta (alpha + 2)].
 * alpha: slope of the potential (0 a flat rotation curve, 1 a point mass); beta: velocity anisotropy; gamma: slope of
 * the tracers' 3-D number density. Radii in kpc, velocities km/s about the systemic velocity, masses in solar masses.
 */
import { PMath } from '../numeric/portableMath';
import { lnGamma } from '../sky/sersic';

/** Gravitational constant, kpc (km/s)^2 per solar mass (IAU 2015 nominal solar mass parameter, 1 pc = 3.0857e13 km). */
export const G_KPC_KMS2_PER_MSUN = 4.30092e-6;

/** Projection integral I(alpha, beta) of the line-of-sight estimator. */
export function projectionIntegral(alpha: number, beta: number): number {
  const ratio = PMath.exp(lnGamma(alpha / 2 + 1) - lnGamma(alpha / 2 + 2.5));
  return ((Math.sqrt(Math.PI) * ratio) / 4) * (alpha + 3 - beta * (alpha + 2));
}

/** The estimator's prefactor C (kpc^(1-alpha)) for an outermost projected radius rOutKpc. */
export function tracerMassPrefactor(alpha: number, beta: number, gamma: number, rOutKpc: number): number {
  return ((alpha + gamma - 2 * beta) / projectionIntegral(alpha, beta)) * PMath.pow(rOutKpc, 1 - alpha);
}

/**
 * Mass (solar masses) within the outermost projected radius of the sample: velocities vKms about the systemic
 * velocity, projected radii rKpc, squared measurement errors errSq2 subtracted from v^2 (first n entries).
 */
export function tracerMassMsun(vKms: ArrayLike<number>, rKpc: ArrayLike<number>, errKms2: ArrayLike<number>, alpha: number, beta: number, gamma: number, n = vKms.length): number {
  let rOut = 0, sum = 0;
  for (let i = 0; i < n; i++) {
    rOut = Math.max(rOut, rKpc[i]);
    sum += (vKms[i] * vKms[i] - errKms2[i]) * (alpha === 0 ? 1 : PMath.pow(rKpc[i], alpha));
  }
  return (tracerMassPrefactor(alpha, beta, gamma, rOut) / G_KPC_KMS2_PER_MSUN) * (sum / n);
}

/** Kiloparsecs per arcsecond at distanceMpc (small angles: d x 1 arcsec in radians). */
export function kpcPerArcsec(distanceMpc: number): number {
  return (distanceMpc * 1e3 * Math.PI) / (180 * 3600);
}
