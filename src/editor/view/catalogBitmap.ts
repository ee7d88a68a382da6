/**
 * The catalog layer of the sky view: the page's catalog canvas holds a raster of the catalog for an area twice the
 * view's size (half a view of margin on each side), made by rasterCatalog, and a CSS transform places it under the view
 * camera. A pan or zoom only changes that transform (the compositor moves and scales the bitmap; no pixel is drawn on
 * the main thread). A new raster is asked of a worker (worker/catalogRasterWorker.ts, latest request wins) when a pan
 * leaves the margin or a zoom goes beyond 0.45-2.5 times the rastered scale, and shortly after the motion stops, so the
 * picture at rest is exactly a raster for the view; the old raster stays shown, moved and scaled, until the new one
 * comes. When what it shows changes (catalog, selection, slits, view size) the raster is made at once on the page, so an
 * edit shows in the same frame. Without workers every raster is made on the page.
 */
import type { Camera } from './camera';
import type { CatalogGeometry } from './catalogGeometry';
import { rasterCatalog } from './rasterCatalog';
import type { FromRasterWorker, ToRasterWorker } from '../worker/catalogRasterWorker';

/** The raster on the canvas: its camera and the data version it shows. */
interface Rendered { cam: Camera; version: number }

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

const sameCamera = (a: Camera, b: Camera) => a.pxPerArcsec === b.pxPerArcsec && a.centreXiArcsec === b.centreXiArcsec
  && a.centreEtaArcsec === b.centreEtaArcsec && a.widthPx === b.widthPx && a.heightPx === b.heightPx;

const devicePixels = () => Math.min(2, window.devicePixelRatio || 1);

export class CatalogLayer {
  private rendered: Rendered | null = null;
  private timer: ReturnType<typeof setTimeout> | null = null;
  private data: { g: CatalogGeometry | null; selected: ReadonlySet<number>; onSlit: Uint8Array | null } = { g: null, selected: new Set(), onSlit: null };
  /** Changes with the data and with the view's size: a raster of another version is not shown. */
  private version = 0;
  private size = '';
  private view: Camera | null = null;
  private image: ImageData | null = null;
  private worker: Worker | null = null;
  private sentGeometry: CatalogGeometry | null = null;
  /** A raster asked of the worker and not yet back, and the newest camera waiting for it to come back. */
  private asked: Camera | null = null;
  private waiting: Camera | null = null;
  /** Full rasters made (for the benchmark). */
  renders = 0;

  constructor(private readonly canvas: HTMLCanvasElement, private readonly settleMs = 140) {
    canvas.style.transformOrigin = '0 0';
    // For tests: the layer is reachable from its canvas (compareWithFresh).
    (canvas as HTMLCanvasElement & { catalogLayer?: CatalogLayer }).catalogLayer = this;
    try {
      this.worker = new Worker(new URL('../worker/catalogRasterWorker.ts', import.meta.url), { type: 'module' });
      this.worker.onmessage = (ev: MessageEvent<FromRasterWorker>) => this.received(ev.data);
      this.worker.onerror = () => { this.worker?.terminate(); this.worker = null; this.asked = this.waiting = null; };
    } catch {
      this.worker = null;
    }
  }

  setData(g: CatalogGeometry | null, selected: ReadonlySet<number>, onSlit: Uint8Array | null): void {
    this.data = { g, selected, onSlit };
    this.newVersion();
    if (this.view) this.show(this.view);
  }

  /** A new data version (new data, or a new view size): the worker gets the data it rasters from with it. */
  private newVersion(): void {
    this.version++;
    const { g, selected, onSlit } = this.data;
    if (this.worker && g) {
      const geometry = g !== this.sentGeometry ? { count: g.count, xiArcsec: g.xiArcsec, etaArcsec: g.etaArcsec, radiusPx: g.radiusPx, kind: g.kind, shade: g.shade } : undefined;
      this.sentGeometry = g;
      this.post({ type: 'data', version: this.version, ...(geometry ? { g: geometry } : {}), selected: [...selected], onSlit });
    }
  }

  /** Show the catalog for view camera `view`. */
  show(view: Camera): void {
    this.view = view;
    const { g } = this.data;
    if (!g) {
      this.rendered = null;
      this.canvas.style.visibility = 'hidden';
      return;
    }
    const size = `${view.widthPx}x${view.heightPx}x${devicePixels()}`;
    if (size !== this.size) { this.size = size; this.newVersion(); }
    let r = this.rendered;
    if (!r || r.version !== this.version) {
      r = this.rasterHere(view);
    } else if (!cssPlacement(r.cam, view).covers) {
      if (this.worker) this.ask(rasterCamera(view));
      else r = this.rasterHere(view);
    }
    if (!sameCamera(r.cam, rasterCamera(view))) this.scheduleSettle();
    this.place(r.cam, view);
  }

  private place(cam: Camera, view: Camera): void {
    const p = cssPlacement(cam, view);
    this.canvas.style.visibility = '';
    this.canvas.style.transform = `translate(${p.dx}px, ${p.dy}px) scale(${p.k})`;
    // For tests: where the raster's pixel (0, 0) is on the view (CSS px) and its scale there.
    this.canvas.dataset.placement = `${p.dx},${p.dy},${p.k}`;
  }

  /** Size the canvas for raster camera `big`; its device-pixel size. */
  private sized(big: Camera): { w: number; h: number; pr: number } {
    const pr = devicePixels();
    const w = Math.ceil(big.widthPx * pr), h = Math.ceil(big.heightPx * pr);
    if (this.canvas.width !== w || this.canvas.height !== h) {
      this.canvas.width = w; this.canvas.height = h;
      this.canvas.style.width = `${big.widthPx}px`; this.canvas.style.height = `${big.heightPx}px`;
    }
    return { w, h, pr };
  }

  /** Raster for `view` on the page, now. */
  private rasterHere(view: Camera): Rendered {
    const big = rasterCamera(view);
    const { w, h, pr } = this.sized(big);
    const c = this.canvas.getContext('2d')!;
    if (!this.image || this.image.width !== w || this.image.height !== h) this.image = c.createImageData(w, h);
    const px = new Uint32Array(this.image.data.buffer);
    px.fill(0);
    const drawn = rasterCatalog(px, w, h, pr, this.data.g!, big, this.data.selected, this.data.onSlit);
    c.putImageData(this.image, 0, 0);
    return this.shown(big, drawn, 'page');
  }

  /** Note a raster now on the canvas. */
  private shown(big: Camera, drawn: number, by: 'page' | 'worker'): Rendered {
    this.renders++;
    this.canvas.dataset.rasterBy = by;
    // For tests and benchmarks: markers in the last raster (the view and half a view around it), and the raster's area.
    this.canvas.dataset.rasterDots = String(drawn);
    this.canvas.dataset.rasterArea = `${big.centreXiArcsec},${big.centreEtaArcsec},${big.widthPx},${big.heightPx},${big.pxPerArcsec}`;
    this.rendered = { cam: big, version: this.version };
    return this.rendered;
  }

  /** Ask the worker for a raster of camera `big` (one at a time: a newer camera waits, replacing any older one waiting). */
  private ask(big: Camera): void {
    if (this.asked) {
      if (!sameCamera(this.asked, big)) this.waiting = big;
      return;
    }
    if (this.rendered && this.rendered.version === this.version && sameCamera(this.rendered.cam, big)) return;
    this.asked = big;
    const pr = devicePixels();
    this.post({ type: 'raster', version: this.version, cam: big, w: Math.ceil(big.widthPx * pr), h: Math.ceil(big.heightPx * pr), pr });
  }

  private received(m: FromRasterWorker): void {
    this.asked = null;
    if (m.bitmap && m.version === this.version && this.data.g) {
      this.sized(m.cam);
      const c = this.canvas.getContext('2d')!;
      c.clearRect(0, 0, this.canvas.width, this.canvas.height);
      c.drawImage(m.bitmap, 0, 0);
      this.shown(m.cam, m.drawn, 'worker');
      if (this.view) this.place(m.cam, this.view);
    }
    m.bitmap?.close();
    const next = this.waiting;
    this.waiting = null;
    if (next) this.ask(next);
    else if (this.view && this.rendered && !sameCamera(this.rendered.cam, rasterCamera(this.view))) this.scheduleSettle();
  }

  private post(msg: ToRasterWorker): void {
    this.worker?.postMessage(msg);
  }

  /**
   * The canvas's pixels against a raster made from scratch for the current view (what it must hold at rest): pixels that
   * differ, and pixels painted in the fresh raster. For tests.
   */
  compareWithFresh(): { differing: number; painted: number; first?: string } {
    const { g, selected, onSlit } = this.data;
    if (!g || !this.view) return { differing: 0, painted: 0 };
    const pr = devicePixels();
    const big = rasterCamera(this.view);
    const w = Math.ceil(big.widthPx * pr), h = Math.ceil(big.heightPx * pr);
    const fresh = new Uint32Array(w * h);
    rasterCatalog(fresh, w, h, pr, g, big, selected, onSlit);
    if (this.canvas.width !== w || this.canvas.height !== h) return { differing: w * h, painted: 0 };
    const shown = new Uint32Array(this.canvas.getContext('2d')!.getImageData(0, 0, w, h).data.buffer);
    let differing = 0, painted = 0, first: string | undefined, x0 = w, x1 = -1, y0 = h, y1 = -1;
    for (let k = 0; k < fresh.length; k++) {
      if (fresh[k] !== shown[k]) {
        differing++;
        first ??= `pixel (${k % w}, ${Math.floor(k / w)}): ${shown[k].toString(16)} shown, ${fresh[k].toString(16)} fresh`;
        x0 = Math.min(x0, k % w); x1 = Math.max(x1, k % w); y0 = Math.min(y0, Math.floor(k / w)); y1 = Math.max(y1, Math.floor(k / w));
      }
      if (fresh[k] !== 0) painted++;
    }
    if (first) first += `; differing pixels within x ${x0}-${x1}, y ${y0}-${y1} of ${w} x ${h}; raster by ${this.canvas.dataset.rasterBy}`;
    return { differing, painted, ...(first ? { first } : {}) };
  }

  private scheduleSettle(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => {
      this.timer = null;
      if (!this.view || !this.data.g) return;
      if (this.worker) this.ask(rasterCamera(this.view));
      else { this.rendered = null; this.show(this.view); }
    }, this.settleMs);
  }

  dispose(): void {
    if (this.timer) clearTimeout(this.timer);
    this.worker?.terminate();
    this.worker = null;
  }
}
