/**
 * The catalog layer of the sky view: the page's catalog canvas holds a raster of the catalog for an area twice the
 * view's size (half a view of margin on each side), made by rasterCatalog, and a CSS transform places it under the view
 * camera. A pan or zoom only changes that transform (the compositor moves and scales the bitmap; no pixel is drawn on
 * the main thread). The raster is made again when a pan leaves the margin or a zoom goes beyond 0.45-2.5 times the
 * rastered scale (the area check first), shortly after the motion stops (so the picture at rest is exactly a raster for the view), or when what
 * it shows changes (catalog, selection, slits). The pixel buffer is kept between rasters.
 */
import type { Camera } from './camera';
import type { CatalogGeometry } from './catalogGeometry';
import { rasterCatalog } from './rasterCatalog';

interface Rendered { cam: Camera; inputs: readonly unknown[] }

/** CSS placement of content rendered for `rendered` so that it shows camera `view`: translate then scale. */
export function cssPlacement(rendered: Camera, view: Camera): { dx: number; dy: number; k: number; covers: boolean } {
  const k = view.pxPerArcsec / rendered.pxPerArcsec;
  const dx = view.widthPx / 2 - (rendered.centreXiArcsec - view.centreXiArcsec) * view.pxPerArcsec - (rendered.widthPx / 2) * k;
  const dy = view.heightPx / 2 - (rendered.centreEtaArcsec - view.centreEtaArcsec) * view.pxPerArcsec - (rendered.heightPx / 2) * k;
  const covers = dx <= 0.5 && dy <= 0.5 && dx + rendered.widthPx * k >= view.widthPx - 0.5 && dy + rendered.heightPx * k >= view.heightPx - 0.5 && k > 0.45 && k < 2.5;
  return { dx, dy, k, covers };
}

/** The raster's camera for view camera `view`: the same centre and scale, twice the width and height. */
export function rasterCamera(view: Camera): Camera {
  return { ...view, widthPx: view.widthPx * 2, heightPx: view.heightPx * 2 };
}

/** True when a raster made for `rendered` shows `view` pixel for pixel (same scale, and the same camera as a fresh raster). */
function atRest(rendered: Camera, view: Camera): boolean {
  const fresh = rasterCamera(view);
  return rendered.pxPerArcsec === fresh.pxPerArcsec && rendered.centreXiArcsec === fresh.centreXiArcsec
    && rendered.centreEtaArcsec === fresh.centreEtaArcsec && rendered.widthPx === fresh.widthPx && rendered.heightPx === fresh.heightPx;
}

export class CatalogLayer {
  private rendered: Rendered | null = null;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private data: { g: CatalogGeometry | null; selected: ReadonlySet<number>; onSlit: Uint8Array | null } = { g: null, selected: new Set(), onSlit: null };
  private view: Camera | null = null;
  private image: ImageData | null = null;
  /** Full rasters made (for the benchmark). */
  renders = 0;

  constructor(private readonly canvas: HTMLCanvasElement, private readonly settleMs = 140) {
    canvas.style.transformOrigin = '0 0';
  }

  setData(g: CatalogGeometry | null, selected: ReadonlySet<number>, onSlit: Uint8Array | null): void {
    this.data = { g, selected, onSlit };
    if (this.view) this.show(this.view);
  }

  /** Show the catalog for view camera `view`. */
  show(view: Camera): void {
    this.view = view;
    const { g, selected, onSlit } = this.data;
    if (!g) {
      this.rendered = null;
      this.canvas.style.visibility = 'hidden';
      return;
    }
    const inputs = [g, selected, onSlit, view.widthPx, view.heightPx];
    let r = this.rendered;
    let place = r && r.inputs.every((v, i) => v === inputs[i]) ? cssPlacement(r.cam, view) : null;
    if (!place || !place.covers) {
      r = this.raster(view, inputs);
      place = cssPlacement(r.cam, view);
    }
    if (!atRest(r!.cam, view)) this.scheduleSettle();
    this.canvas.style.visibility = '';
    this.canvas.style.transform = `translate(${place.dx}px, ${place.dy}px) scale(${place.k})`;
    // For tests: where the raster's pixel (0, 0) is on the view (CSS px) and its scale there.
    this.canvas.dataset.placement = `${place.dx},${place.dy},${place.k}`;
  }

  private raster(view: Camera, inputs: readonly unknown[]): Rendered {
    const pr = Math.min(2, window.devicePixelRatio || 1);
    const big = rasterCamera(view);
    const w = Math.ceil(big.widthPx * pr), h = Math.ceil(big.heightPx * pr);
    if (this.canvas.width !== w || this.canvas.height !== h) {
      this.canvas.width = w; this.canvas.height = h;
      this.canvas.style.width = `${big.widthPx}px`; this.canvas.style.height = `${big.heightPx}px`;
    }
    const c = this.canvas.getContext('2d')!;
    if (!this.image || this.image.width !== w || this.image.height !== h) this.image = c.createImageData(w, h);
    const px = new Uint32Array(this.image.data.buffer);
    px.fill(0);
    const drawn = rasterCatalog(px, w, h, pr, this.data.g!, big, this.data.selected, this.data.onSlit);
    c.putImageData(this.image, 0, 0);
    this.renders++;
    // For tests and benchmarks: markers in the last raster (the view and half a view around it), and the raster's area.
    this.canvas.dataset.rasterDots = String(drawn);
    this.canvas.dataset.rasterArea = `${big.centreXiArcsec},${big.centreEtaArcsec},${big.widthPx},${big.heightPx},${big.pxPerArcsec}`;
    this.rendered = { cam: big, inputs };
    return this.rendered;
  }

  private scheduleSettle(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => {
      this.timer = null;
      this.rendered = null;
      if (this.view) this.show(this.view);
    }, this.settleMs);
  }

  dispose(): void {
    if (this.timer) clearTimeout(this.timer);
  }
}
