/**
 * Plain-text summary of a solved plan for `haloweave plan` and the demo: the weighting rules in effect and what
 * they excluded, the pointing search against its starting (naive cross) layout, and per role the counts per
 * radial bin of 1 Re and per 45-degree sector (from the major axis, not folded), the reach in Re against the
 * goal, and the goal bins left empty. Also the CSV of excluded targets (`id,line,role,rule,reason`).
 */
import type { CoverageReport } from './coverage';
import type { WeightingResult } from '../solver/weighting';
import { exclusionCounts } from '../solver/weighting';
import type { SearchReport } from '../solver/pointingSearch';
import { toCsv } from '../export/csvText';

/** What the summary needs from a plan solution (a subset of PlanSolution). */
export interface SummaryInput {
  coverage: CoverageReport;
  weighting?: WeightingResult;
  search?: SearchReport;
}

const f2 = (v: number) => v.toFixed(2);

/** One line per fact, no trailing newlines. */
export function coverageSummaryLines(s: SummaryInput): string[] {
  const lines: string[] = [];
  if (s.weighting) {
    lines.push('weighting rules:');
    for (const r of s.weighting.rulesText) lines.push(`  ${r}`);
    const counts = exclusionCounts(s.weighting.excluded);
    lines.push(`  ${s.weighting.targets.length} targets kept, ${s.weighting.excluded.length} excluded${counts.length ? ': ' + counts.map((c) => `${c.count} by ${c.rule}`).join(', ') : ''}`);
  }
  if (s.search) {
    const r = s.search;
    const against = r.startObjective
      ? `against ${f2(r.startObjective.total)} for the naive starting layout (tracer weight ${f2(r.objective.yieldWeight)} vs ${f2(r.startObjective.yieldWeight)})`
      : `against at most ${f2(r.startObjectiveUpperBound ?? NaN)} for the naive starting layout (a proven upper bound; tracer weight ${f2(r.objective.yieldWeight)})`;
    lines.push(`pointing search: objective ${f2(r.objective.total)} ${against}; ${r.evaluations} evaluations, ${r.acceptedMoves} moves kept${r.keptStart ? '; starting layout kept' : ''}`);
  }
  for (const role of ['tracer', 'starlight', 'sky'] as const) {
    const c = s.coverage.roles[role];
    if (!c) continue;
    const goal = role === 'sky' ? '' : ` (goal ${c.goalRe} Re${c.maxReachRe >= c.goalRe ? ', met' : role === 'tracer' && c.maxReachRe >= 0.9 * c.goalRe ? ', 90 % met' : ', not met'})`;
    lines.push(`${role}: ${c.count} slits, reach ${f2(c.maxReachRe)} Re${goal}`);
    if (role === 'sky') continue;
    if (c.radialBins.length) lines.push(`  per 1-Re bin (0..${c.goalRe} Re): ${c.radialBins.map((b) => b.count).join(' ')}${c.beyondGoal ? `; beyond the goal: ${c.beyondGoal}` : ''}`);
    lines.push(`  per 45-deg sector from the major axis: ${c.sectors.map((b) => b.count).join(' ')}`);
    const emptySectors = c.sectors.filter((b) => b.count === 0).map((b) => `${b.fromDeg}-${b.toDeg}`);
    if (c.emptyBinsFromRe.length) lines.push(`  empty goal bins: ${c.emptyBinsFromRe.map((r) => `${r}-${Math.min(r + 1, c.goalRe)} Re`).join(', ')}`);
    else if (c.radialBins.length) lines.push('  every goal bin holds at least one slit');
    if (emptySectors.length) lines.push(`  empty sectors: ${emptySectors.join(', ')} deg`);
  }
  return lines;
}

/** The excluded targets as CSV: id,line,role,rule,reason (line as in the catalog report). */
export function excludedTargetsCsv(w: WeightingResult): string {
  return toCsv(['id', 'line', 'role', 'rule', 'reason'], w.excluded.map((e) => [e.id, e.line, e.role, e.rule, e.reason]), { neutraliseFormulas: true });
}
