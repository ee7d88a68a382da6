/**
 * The catalog as flat arrays for fast drawing and picking: every target projected once onto the
 * sky frame (tangent plane about the galaxy centre; xi East, eta North, arcsec) with its draw class.
 */
import type { Target } from '../../core/catalog/types';
import { skyToTangentArcsec, tangentCentre } from '../../core/sky/tangentPlane';
import { SHADE_STEPS } from './palette';

/** How a target is drawn: 0 tracer, 1 alignment star, 2 excluded (weight 0 or forced out). */
export const KIND_TRACER = 0;
export const KIND_ALIGNMENT = 1;
export const KIND_EXCLUDED = 2;

export interface CatalogGeometry {
  count: number;
  xiArcsec: Float64Array;
  etaArcsec: Float64Array;
  /** Marker radius in px at the reference zoom, larger for brighter targets. */
  radiusPx: Float32Array;
  kind: Uint8Array;
  /** Weight shade bucket 0..SHADE_STEPS-1 (tracers only). */
  shade: Uint8Array;
  ids: string[];
}

/** Marker radius in px from magnitude: brightest 3.6 px, faintest 0.9 px, linear in magnitude between. */
export function markerRadiusPx(mag: number, magBright: number, magFaint: number): number {
  if (!(magFaint > magBright)) return 2.5;
  const t = (magFaint - mag) / (magFaint - magBright);
  return 0.9 + 2.7 * Math.max(0, Math.min(1, t));
}

/**
 * Project targets about the galaxy centre (ICRS degrees) and classify them. `weightOf` gives each
 * target's weight (null when unknown); weights are shaded relative to the largest one.
 */
export function buildCatalogGeometry(
  targets: readonly Target[], galaxyRaDeg: number, galaxyDecDeg: number,
  weightOf: (t: Target, index: number) => number | null,
): CatalogGeometry {
  const n = targets.length;
  const centre = tangentCentre(galaxyRaDeg, galaxyDecDeg);
  const g: CatalogGeometry = {
    count: n, xiArcsec: new Float64Array(n), etaArcsec: new Float64Array(n), radiusPx: new Float32Array(n),
    kind: new Uint8Array(n), shade: new Uint8Array(n), ids: new Array(n),
  };
  const mags = targets.map((t) => t.mag).filter(Number.isFinite).sort((a, b) => a - b);
  const magBright = mags[Math.floor(mags.length * 0.02)] ?? 18;
  const magFaint = mags[Math.floor(mags.length * 0.98)] ?? 24;
  const weights = targets.map((t, i) => weightOf(t, i));
  let maxW = 0;
  for (const w of weights) if (w !== null && w > maxW) maxW = w;
  for (let i = 0; i < n; i++) {
    const t = targets[i];
    const p = skyToTangentArcsec(centre, t.raDeg, t.decDeg);
    g.xiArcsec[i] = p ? p.xiArcsec : NaN;
    g.etaArcsec[i] = p ? p.etaArcsec : NaN;
    g.radiusPx[i] = markerRadiusPx(t.mag, magBright, magFaint);
    g.ids[i] = t.id;
    const w = weights[i];
    if (t.role === 'alignment') g.kind[i] = KIND_ALIGNMENT;
    else if (w !== null && w <= 0) g.kind[i] = KIND_EXCLUDED;
    else g.kind[i] = KIND_TRACER;
    const w01 = w === null || maxW <= 0 ? 0.6 : w / maxW;
    g.shade[i] = Math.min(SHADE_STEPS - 1, Math.floor(w01 * SHADE_STEPS));
  }
  return g;
}

/** Index of the target nearest to sky point (xi, eta) within `maxArcsec`, or -1. */
export function nearestTarget(g: CatalogGeometry, xiArcsec: number, etaArcsec: number, maxArcsec: number): number {
  let best = -1;
  let bestD2 = maxArcsec * maxArcsec;
  for (let i = 0; i < g.count; i++) {
    const dx = g.xiArcsec[i] - xiArcsec, dy = g.etaArcsec[i] - etaArcsec;
    const d2 = dx * dx + dy * dy;
    if (d2 <= bestD2) { bestD2 = d2; best = i; }
  }
  return best;
}

/** Indices of targets inside the sky-frame box spanned by two corners (arcsec). */
export function targetsInBox(g: CatalogGeometry, xi0: number, eta0: number, xi1: number, eta1: number): number[] {
  const [xa, xb] = xi0 < xi1 ? [xi0, xi1] : [xi1, xi0];
  const [ya, yb] = eta0 < eta1 ? [eta0, eta1] : [eta1, eta0];
  const out: number[] = [];
  for (let i = 0; i < g.count; i++) {
    const x = g.xiArcsec[i], y = g.etaArcsec[i];
    if (x >= xa && x <= xb && y >= ya && y <= yb) out.push(i);
  }
  return out;
}
