/**
 * The survey schedule as an integer program, solved by HiGHS (the `highs` package, passed in by the caller so this
 * module stays free of loading code). Variables b_i in {0, 1}, one per candidate block; maximise the sum of the
 * blocks' mask priorities; each mask at most once; on each telescope and night, for every maximal set of blocks
 * sharing a slot (a clique of the interval graph of slot ranges) at most one block, which is exactly "no overlap".
 * This is the time-indexed formulation of interval scheduling with release times and deadlines (see e.g.
 * Lampoudi, Saunders & Eastman 2015 for telescope time in this form).
 */
import { intervalCliques, type HighsLike } from '../solver/jointIlp';
import type { CandidateBlock, MaskRequest } from './blocks';

/** CPLEX LP-format text of the schedule; `relaxed` drops integrality (the LP bound). Variable names b<i>. */
export function scheduleLpText(candidates: readonly CandidateBlock[], requests: readonly MaskRequest[], relaxed = false): string {
  const lines: string[] = ['Maximize', ' obj:'];
  push(lines, candidates.map((c, i) => `${i ? '+ ' : ''}${requests[c.mask].priority} b${i}`));
  lines.push('Subject To');
  let r = 0;
  const byMask = new Map<number, number[]>();
  const byNight = new Map<string, number[]>();
  candidates.forEach((c, i) => {
    (byMask.get(c.mask) ?? byMask.set(c.mask, []).get(c.mask)!).push(i);
    const key = `${c.telescope}/${c.night}`;
    (byNight.get(key) ?? byNight.set(key, []).get(key)!).push(i);
  });
  for (const vars of byMask.values()) {
    if (vars.length < 2) continue;
    lines.push(` m${r++}:`);
    push(lines, vars.map((v, j) => `${j ? '+ ' : ''}b${v}`), ' <= 1');
  }
  for (const vars of byNight.values()) {
    const starts = vars.map((v) => candidates[v].startSlot);
    const ends = vars.map((v) => candidates[v].startSlot + candidates[v].slots);
    for (const clique of intervalCliques(starts, ends)) {
      lines.push(` n${r++}:`);
      push(lines, clique.map((k, j) => `${j ? '+ ' : ''}b${vars[k]}`), ' <= 1');
    }
  }
  if (r === 0) lines.push(' none: b0 <= 1');
  lines.push('Bounds');
  for (let i = 0; i < candidates.length; i++) lines.push(` 0 <= b${i} <= 1`);
  if (!relaxed) {
    lines.push('Binary');
    push(lines, candidates.map((_, i) => `b${i}`));
  }
  lines.push('End');
  return lines.join('\n');
}

function push(lines: string[], terms: string[], suffix = ''): void {
  for (let i = 0; i < terms.length; i += 10) lines.push('  ' + terms.slice(i, i + 10).join(' ') + (i + 10 >= terms.length ? suffix : ''));
}

/** The exact solve: chosen candidate indices, objective and HiGHS status ('Optimal' when proved optimal). */
export function solveScheduleExact(highs: HighsLike, candidates: readonly CandidateBlock[], requests: readonly MaskRequest[], timeLimitS: number): { chosen: number[]; objective: number; status: string } {
  if (candidates.length === 0) return { chosen: [], objective: 0, status: 'Optimal' };
  const sol = highs.solve(scheduleLpText(candidates, requests), { output_flag: false, time_limit: timeLimitS, mip_rel_gap: 0 });
  const chosen: number[] = [];
  for (let i = 0; i < candidates.length; i++) if ((sol.Columns[`b${i}`]?.Primal ?? 0) > 0.5) chosen.push(i);
  return { chosen, objective: Number.isFinite(sol.ObjectiveValue) ? sol.ObjectiveValue : 0, status: sol.Status };
}

/** The LP relaxation's optimum: an upper bound on the integer optimum (null when HiGHS gives no optimal LP). */
export function scheduleLpBound(highs: HighsLike, candidates: readonly CandidateBlock[], requests: readonly MaskRequest[], timeLimitS: number): number | null {
  if (candidates.length === 0) return 0;
  const sol = highs.solve(scheduleLpText(candidates, requests, true), { output_flag: false, time_limit: timeLimitS });
  return sol.Status === 'Optimal' ? sol.ObjectiveValue : null;
}
