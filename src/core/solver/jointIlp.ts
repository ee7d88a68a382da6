/**
 * The joint allocation as an integer program, for an exact optimum from the HiGHS solver (the `highs` package,
 * passed in by the caller so this module stays free of loading code). Variables z[m][k] in {0, 1}; per object
 * sum over masks <= 1; per mask, for every maximal set of mutually overlapping y intervals (a clique of the
 * interval graph) the sum <= 1, which is exactly "no two chosen intervals overlap".
 */
import { candidateValue, type JointProblem } from './jointAllocation';

/** Maximal cliques of half-open intervals [start, end): the intervals covering each start point where one ends next. */
export function intervalCliques(starts: ArrayLike<number>, ends: ArrayLike<number>): number[][] {
  const n = starts.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => starts[a] - starts[b] || a - b);
  const cliques: number[][] = [];
  let active: number[] = [];
  for (let j = 0; j < n; j++) {
    const i = order[j];
    const s = starts[i];
    active = active.filter((a) => ends[a] > s);
    active.push(i);
    const nextStart = j + 1 < n ? starts[order[j + 1]] : Infinity;
    const minEnd = Math.min(...active.map((a) => ends[a]));
    if (nextStart >= minEnd && active.length > 1) cliques.push(active.slice());
  }
  return cliques;
}

/** CPLEX LP-format text of the joint problem (maximise total weight); variable names x<m>_<k>. */
export function jointLpText(problem: JointProblem): string {
  const lines: string[] = ['Maximize', ' obj:'];
  const terms: string[] = [];
  problem.masks.forEach((set, m) => {
    for (let k = 0; k < set.objects.length; k++) terms.push(`${candidateValue(problem, m, k)} x${m}_${k}`);
  });
  pushTerms(lines, terms.length ? terms : ['0 dummy']);
  lines.push('Subject To');
  const byObject = new Map<number, string[]>();
  problem.masks.forEach((set, m) => {
    for (let k = 0; k < set.objects.length; k++) {
      const o = set.objects[k];
      if (!byObject.has(o)) byObject.set(o, []);
      byObject.get(o)!.push(`x${m}_${k}`);
    }
  });
  let r = 0;
  for (const vars of byObject.values()) {
    if (vars.length < 2) continue;
    lines.push(` r${r++}:`);
    pushTerms(lines, vars.map((v, i) => (i ? `+ ${v}` : v)), ' <= 1');
  }
  problem.masks.forEach((set, m) => {
    for (const c of intervalCliques(set.starts, set.ends)) {
      lines.push(` r${r++}:`);
      pushTerms(lines, c.map((k, i) => (i ? `+ x${m}_${k}` : `x${m}_${k}`)), ' <= 1');
    }
  });
  if (r === 0) lines.push(' r0: 0 dummy >= 0');
  lines.push('Binary');
  const vars: string[] = [];
  problem.masks.forEach((set, m) => { for (let k = 0; k < set.objects.length; k++) vars.push(`x${m}_${k}`); });
  pushTerms(lines, vars.length ? vars : ['dummy']);
  lines.push('End');
  return lines.join('\n');
}

function pushTerms(lines: string[], terms: string[], suffix = ''): void {
  const withPlus = terms.map((t, i) => (i && !t.startsWith('+') && /^\d|^-/.test(t) ? `+ ${t}` : t));
  for (let i = 0; i < withPlus.length; i += 8) lines.push('  ' + withPlus.slice(i, i + 8).join(' ') + (i + 8 >= withPlus.length ? suffix : ''));
}

/** The minimal surface of a loaded `highs` module this module needs. */
export interface HighsLike {
  solve(problem: string, options?: Record<string, unknown>): { Status: string; ObjectiveValue: number; Columns: Record<string, { Primal: number }> };
}

/** Exact integer optimum of the joint problem with HiGHS: chosen candidate positions per mask and the total weight. */
export function solveJointExact(highs: HighsLike, problem: JointProblem, timeLimitS = 120): { chosen: number[][]; objective: number; status: string } {
  const sol = highs.solve(jointLpText(problem), { output_flag: false, time_limit: timeLimitS, mip_rel_gap: 0 });
  const chosen = problem.masks.map((set, m) => {
    const sel: number[] = [];
    for (let k = 0; k < set.objects.length; k++) if ((sol.Columns[`x${m}_${k}`]?.Primal ?? 0) > 0.5) sel.push(k);
    return sel;
  });
  return { chosen, objective: sol.ObjectiveValue, status: sol.Status };
}
