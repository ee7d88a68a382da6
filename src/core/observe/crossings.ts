/** Zero crossings of a smooth function of time (JD) found on a sampled grid and refined by the Illinois method. */

export interface Crossing {
  /** JD of the crossing. */
  jd: number;
  /** True when f goes from negative to positive (e.g. a body rising through an altitude). */
  rising: boolean;
}

/** Refine a root of f bracketed by [a, b] (f(a), f(b) of opposite sign) to within tolDays (Illinois false position). */
export function refineRoot(f: (jd: number) => number, a: number, fa: number, b: number, fb: number, tolDays: number): number {
  let side = 0;
  let c = (a * fb - b * fa) / (fb - fa);
  for (let i = 0; i < 60 && b - a > tolDays; i++) {
    const fc = f(c);
    if (fc === 0) return c;
    if ((fc > 0) === (fb > 0)) {
      b = c; fb = fc;
      if (side === -1) fa /= 2;
      side = -1;
    } else {
      a = c; fa = fc;
      if (side === 1) fb /= 2;
      side = 1;
    }
    const next = (a * fb - b * fa) / (fb - fa);
    if (Math.abs(next - c) < tolDays / 4) return next;
    c = next;
  }
  return c;
}

/**
 * Every crossing of `level` by f between successive samples (times jds, values vals of f at those times),
 * refined to tolDays. A pair of crossings that falls between two samples is not seen: choose the step accordingly.
 */
export function findCrossings(f: (jd: number) => number, jds: ArrayLike<number>, vals: ArrayLike<number>, tolDays = 1e-6, level = 0): Crossing[] {
  const out: Crossing[] = [];
  const g = level === 0 ? f : (jd: number) => f(jd) - level;
  for (let i = 1; i < jds.length; i++) {
    const v0 = vals[i - 1] - level, v1 = vals[i] - level;
    if ((v0 < 0 && v1 >= 0) || (v0 >= 0 && v1 < 0)) {
      const jd = v1 === 0 ? jds[i] : refineRoot(g, jds[i - 1], v0, jds[i], v1, tolDays);
      out.push({ jd, rising: v1 >= 0 });
    }
  }
  return out;
}
