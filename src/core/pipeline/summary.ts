/**
 * Plain-text summary of a solved plan for `haloweave plan` and the demo, each fact said once: per mask the slits
 * per role, the tracer weight against its upper bound, then per role the counts per radial bin of 1 Re and per
 * 45-degree sector (from the major axis towards +v, not folded), the reach in Re against the goal and the goal
 * bins and sectors left empty; then the weighting rules and what they excluded, the pointing search against its
 * starting (naive cross) layout, the spectral report (photometry, line windows, resolving power, OH lines, usable x
 * per mask), and the refraction window and exposure lines. Also the CSV of excluded targets
 * (`id,line,role,rule,reason`).
 */
import type { CoverageReport } from '../coverage/coverage';
import type { WeightingResult } from '../solver/weighting';
import { excludedCount, exclusionCounts, forEachExcluded } from '../solver/weighting';
import type { SearchReport } from '../solver/pointingSearch';
import type { MaskSolution } from '../geometry/maskSolution';
import type { ObservingReport } from './refractionReport';
import { formatRefractionSummary } from './refractionReport';
import { csvCell, toCsv } from '../export/csvText';
import { spectralSummaryLines, type SpectralReport } from '../spectro/spectralReport';

/** What the coverage part of the summary needs from a plan solution (a subset of PlanSolution). */
export interface SummaryInput {
  coverage: CoverageReport;
  weighting?: WeightingResult;
  search?: SearchReport;
}

/** What the whole summary needs from a plan solution (a subset of PlanSolution). */
export interface PlanSummaryInput extends SummaryInput {
  masks: readonly MaskSolution[];
  stats: { masks: readonly { maskId: string; eligibleTracers: number }[]; tracerWeight: number; tracerWeightUpperBound: number };
  observingReport?: ObservingReport;
  spectralReport?: SpectralReport;
}

const f2 = (v: number) => v.toFixed(2);

/** Per mask: centre, PA and the slits per role; then the tracer weight allocated against its upper bound. */
export function maskSummaryLines(s: PlanSummaryInput): string[] {
  const lines: string[] = [];
  for (const m of s.masks) {
    const byRole = (r: string) => m.slits.filter((x) => x.role === r).length;
    const st = s.stats.masks.find((x) => x.maskId === m.mask.id);
    lines.push(`mask ${m.mask.id}: ra ${m.mask.raDeg.toFixed(5)} dec ${m.mask.decDeg.toFixed(5)} pa ${m.mask.paDeg.toFixed(2)} deg; ${byRole('tracer')} tracer, ${byRole('starlight')} starlight, ${byRole('sky')} sky slits, ${byRole('alignment')} alignment boxes${st ? ` (${st.eligibleTracers} eligible tracers)` : ''}`);
  }
  const ub = s.stats.tracerWeightUpperBound;
  lines.push(`tracer weight allocated: ${s.stats.tracerWeight.toFixed(3)}${Number.isFinite(ub) ? ` (upper bound for these pointings ${ub.toFixed(3)})` : ''}`);
  return lines;
}

/** ", met" or ", not met" for the starlight goal: a sector of the outermost 1-Re bin inside the goal reaches the co-added target (coverage/goals.ts). */
function starlightGoalWord(bins: CoverageReport['starlightBins']): string {
  if (!bins) return '';
  const outer = Math.ceil(bins.goalRe - 1e-12) - 1;
  return bins.bins.some((b) => b.fromRe === outer && b.met) ? ', met' : ', not met';
}

/** Coverage per role (every line names its role), then the weighting rules and the pointing search; one line per fact. */
export function coverageSummaryLines(s: SummaryInput): string[] {
  const lines: string[] = [];
  const conv = s.coverage.sectorConvention;
  lines.push(`coverage: circularised radius in Re, bins of 1 Re; ${conv.count} sectors of ${conv.widthDeg} deg from the major axis towards +v, ${conv.folded ? 'folded' : 'not folded'}`);
  for (const role of ['tracer', 'starlight', 'sky'] as const) {
    const c = s.coverage.roles[role];
    if (!c) continue;
    if (role !== 'sky') {
      if (c.radialBins.length) lines.push(`  ${role} per 1-Re bin (0..${c.goalRe} Re): ${c.radialBins.map((b) => b.count).join(' ')}${c.beyondGoal ? `; beyond the goal: ${c.beyondGoal}` : ''}`);
      lines.push(`  ${role} per 45-deg sector from the major axis: ${c.sectors.map((b) => b.count).join(' ')}`);
    }
    // The starlight goal is judged by co-added S/N per bin (the "Integrated starlight" lines and goals), not by slit positions.
    const goal = role === 'sky' ? '' : role === 'starlight' ? ` (goal ${c.goalRe} Re${starlightGoalWord(s.coverage.starlightBins)} by co-added S/N per bin: see "Integrated starlight")`
      : ` (goal ${c.goalRe} Re${c.maxReachRe >= c.goalRe ? ', met' : c.maxReachRe >= 0.9 * c.goalRe ? ', 90 % met' : ', not met'})`;
    lines.push(`  ${role}: ${c.count} slits, reach ${f2(c.maxReachRe)} Re${goal}`);
    if (role === 'sky') continue;
    const emptySectors = c.sectors.filter((b) => b.count === 0).map((b) => `${b.fromDeg}-${b.toDeg}`);
    const bins = c.emptyBinsFromRe.length
      ? `empty goal bins ${c.emptyBinsFromRe.map((r) => `${r}-${Math.min(r + 1, c.goalRe)} Re`).join(', ')}`
      : c.radialBins.length ? 'every goal bin holds at least one slit' : 'no goal bins (goal 0 Re)';
    lines.push(`  ${role}: ${bins}; ${emptySectors.length ? `empty sectors ${emptySectors.join(', ')} deg` : 'no sector empty'}`);
  }
  if (s.weighting) {
    lines.push('weighting rules:');
    for (const r of s.weighting.rulesText) lines.push(`  ${r}`);
    const counts = exclusionCounts(s.weighting);
    lines.push(`  ${s.weighting.kept?.index.length ?? s.weighting.targets.length} targets kept, ${excludedCount(s.weighting)} excluded${counts.length ? ': ' + counts.map((c) => `${c.count} by ${c.rule}`).join(', ') : ''}`);
  }
  if (s.search) {
    const r = s.search;
    const against = r.startObjective
      ? `against ${f2(r.startObjective.total)} for the naive starting layout (tracer weight ${f2(r.objective.yieldWeight)} vs ${f2(r.startObjective.yieldWeight)})`
      : r.startAlignmentShort
      ? `(the naive starting layout lacks ${r.startAlignmentShort} alignment box(es): not a valid layout)`
      : `against at most ${f2(r.startObjectiveUpperBound ?? NaN)} for the naive starting layout (a proven upper bound; tracer weight ${f2(r.objective.yieldWeight)})`;
    lines.push(`pointing search: objective ${f2(r.objective.total)} ${against}; ${r.evaluations} evaluations, ${r.acceptedMoves} moves kept${r.keptStart ? '; starting layout kept' : ''}${r.startLayout && !r.keptStart ? `; searched from the "${r.startLayout}" layout` : ''}`);
  }
  return lines;
}

/** The whole summary of a solved plan, in the order of the module comment. */
export function planSummaryLines(s: PlanSummaryInput): string[] {
  return [
    ...maskSummaryLines(s), ...coverageSummaryLines(s),
    ...(s.spectralReport ? spectralSummaryLines(s.spectralReport) : []),
    ...(s.observingReport ? formatRefractionSummary(s.observingReport) : []),
  ];
}

/** The excluded targets as CSV: id,line,role,rule,reason (line as in the catalog report). */
export function excludedTargetsCsv(w: WeightingResult): string {
  // Row by row from the weighting's columns, joined a block of rows at a time: no object per excluded row and no
  // string per row outliving its block (a large catalog excludes hundreds of thousands of rows).
  const opts = { neutraliseFormulas: true };
  const blocks: string[] = [toCsv(['id', 'line', 'role', 'rule', 'reason'], [], opts)];
  let rows: string[] = [];
  forEachExcluded(w, (e) => {
    rows.push(`${csvCell(e.id, opts)},${csvCell(e.line, opts)},${csvCell(e.role, opts)},${csvCell(e.rule, opts)},${csvCell(e.reason, opts)}\n`);
    if (rows.length === 4096) { blocks.push(rows.join('')); rows = []; }
  });
  blocks.push(rows.join(''));
  return blocks.join('');
}
