/// <reference lib="webworker" />
/**
 * The catalog raster off the main thread: the sky view's catalog layer (view/catalogBitmap.ts) sends the catalog
 * geometry when it changes, the selection and slit marks with every new version, and a raster camera per request; the
 * worker rasters with the page's own rasterCatalog and hands the pixels back as an ImageBitmap (moved, not copied), so a
 * raster made while the view pans or zooms never holds up a frame.
 */
import { rasterCatalog } from '../view/rasterCatalog';
import type { CatalogGeometry } from '../view/catalogGeometry';
import type { Camera } from '../view/camera';

/** The geometry as sent (its positions and marks; the row ids stay on the page). */
export type RasterGeometry = Omit<CatalogGeometry, 'ids'>;

export type ToRasterWorker =
  | { type: 'data'; version: number; g?: RasterGeometry; selected: number[]; onSlit: Uint8Array | null }
  | { type: 'raster'; version: number; cam: Camera; w: number; h: number; pr: number };

/** A raster of `cam` (w x h device pixels) for data `version`, and the markers drawn in it (no bitmap: the data changed meanwhile). */
export interface FromRasterWorker { version: number; cam: Camera; w: number; h: number; bitmap: ImageBitmap | null; drawn: number }

let g: CatalogGeometry | null = null;
let marks: { version: number; selected: Set<number>; onSlit: Uint8Array | null } = { version: -1, selected: new Set(), onSlit: null };

self.onmessage = (ev: MessageEvent<ToRasterWorker>) => {
  const msg = ev.data;
  if (msg.type === 'data') {
    if (msg.g) g = { ...msg.g, ids: [] };
    marks = { version: msg.version, selected: new Set(msg.selected), onSlit: msg.onSlit };
    return;
  }
  const post = (out: FromRasterWorker) => (self as unknown as DedicatedWorkerGlobalScope).postMessage(out, out.bitmap ? [out.bitmap] : []);
  if (!g || msg.version !== marks.version) {
    post({ version: msg.version, cam: msg.cam, w: msg.w, h: msg.h, bitmap: null, drawn: 0 });
    return;
  }
  const image = new ImageData(msg.w, msg.h);
  const drawn = rasterCatalog(new Uint32Array(image.data.buffer), msg.w, msg.h, msg.pr, g, msg.cam, marks.selected, marks.onSlit);
  // No colour management and no premultiplication: the page draws these very pixel values.
  void createImageBitmap(image, { colorSpaceConversion: 'none', premultiplyAlpha: 'none' }).then((bitmap) => post({ version: msg.version, cam: msg.cam, w: msg.w, h: msg.h, bitmap, drawn }));
};
