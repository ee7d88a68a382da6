/**
 * A FITS image as the sky view's backdrop: grey levels from the pixel values with a user-set stretch
 * between two percentiles, placed by its TAN WCS. The placement is the affine map that matches the
 * WCS at the image centre (pixel -> sky -> the view's tangent plane), accurate over a field of tens of
 * arcminutes; canvas row 0 is the top row, FITS row 1 the bottom one.
 */
import type { FitsImage } from '../../core/image/fitsImage';
import { pixelToSkyDeg } from '../../core/image/wcs';
import { skyToTangentArcsec, type TangentCentre } from '../../core/sky/tangentPlane';
import type { Camera } from './camera';
import type { Backdrop } from './backdrop';

export type Stretch = 'linear' | 'sqrt' | 'asinh' | 'log';

export interface Scaling {
  /** Percentiles (0..100) mapped to black and white. */
  lowPct: number;
  highPct: number;
  stretch: Stretch;
  /** 0..1, how strongly the image shows under the overlays. */
  opacity: number;
}

export const DEFAULT_SCALING: Scaling = { lowPct: 5, highPct: 99.5, stretch: 'asinh', opacity: 0.85 };

/** Sorted finite sample of pixel values (at most ~200 000) for percentiles. */
export function pixelSample(data: Float32Array): Float32Array {
  const step = Math.max(1, Math.floor(data.length / 200_000));
  const out: number[] = [];
  for (let i = 0; i < data.length; i += step) if (Number.isFinite(data[i])) out.push(data[i]);
  return Float32Array.from(out).sort();
}

/** Value at percentile p (0..100) of a sorted sample. */
export function percentile(sorted: Float32Array, p: number): number {
  if (!sorted.length) return 0;
  const k = Math.min(sorted.length - 1, Math.max(0, Math.round((p / 100) * (sorted.length - 1))));
  return sorted[k];
}

/** Grey level 0..1 of a value already normalised to 0..1 by the black and white points. */
export function stretchValue(t: number, stretch: Stretch): number {
  const x = Math.max(0, Math.min(1, t));
  if (stretch === 'sqrt') return Math.sqrt(x);
  if (stretch === 'asinh') return Math.asinh(10 * x) / Math.asinh(10);
  if (stretch === 'log') return Math.log10(1 + 999 * x) / 3;
  return x;
}

/** Render the image to a canvas with the scaling (NaN pixels transparent). */
export function renderImage(img: FitsImage, sorted: Float32Array, sc: Scaling): HTMLCanvasElement {
  const lo = percentile(sorted, sc.lowPct), hi = percentile(sorted, Math.max(sc.highPct, sc.lowPct + 0.01));
  const span = hi > lo ? hi - lo : 1;
  const canvas = document.createElement('canvas');
  canvas.width = img.widthPx;
  canvas.height = img.heightPx;
  const ctx = canvas.getContext('2d')!;
  const out = ctx.createImageData(img.widthPx, img.heightPx);
  const lut = new Uint8ClampedArray(1025);
  for (let k = 0; k <= 1024; k++) lut[k] = Math.round(255 * stretchValue(k / 1024, sc.stretch));
  for (let y = 0; y < img.heightPx; y++) {
    const row = img.heightPx - 1 - y; // FITS row y+1 is canvas row heightPx-1-y
    for (let x = 0; x < img.widthPx; x++) {
      const v = img.data[y * img.widthPx + x];
      const o = (row * img.widthPx + x) * 4;
      if (!Number.isFinite(v)) { out.data[o + 3] = 0; continue; }
      const g = lut[Math.max(0, Math.min(1024, Math.round(((v - lo) / span) * 1024)))];
      out.data[o] = g; out.data[o + 1] = g; out.data[o + 2] = Math.min(255, g + 6); out.data[o + 3] = 255;
    }
  }
  ctx.putImageData(out, 0, 0);
  return canvas;
}

/** A backdrop drawing `canvas` (rendered from `img`) where its WCS puts it. */
export function fitsBackdrop(img: FitsImage, canvas: HTMLCanvasElement, opacity: number): Backdrop {
  let cache: { centre: TangentCentre; j: number[] } | null = null;
  return {
    draw(ctx, cam: Camera, centre: TangentCentre) {
      if (!cache || cache.centre !== centre) {
        const x0 = (img.widthPx + 1) / 2, y0 = (img.heightPx + 1) / 2;
        const d = Math.max(1, Math.min(img.widthPx, img.heightPx) / 4);
        const proj = (x: number, y: number) => {
          const s = pixelToSkyDeg(img.wcs, x, y);
          return skyToTangentArcsec(centre, s.raDeg, s.decDeg) ?? { xiArcsec: NaN, etaArcsec: NaN };
        };
        const p0 = proj(x0, y0), px = proj(x0 + d, y0), py = proj(x0, y0 + d);
        cache = { centre, j: [p0.xiArcsec, p0.etaArcsec, (px.xiArcsec - p0.xiArcsec) / d, (px.etaArcsec - p0.etaArcsec) / d, (py.xiArcsec - p0.xiArcsec) / d, (py.etaArcsec - p0.etaArcsec) / d, x0, y0] };
      }
      const [s0xi, s0eta, jxXi, jxEta, jyXi, jyEta, x0, y0] = cache.j;
      if (!Number.isFinite(s0xi)) return;
      const s = cam.pxPerArcsec, H = img.heightPx;
      // Canvas coordinate (u, v) is FITS pixel (u + 0.5, H + 0.5 - v).
      const a = -s * jxXi, c = s * jyXi;
      const b = -s * jxEta, dd = s * jyEta;
      const e = cam.widthPx / 2 - s * (s0xi + jxXi * (0.5 - x0) + jyXi * (H + 0.5 - y0) - cam.centreXiArcsec);
      const f = cam.heightPx / 2 - s * (s0eta + jxEta * (0.5 - x0) + jyEta * (H + 0.5 - y0) - cam.centreEtaArcsec);
      ctx.save();
      ctx.globalAlpha = opacity;
      ctx.transform(a, b, c, dd, e, f);
      ctx.imageSmoothingEnabled = s * Math.hypot(jxXi, jxEta) < 2;
      ctx.drawImage(canvas, 0, 0);
      ctx.restore();
    },
  };
}
