/**
 * The pointing search's spatial index of tracers (solver/pointingSearch.ts, proxyModel): square cells of the galaxy's
 * tangent plane (xi East, eta North, arcsec) in flat typed arrays, so that a trial move visits only the cells near the
 * moved mask. Built in O(n): cell ids in first-seen order, then a stable counting sort (catalog order inside a cell).
 *
 * Thinning at high density: a mask can take from one cell at most slotsPerCell = floor(cell x sqrt 2 / pitch) + 1
 * slits (the cell's extent along the mask's y in any orientation, over the slit pitch minLength + gap), so when the
 * unthinned per-trial cost (the tracers of the cellsPerTrial fullest cells) would exceed PROXY_TRIAL_BUDGET, every
 * cell keeps only its PROXY_SLOT_MARGIN x slotsPerCell most valuable tracers (value, then catalog order; kept in
 * catalog order). A trial then projects at most max(PROXY_TRIAL_BUDGET, cellsPerTrial x cap) tracers whatever the
 * catalog's size. A catalog of at most PROXY_TRIAL_BUDGET tracers is never thinned. Only the search's proxy uses the
 * thinned cells; the full evaluation, the proven bounds and the comparison with the cross see every tracer.
 */

/** Side of a cell (arcsec). */
export const PROXY_CELL_ARCSEC = 60;
/** Largest per-trial tracer count of an unthinned proxy: above it the cells are thinned. */
export const PROXY_TRIAL_BUDGET = 40000;
/** Tracers kept per cell when thinned, in units of the most slits a mask can take from one cell. */
export const PROXY_SLOT_MARGIN = 2;

/** Tracers binned in cells: cell c holds positions cellStart[c] .. cellStart[c + 1] - 1 of the per-tracer arrays. */
export interface ProxyCells {
  cellArcsec: number;
  nCells: number;
  /** Whether the cell is on the plane (false: tracers off the tangent plane or absurdly far, never culled). */
  cellOnPlane: Uint8Array;
  /** Cell centres in the galaxy's tangent plane (arcsec). */
  cellXiArcsec: Float64Array;
  cellEtaArcsec: Float64Array;
  cellStart: Int32Array;
  /** Per kept tracer: object index, unit vector, tangent-plane offset (arcsec). */
  objects: Int32Array;
  ux: Float64Array; uy: Float64Array; uz: Float64Array;
  xiArcsec: Float64Array; etaArcsec: Float64Array;
  /** Tracers per cell kept when thinned (null: not thinned). */
  perCellCap: number | null;
}

/** Inputs of proxyCells: tracers (object indices), their tangent-plane offsets and unit vectors by object index. */
export interface ProxyCellInput {
  tracers: Int32Array;
  xiArcsec: Float64Array;
  etaArcsec: Float64Array;
  unit: { x: Float64Array; y: Float64Array; z: Float64Array };
  /** A tracer's value for thinning (larger kept first), by position in `tracers`. */
  value: ArrayLike<number>;
}

/** Geometry of the masks a trial moves: slit pitch along y (minLength + gap) and cells a trial can visit. */
export interface ProxyTrialShape { slitPitchArcsec: number; cellsPerTrial: number }

/**
 * Most cell centres (a square lattice of step cellArcsec) inside a rectangle of widthArcsec x heightArcsec in any
 * position and orientation: a convex region of area A and perimeter P (lattice units) holds at most A + P/2 + 1
 * lattice points (Nosarzewska 1948, from memory; test/search/proxyThinning.test.ts confirms it by counting).
 */
export function cellsInRectangle(widthArcsec: number, heightArcsec: number, cellArcsec: number): number {
  const a = widthArcsec / cellArcsec, b = heightArcsec / cellArcsec;
  return Math.floor(a * b + (a + b) + 1);
}

/** The most slits one cell of side cellArcsec can give a mask of slit pitch pitchArcsec (any orientation). */
export function slotsPerCell(cellArcsec: number, pitchArcsec: number): number {
  return Math.floor((cellArcsec * Math.SQRT2) / pitchArcsec) + 1;
}

/**
 * Tracers per cell to keep (null: no thinning): thinning when the cellsPerTrial fullest cells hold more than `budget`
 * tracers, keeping PROXY_SLOT_MARGIN x slotsPerCell.
 */
export function proxyCellCap(cellCounts: Int32Array, shape: ProxyTrialShape, cellArcsec: number, budget = PROXY_TRIAL_BUDGET): number | null {
  let total = 0;
  for (const c of cellCounts) total += c;
  if (total <= budget) return null;
  const sorted = Int32Array.from(cellCounts).sort();
  let fullest = 0;
  for (let k = sorted.length - 1, m = 0; k >= 0 && m < shape.cellsPerTrial; k--, m++) fullest += sorted[k];
  if (fullest <= budget) return null;
  return PROXY_SLOT_MARGIN * slotsPerCell(cellArcsec, shape.slitPitchArcsec);
}

/** The cell index of the tracers, thinned when the density calls for it (proxyCellCap with `budget`; null: never thinned). */
export function proxyCells(input: ProxyCellInput, shape: ProxyTrialShape, budget: number | null = PROXY_TRIAL_BUDGET, cellArcsec = PROXY_CELL_ARCSEC): ProxyCells {
  return proxyCellPair(input, shape, budget, cellArcsec).search;
}

/**
 * proxyCells (`search`) and, from the same binning, the index of every tracer (`all()`, made when first asked; the
 * search's own index when nothing is thinned).
 */
export function proxyCellPair(input: ProxyCellInput, shape: ProxyTrialShape, budget: number | null = PROXY_TRIAL_BUDGET, cellArcsec = PROXY_CELL_ARCSEC): { search: ProxyCells; all: () => ProxyCells } {
  const { tracers, xiArcsec, etaArcsec } = input;
  const n = tracers.length;
  // Cell ids in first-seen order (catalog order of the first tracer of each cell); off-plane tracers share one cell.
  const cx = new Int32Array(n), cy = new Int32Array(n), onPlane = new Uint8Array(n);
  let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
  for (let j = 0; j < n; j++) {
    const i = tracers[j], xi = xiArcsec[i], eta = etaArcsec[i];
    if (!(Number.isFinite(xi) && Number.isFinite(eta) && Math.abs(xi) < 1e6 && Math.abs(eta) < 1e6)) continue;
    onPlane[j] = 1; cx[j] = Math.floor(xi / cellArcsec); cy[j] = Math.floor(eta / cellArcsec);
    if (cx[j] < minX) minX = cx[j]; if (cx[j] > maxX) maxX = cx[j]; if (cy[j] < minY) minY = cy[j]; if (cy[j] > maxY) maxY = cy[j];
  }
  const cellOf = new Int32Array(n);
  const keys: number[] = [];
  // A dense grid of cell ids when the occupied span is small against n (the usual case), else a map.
  const w = maxX - minX + 1, h = maxY - minY + 1;
  const grid = w > 0 && w * h <= 4 * n + 65536 ? new Int32Array(w * h).fill(-1) : null;
  const ids = new Map<number, number>();
  for (let j = 0; j < n; j++) {
    const key = onPlane[j] ? (cx[j] + 32768) * 65536 + (cy[j] + 32768) : -1;
    const slot = grid && onPlane[j] ? (cx[j] - minX) * h + (cy[j] - minY) : -1;
    let c = slot >= 0 ? grid![slot] : ids.get(key) ?? -1;
    if (c < 0) {
      c = keys.length; keys.push(key);
      if (slot >= 0) grid![slot] = c; else ids.set(key, c);
    }
    cellOf[j] = c;
  }
  const nCells = keys.length;
  const counts = new Int32Array(nCells);
  for (let j = 0; j < n; j++) counts[cellOf[j]]++;
  const cap = budget === null ? null : proxyCellCap(counts, shape, cellArcsec, budget);
  // Stable counting sort of tracer positions by cell.
  const allStart = new Int32Array(nCells + 1);
  for (let c = 0; c < nCells; c++) allStart[c + 1] = allStart[c] + counts[c];
  const fill = allStart.slice(0, nCells), byCell = new Int32Array(n);
  for (let j = 0; j < n; j++) byCell[fill[cellOf[j]]++] = j;
  const cells = { nCells, keys, cellArcsec };
  if (cap === null) {
    const search = cellArrays(input, cells, byCell, allStart, null);
    return { search, all: () => search };
  }
  const kept = keepMostValuable(byCell, allStart, cap, input.value);
  let all: ProxyCells | null = null;
  return { search: cellArrays(input, cells, kept.positions, kept.cellStart, cap), all: () => (all ??= cellArrays(input, cells, byCell, allStart, null)) };
}

/** The flat arrays of a cell index: the tracers at `positions` (cell c: cellStart[c] .. cellStart[c + 1] - 1). */
function cellArrays(input: ProxyCellInput, cells: { nCells: number; keys: readonly number[]; cellArcsec: number }, positions: Int32Array, cellStart: Int32Array, cap: number | null): ProxyCells {
  const { nCells, keys, cellArcsec } = cells;
  const m = positions.length;
  const out: ProxyCells = {
    cellArcsec, nCells, cellOnPlane: new Uint8Array(nCells), cellXiArcsec: new Float64Array(nCells), cellEtaArcsec: new Float64Array(nCells), cellStart,
    objects: new Int32Array(m), ux: new Float64Array(m), uy: new Float64Array(m), uz: new Float64Array(m),
    xiArcsec: new Float64Array(m), etaArcsec: new Float64Array(m), perCellCap: cap,
  };
  for (let c = 0; c < nCells; c++) {
    const k = keys[c];
    out.cellOnPlane[c] = k >= 0 ? 1 : 0;
    out.cellXiArcsec[c] = (Math.floor(k / 65536) - 32768 + 0.5) * cellArcsec;
    out.cellEtaArcsec[c] = ((k % 65536) - 32768 + 0.5) * cellArcsec;
  }
  const { tracers, xiArcsec, etaArcsec } = input;
  const { x, y, z } = input.unit;
  for (let q = 0; q < m; q++) {
    const i = tracers[positions[q]];
    out.objects[q] = i; out.ux[q] = x[i]; out.uy[q] = y[i]; out.uz[q] = z[i]; out.xiArcsec[q] = xiArcsec[i]; out.etaArcsec[q] = etaArcsec[i];
  }
  return out;
}

/**
 * Per cell, the `cap` positions of largest value (ties: earlier position first), in position order. O(n) plus a
 * numeric sort of the values of the cells over the cap.
 */
function keepMostValuable(byCell: Int32Array, start: Int32Array, cap: number, value: ArrayLike<number>): { positions: Int32Array; cellStart: Int32Array } {
  const nCells = start.length - 1;
  const cellStart = new Int32Array(nCells + 1);
  let m = 0;
  for (let c = 0; c < nCells; c++) m += Math.min(cap, start[c + 1] - start[c]);
  const positions = new Int32Array(m);
  let at = 0;
  for (let c = 0; c < nCells; c++) {
    cellStart[c] = at;
    const s = start[c], e = start[c + 1];
    if (e - s <= cap) {
      for (let q = s; q < e; q++) positions[at++] = byCell[q];
      continue;
    }
    // The cap-th largest value; every larger value kept, then values equal to it in position order until the cap.
    const v = new Float64Array(e - s);
    for (let q = s; q < e; q++) v[q - s] = value[byCell[q]];
    v.sort();
    const threshold = v[v.length - cap];
    let above = 0;
    for (let k = v.length - cap; k < v.length; k++) if (v[k] > threshold) above++;
    let ties = cap - above;
    for (let q = s; q < e; q++) {
      const w = value[byCell[q]];
      if (w > threshold || (w === threshold && ties-- > 0)) positions[at++] = byCell[q];
    }
  }
  cellStart[nCells] = at;
  return { positions, cellStart };
}
