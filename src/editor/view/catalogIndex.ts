/**
 * A grid index of the catalog geometry's sky positions (galaxy tangent plane, xi East / eta North, arcsec), so the
 * catalog raster visits only the rows near its area: 64 x 64 cells over the rows' bounding box, each cell listing its
 * rows in catalog order. Built once per geometry (the geometry's arrays are never changed in place).
 */
import type { CatalogGeometry } from './catalogGeometry';

interface GridIndex {
  x0: number; y0: number; cellArcsec: number; n: number; start: Int32Array; rows: Int32Array; all: Int32Array;
  /** One flag per catalog row, all zero between calls (rowsNear's scratch). */
  mark: Uint8Array;
}

const CELLS = 64;
const built = new WeakMap<CatalogGeometry, GridIndex>();

function buildIndex(g: CatalogGeometry): GridIndex {
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (let i = 0; i < g.count; i++) {
    const x = g.xiArcsec[i], y = g.etaArcsec[i];
    if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
    if (x < x0) x0 = x; if (x > x1) x1 = x; if (y < y0) y0 = y; if (y > y1) y1 = y;
  }
  const cellArcsec = Math.max(1e-6, (Math.max(x1 - x0, y1 - y0) || 1) / CELLS) * (1 + 1e-9);
  const cellOf = (i: number) => {
    const x = g.xiArcsec[i], y = g.etaArcsec[i];
    if (!Number.isFinite(x) || !Number.isFinite(y)) return -1;
    return Math.min(CELLS - 1, Math.floor((y - y0) / cellArcsec)) * CELLS + Math.min(CELLS - 1, Math.floor((x - x0) / cellArcsec));
  };
  const start = new Int32Array(CELLS * CELLS + 1);
  for (let i = 0; i < g.count; i++) { const c = cellOf(i); if (c >= 0) start[c + 1]++; }
  for (let c = 0; c < CELLS * CELLS; c++) start[c + 1] += start[c];
  const fill = start.slice(0, CELLS * CELLS), rows = new Int32Array(start[CELLS * CELLS]);
  for (let i = 0; i < g.count; i++) { const c = cellOf(i); if (c >= 0) rows[fill[c]++] = i; }
  const all = new Int32Array(rows.length);
  let k = 0;
  for (let i = 0; i < g.count; i++) if (cellOf(i) >= 0) all[k++] = i;
  return { x0: Number.isFinite(x0) ? x0 : 0, y0: Number.isFinite(y0) ? y0 : 0, cellArcsec, n: CELLS, start, rows, all, mark: new Uint8Array(g.count) };
}

/**
 * Rows of `g` (increasing, so drawing keeps the catalog's order) whose position may lie in the sky rectangle
 * [xiLo, xiHi] x [etaLo, etaHi] (arcsec): every row inside it, and some near it (the caller applies its own cut).
 */
export function rowsNear(g: CatalogGeometry, xiLo: number, xiHi: number, etaLo: number, etaHi: number): Int32Array {
  let ix = built.get(g);
  if (!ix) built.set(g, (ix = buildIndex(g)));
  const { x0, y0, cellArcsec: c, n, start, rows, all } = ix;
  const cx0 = Math.max(0, Math.floor((xiLo - x0) / c)), cx1 = Math.min(n - 1, Math.floor((xiHi - x0) / c));
  const cy0 = Math.max(0, Math.floor((etaLo - y0) / c)), cy1 = Math.min(n - 1, Math.floor((etaHi - y0) / c));
  if (cx0 > cx1 || cy0 > cy1) return new Int32Array(0);
  let total = 0;
  for (let cy = cy0; cy <= cy1; cy++) total += start[cy * n + cx1 + 1] - start[cy * n + cx0];
  // The whole catalog in the area (a view zoomed out): every row with a position, in order (shared; read only).
  if (total === rows.length) return all;
  // Catalog order without a sort: mark the rows of the cells, then read the marks in order (a pass over the catalog
  // costs less than sorting a large share of it).
  const mark = ix.mark;
  let lo = Infinity, hi = -1;
  for (let cy = cy0; cy <= cy1; cy++) {
    for (let k = start[cy * n + cx0], end = start[cy * n + cx1 + 1]; k < end; k++) {
      const i = rows[k];
      mark[i] = 1;
      if (i < lo) lo = i;
      if (i > hi) hi = i;
    }
  }
  const out = new Int32Array(total);
  let at = 0;
  for (let i = lo; i <= hi; i++) if (mark[i]) { out[at++] = i; mark[i] = 0; }
  return out;
}
