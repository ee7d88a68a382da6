/**
 * The catalog layer of the sky view: an off-screen bitmap of the catalog for an area twice the view's
 * size (half a view of margin on each side), rastered by rasterCatalog, and copied (scaled while zooming)
 * onto the visible canvas on every view change. A copy costs a few ms even for 20 000 targets; the bitmap
 * is rastered again only when a pan leaves the margin, shortly after a zoom settles, or when what it shows
 * changes (catalog, selection, slits).
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
  const covers = dx <= 0.5 && dy <= 0.5 && dx + rendered.widthPx * k >= view.widthPx - 0.5 && dy + rendered.heightPx * k >= view.heightPx - 0.5 && k > 0.6 && k < 1.8;
  return { dx, dy, k, covers };
}

export class CatalogLayer {
  private off = document.createElement('canvas');
  private rendered: Rendered | null = null;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private data: { g: CatalogGeometry | null; selected: ReadonlySet<number>; onSlit: Uint8Array | null } = { g: null, selected: new Set(), onSlit: null };
  private view: Camera | null = null;
  /** Full rasters made (for the benchmark). */
  renders = 0;

  constructor(private readonly canvas: HTMLCanvasElement, private readonly settleMs = 140) {}

  setData(g: CatalogGeometry | null, selected: ReadonlySet<number>, onSlit: Uint8Array | null): void {
    this.data = { g, selected, onSlit };
    if (this.view) this.show(this.view);
  }

  /** Show the catalog for view camera `view`. */
  show(view: Camera): void {
    this.view = view;
    const pr = Math.min(2, window.devicePixelRatio || 1);
    const w = Math.ceil(view.widthPx * pr), h = Math.ceil(view.heightPx * pr);
    if (this.canvas.width !== w || this.canvas.height !== h) {
      this.canvas.width = w; this.canvas.height = h;
      this.canvas.style.width = `${view.widthPx}px`; this.canvas.style.height = `${view.heightPx}px`;
    }
    const ctx = this.canvas.getContext('2d')!;
    ctx.setTransform(1, 0, 0, 1, 0, 0);
    ctx.clearRect(0, 0, w, h);
    const { g, selected, onSlit } = this.data;
    if (!g) return;
    const inputs = [g, selected, onSlit, view.widthPx, view.heightPx];
    let r = this.rendered;
    let place = r && r.inputs.every((v, i) => v === inputs[i]) ? cssPlacement(r.cam, view) : null;
    if (!place || !place.covers) {
      r = this.raster(view, inputs, pr);
      place = cssPlacement(r.cam, view);
    }
    if (place.k !== 1) this.scheduleSettle();
    ctx.imageSmoothingEnabled = place.k !== 1;
    ctx.drawImage(this.off, Math.round(place.dx * pr), Math.round(place.dy * pr), this.off.width * place.k, this.off.height * place.k);
  }

  private raster(view: Camera, inputs: readonly unknown[], pr: number): Rendered {
    const big: Camera = { ...view, widthPx: view.widthPx * 2, heightPx: view.heightPx * 2 };
    const w = Math.ceil(big.widthPx * pr), h = Math.ceil(big.heightPx * pr);
    if (this.off.width !== w) this.off.width = w;
    if (this.off.height !== h) this.off.height = h;
    const c = this.off.getContext('2d')!;
    const img = c.createImageData(w, h);
    const drawn = rasterCatalog(new Uint32Array(img.data.buffer), w, h, pr, this.data.g!, big, this.data.selected, this.data.onSlit);
    c.putImageData(img, 0, 0);
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
