/** Axis helpers shared by the editor's SVG plots: tick steps of 1, 2 or 5 times a power of ten. */

/** The smallest step of 1, 2 or 5 x 10^k that covers [0, max] in at most `maxTicks` steps (max <= 0 gives 1). */
export function niceStep(max: number, maxTicks = 4): number {
  if (!(max > 0) || !Number.isFinite(max)) return 1;
  const raw = max / maxTicks;
  const p = Math.pow(10, Math.floor(Math.log10(raw)));
  for (const m of [1, 2, 5, 10]) if (m * p >= raw) return Math.max(1, m * p);
  return Math.max(1, 10 * p);
}

/** Axis top and tick step for counts up to `max`: the top is a whole number of steps. */
export function countAxis(max: number, maxTicks = 4): { top: number; step: number } {
  const step = niceStep(Math.max(1, max), maxTicks);
  return { top: Math.max(step, Math.ceil(Math.max(1, max) / step) * step), step };
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "Aug ’26" for an ISO date "2026-08-01". */
export function monthYearLabel(isoDate: string): string {
  return `${MONTHS[Number(isoDate.slice(5, 7)) - 1]} ’${isoDate.slice(2, 4)}`;
}
