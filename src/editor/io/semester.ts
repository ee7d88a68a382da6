/** Semesters of six months starting 1 February and 1 August (a common convention; the user may pick any); dates YYYY-MM-DD, UTC. */

/** The semester holding date d: first and last night and a label. */
export function semesterOf(d: Date): { from: string; to: string; label: string } {
  const y = d.getUTCFullYear(), m = d.getUTCMonth() + 1;
  if (m >= 2 && m <= 7) return { from: `${y}-02-01`, to: `${y}-07-31`, label: `${y} Feb–Jul` };
  const y0 = m === 1 ? y - 1 : y;
  return { from: `${y0}-08-01`, to: `${y0 + 1}-01-31`, label: `${y0} Aug–${y0 + 1} Jan` };
}
