/**
 * A spatial index of points on the sky for cone searches: the points' unit vectors (x, y, z) binned in a cube grid
 * of cells `cellSize` wide (radians of chord). A cone of angular radius r about a centre lies inside the cube of
 * half-size r about the centre's unit vector (a chord is never longer than its arc), so the cells meeting that cube
 * hold every point of the cone: a query touches the points near the centre only, whatever the catalog's size.
 */
import type { UnitVectors } from './maskTargets';

export interface UnitGrid {
  cellSize: number;
  /** Cells per axis offset (cell coordinates run from -offset to offset - 1). */
  offset: number;
  /** Positions k (into the indexed list) of the points in each cell, increasing. */
  cells: Map<number, Int32Array>;
}

const cellKey = (g: UnitGrid, ix: number, iy: number, iz: number) => ((ix + g.offset) * 2 * g.offset + (iy + g.offset)) * 2 * g.offset + (iz + g.offset);

/** Index the points `indices` of `u` (positions k = 0..indices.length-1) in cells of cellSizeRad (at least 1e-4 rad). */
export function unitGrid(u: UnitVectors, indices: ArrayLike<number>, cellSizeRad: number): UnitGrid {
  const cellSize = Math.max(cellSizeRad, 1e-4);
  const g: UnitGrid = { cellSize, offset: Math.ceil(1 / cellSize) + 1, cells: new Map() };
  const lists = new Map<number, number[]>();
  for (let k = 0; k < indices.length; k++) {
    const i = indices[k];
    const key = cellKey(g, Math.floor(u.x[i] / cellSize), Math.floor(u.y[i] / cellSize), Math.floor(u.z[i] / cellSize));
    if (!Number.isFinite(key)) continue;
    let list = lists.get(key);
    if (!list) lists.set(key, (list = []));
    list.push(k);
  }
  for (const [key, list] of lists) g.cells.set(key, Int32Array.from(list));
  return g;
}

/**
 * Positions k, increasing, of every indexed point within angular radius radiusRad of the unit vector (cx, cy, cz),
 * and some points a little farther (the caller applies its own exact cut).
 */
export function unitGridNear(g: UnitGrid, cx: number, cy: number, cz: number, radiusRad: number): Int32Array {
  const r = radiusRad + 1e-9, s = g.cellSize;
  const parts: Int32Array[] = [];
  let n = 0;
  for (let ix = Math.floor((cx - r) / s); ix <= Math.floor((cx + r) / s); ix++) {
    for (let iy = Math.floor((cy - r) / s); iy <= Math.floor((cy + r) / s); iy++) {
      for (let iz = Math.floor((cz - r) / s); iz <= Math.floor((cz + r) / s); iz++) {
        const list = g.cells.get(cellKey(g, ix, iy, iz));
        if (list) { parts.push(list); n += list.length; }
      }
    }
  }
  const out = new Int32Array(n);
  let at = 0;
  for (const p of parts) { out.set(p, at); at += p.length; }
  return out.sort();
}
