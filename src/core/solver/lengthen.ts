/**
 * Lengthening slits into the free space around them (mask frame, arcsec, tilt 0): each neighbouring pair along y
 * shares the clear space between them beyond the gap, half each; where one side cannot use its half (footprint
 * edge at its x, a fixed alignment box, or the length cap), the other takes the rest (asymmetric lengthening).
 * Slits only grow, so len_below and len_above stay >= minLength/2, and the gap rule is kept.
 */
import { stripFreeYRange, type Corner } from '../geometry/polygon';

export interface LengthenRow {
  xArcsec: number;
  yArcsec: number;
  lenBelowArcsec: number;
  lenAboveArcsec: number;
  widthArcsec: number;
  /** Alignment boxes (and any slit the caller wants kept as is) do not grow. */
  fixed: boolean;
}

export interface LengthenOptions {
  footprint: readonly Corner[];
  gapArcsec: number;
  /** Cap on each half: a slit grows to at most maxLengthArcsec/2 on either side of its target (default no cap). */
  maxLengthArcsec?: number;
}

/** Safety margin (arcsec) kept beyond the gap so that rounding never brings two slits closer than the gap. */
const MARGIN_ARCSEC = 1e-7;

/** Lengthened copies of the rows of one mask (same order as given). Rows must already obey the gap rule. */
export function lengthenSlits<T extends LengthenRow>(rows: readonly T[], opts: LengthenOptions): T[] {
  const out = rows.map((r) => ({ ...r }));
  const order = out.map((_, i) => i).sort((a, b) => out[a].yArcsec - out[b].yArcsec);
  const halfCap = opts.maxLengthArcsec !== undefined && Number.isFinite(opts.maxLengthArcsec) ? opts.maxLengthArcsec / 2 : Infinity;
  // Room to grow on each side from the footprint at the slit's x and the cap.
  const roomDown = new Float64Array(out.length), roomUp = new Float64Array(out.length);
  out.forEach((r, i) => {
    if (r.fixed) return;
    const free = stripFreeYRange(r.xArcsec - r.widthArcsec / 2, r.xArcsec + r.widthArcsec / 2, r.yArcsec, opts.footprint);
    if (!free) return;
    roomDown[i] = Math.max(0, Math.min(r.yArcsec - r.lenBelowArcsec - free.lo - MARGIN_ARCSEC, halfCap - r.lenBelowArcsec));
    roomUp[i] = Math.max(0, Math.min(free.hi - (r.yArcsec + r.lenAboveArcsec) - MARGIN_ARCSEC, halfCap - r.lenAboveArcsec));
  });
  const growDown = new Float64Array(out.length), growUp = new Float64Array(out.length);
  if (order.length) {
    growDown[order[0]] = roomDown[order[0]];
    growUp[order[order.length - 1]] = roomUp[order[order.length - 1]];
  }
  for (let j = 0; j + 1 < order.length; j++) {
    const a = order[j], b = order[j + 1];
    const free = out[b].yArcsec - out[b].lenBelowArcsec - (out[a].yArcsec + out[a].lenAboveArcsec) - opts.gapArcsec - 2 * MARGIN_ARCSEC;
    if (!(free > 0)) continue;
    let ua = Math.min(roomUp[a], free / 2), ub = Math.min(roomDown[b], free / 2);
    const rest = free - ua - ub;
    if (rest > 0) {
      const moreA = Math.min(rest, roomUp[a] - ua);
      ua += moreA;
      ub += Math.min(rest - moreA, roomDown[b] - ub);
    }
    growUp[a] = ua;
    growDown[b] = ub;
  }
  out.forEach((r, i) => {
    r.lenBelowArcsec += growDown[i];
    r.lenAboveArcsec += growUp[i];
  });
  return out;
}
