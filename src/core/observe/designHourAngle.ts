/**
 * Choice of a mask's design hour angle (hours of the mask centre, positive West) and the fit of its exposure in the
 * hour-angle window. The design hour angle is where the slits are cut for; the window is where every tracer slit
 * keeps its light loss under the limit (observe/maskRefraction.ts).
 */
import { maskRefractionReport, type MaskRefractionInput, type MaskRefractionReport } from './maskRefraction';

/** Length in hours of a window [start, end], 0 without one. */
export function windowLengthH(window: [number, number] | null): number {
  return window ? window[1] - window[0] : 0;
}

/**
 * The design hour angle among candidatesH whose report gives the longest window that contains it (ties: the
 * candidate nearest transit), with that report; then the half-steps either side of the best are tried too. A window
 * that holds exposureS beats one that does not, however long.
 */
export function chooseDesignHourAngle(input: Omit<MaskRefractionInput, 'designHourAngleH'>, candidatesH: readonly number[], exposureS: number): MaskRefractionReport {
  let best: MaskRefractionReport | null = null;
  const score = (r: MaskRefractionReport) => (r.windowContainsDesign ? windowLengthH(r.hourAngleWindowH) : 0);
  const consider = (h: number) => {
    const r = maskRefractionReport({ ...input, designHourAngleH: h });
    if (!best) { best = r; return; }
    const s = score(r), b = score(best);
    const fits = s * 3600 >= exposureS, bestFits = b * 3600 >= exposureS;
    if ((fits && !bestFits) || (fits === bestFits && (s > b + 1e-6 || (Math.abs(s - b) <= 1e-6 && Math.abs(h) < Math.abs(best.designHourAngleH))))) best = r;
  };
  for (const h of candidatesH) consider(h);
  if (best && candidatesH.length > 1) {
    const step = candidatesH[1] - candidatesH[0], b = (best as MaskRefractionReport).designHourAngleH;
    for (const h of [b - step / 2, b + step / 2]) if (h >= candidatesH[0] && h <= candidatesH[candidatesH.length - 1]) consider(h);
  }
  return best ?? maskRefractionReport({ ...input, designHourAngleH: 0 });
}

/** Candidate design hour angles: the searched range stepped by at least 1 h, transit included (chooseDesignHourAngle refines by half a step). */
export function designHourAngleCandidatesH(rangeH: [number, number], stepH: number): number[] {
  const step = Math.max(stepH, 1);
  const out: number[] = [];
  for (let h = Math.ceil(rangeH[0] / step) * step; h <= rangeH[1] + 1e-9; h += step) out.push(Math.round(h * 1e6) / 1e6);
  return out.length ? out : [0];
}

/** Whether an exposure of exposureS seconds fits in the window, and a sentence saying so for the summary. */
export function exposureFit(window: [number, number] | null, exposureS: number): { fits: boolean; text: string } {
  const need = exposureS / 3600, have = windowLengthH(window);
  if (!window) return { fits: false, text: `no window for the ${need.toFixed(2)} h exposure` };
  if (have + 1e-9 >= need) return { fits: true, text: `window ${have.toFixed(2)} h holds the ${need.toFixed(2)} h exposure` };
  return { fits: false, text: `window ${have.toFixed(2)} h is shorter than the ${need.toFixed(2)} h exposure: split it over nights, observe through a narrower science range, or accept more loss` };
}
