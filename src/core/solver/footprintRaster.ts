/**
 * A column raster of where a centred rectangle fits in a footprint (mask frame, x along the dispersion, y along
 * the slits, arcsec), for fast approximate eligibility in the pointing search's inner loop. Column k covers
 * x in [minX + k dx, minX + (k + 1) dx); its intervals are the y-centres where a rectangle of the given half-width
 * and half-length fits for every x in the column (conservative: built for the widened strip), from the footprint
 * test of geometry/polygon (stripFreeYRange). Exact eligibility is always re-checked by the allocation engine.
 */
import { polygonBounds, stripFreeYRange, type Corner } from '../geometry/polygon';

export interface FootprintRaster {
  readonly minX: number;
  readonly dxArcsec: number;
  /** Per column, the y-centre intervals [lo, hi] (arcsec) where the rectangle fits. */
  readonly columns: readonly (readonly (readonly [number, number])[])[];
}

/** Rasters already built, per footprint array and (half-width, half-length, dx): a profile's footprint never changes. */
const built = new WeakMap<readonly Corner[], Map<string, FootprintRaster>>();

/**
 * The raster for a rectangle of halfWidth x halfLength (arcsec); dx is the column width. Memoised per footprint
 * array (the result is shared and must be treated as read-only), since every plan solve of a profile needs the same.
 */
export function footprintRaster(footprint: readonly Corner[], halfWidthArcsec: number, halfLengthArcsec: number, dxArcsec = 1): FootprintRaster {
  let byShape = built.get(footprint);
  if (!byShape) built.set(footprint, (byShape = new Map()));
  const key = `${halfWidthArcsec} ${halfLengthArcsec} ${dxArcsec}`;
  let r = byShape.get(key);
  if (!r) byShape.set(key, (r = buildFootprintRaster(footprint, halfWidthArcsec, halfLengthArcsec, dxArcsec)));
  return r;
}

function buildFootprintRaster(footprint: readonly Corner[], halfWidthArcsec: number, halfLengthArcsec: number, dxArcsec: number): FootprintRaster {
  const b = polygonBounds(footprint);
  const n = Math.max(1, Math.ceil((b.maxX - b.minX) / dxArcsec));
  const columns: [number, number][][] = [];
  const stepY = Math.max(0.25, halfLengthArcsec / 2);
  for (let k = 0; k < n; k++) {
    const x0 = b.minX + k * dxArcsec - halfWidthArcsec, x1 = b.minX + (k + 1) * dxArcsec + halfWidthArcsec;
    const list: [number, number][] = [];
    let y = b.minY + 1e-6;
    while (y < b.maxY) {
      const r = stripFreeYRange(x0, x1, y, footprint);
      if (r && Number.isFinite(r.lo) && Number.isFinite(r.hi)) {
        const lo = r.lo + halfLengthArcsec, hi = r.hi - halfLengthArcsec;
        if (hi >= lo) list.push([lo, hi]);
        y = Math.max(y + stepY, r.hi + 1e-6);
      } else y += stepY;
    }
    columns.push(list);
  }
  return { minX: b.minX, dxArcsec, columns };
}

/** True when the raster says the rectangle centred on (x, y) arcsec fits (conservative). */
export function rasterFits(r: FootprintRaster, xArcsec: number, yArcsec: number): boolean {
  const k = Math.floor((xArcsec - r.minX) / r.dxArcsec);
  if (!(k >= 0 && k < r.columns.length)) return false;
  const column = r.columns[k];
  for (let j = 0; j < column.length; j++) if (yArcsec >= column[j][0] && yArcsec <= column[j][1]) return true;
  return false;
}
