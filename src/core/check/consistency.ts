/**
 * Cross-file checks of an output folder: solved.plan.json's masks against masks.csv (centre in ICRS degrees, PA in
 * degrees East of North), and the used objects of slits.csv against the catalog and catalog-report.csv (a catalog
 * line the report lists as not used must not carry a slit). Messages name the file and its line (counting the
 * header) or key.
 */
import type { Slit } from '../geometry/maskSolution';
import type { Violation, CheckedMask } from './checkOutput';

/** Tolerance for solved.plan.json vs masks.csv angles (degrees, about 4 micro-arcsec): both hold the same doubles. */
export const ANGLE_TOL_DEG = 1e-9;

/** A mask of solved.plan.json as the checker reads it. */
export interface PlanMaskEntry { id: string; raDeg?: number; decDeg?: number; paDeg?: number }

/** Difference of two angles in degrees, wrapped into [0, 180]. */
function angleDiffDeg(a: number, b: number): number {
  const d = Math.abs(a - b) % 360;
  return d > 180 ? 360 - d : d;
}

/** solved.plan.json masks against masks.csv rows: each mask in both, with the same raDeg/decDeg/paDeg. */
export function checkPlanMasks(planMasks: readonly PlanMaskEntry[], masks: readonly CheckedMask[], opts: { planSource?: string; masksSource?: string; maskLines?: readonly number[] } = {}): Violation[] {
  const out: Violation[] = [];
  const planSrc = opts.planSource ?? 'solved.plan.json';
  const masksSrc = opts.masksSource ?? 'masks.csv';
  const lineOf = (i: number) => opts.maskLines?.[i] ?? i + 2;
  const rowIndex = new Map(masks.map((m, i) => [m.maskId, i]));
  const inPlan = new Set<string>();
  planMasks.forEach((pm, k) => {
    const where = `${planSrc} masks[${k}] (id ${pm.id})`;
    inPlan.add(pm.id);
    const i = rowIndex.get(pm.id);
    if (i === undefined) { out.push({ where, rule: 'plan masks', what: `mask ${pm.id} has no row in ${masksSrc}` }); return; }
    const m = masks[i];
    const pairs: [string, number | undefined, string, number][] = [['raDeg', pm.raDeg, 'ra_deg', m.raDeg], ['decDeg', pm.decDeg, 'dec_deg', m.decDeg], ['paDeg', pm.paDeg, 'pa_deg', m.paDeg]];
    for (const [key, planValue, column, csvValue] of pairs) {
      if (typeof planValue !== 'number' || !(angleDiffDeg(planValue, csvValue) <= ANGLE_TOL_DEG)) {
        out.push({ where: `${where}.${key}`, rule: 'plan masks', what: `${planValue === undefined ? 'missing' : String(planValue)}, but ${masksSrc} line ${lineOf(i)} has ${column} ${csvValue}` });
      }
    }
  });
  masks.forEach((m, i) => {
    if (!inPlan.has(m.maskId)) out.push({ where: `${masksSrc} line ${lineOf(i)} (mask ${m.maskId})`, rule: 'plan masks', what: `mask ${m.maskId} is not among the masks of ${planSrc}` });
  });
  return out;
}

/** One row of catalog-report.csv: the catalog line it names and its own line in the report file. */
export interface ReportRow { catalogLine: number; column: string; reason: string; reportLine: number }

/** Used objects against the catalog re-read: tracer and alignment objects come from a usable catalog line the report does not list. */
export function checkCatalogUse(slits: readonly Slit[], catalogLinesById: ReadonlyMap<string, readonly number[]>, report: readonly ReportRow[], opts: { slitsSource?: string; catalogSource?: string; reportSource?: string; slitLines?: readonly number[] } = {}): Violation[] {
  const out: Violation[] = [];
  const slitsSrc = opts.slitsSource ?? 'slits.csv';
  const catSrc = opts.catalogSource ?? 'the catalog';
  const repSrc = opts.reportSource ?? 'catalog-report.csv';
  const reported = new Map<number, ReportRow>();
  for (const r of report) if (!reported.has(r.catalogLine)) reported.set(r.catalogLine, r);
  slits.forEach((s, i) => {
    if (s.objectId === '' || (s.role !== 'tracer' && s.role !== 'alignment')) return;
    const where = `${slitsSrc} line ${opts.slitLines?.[i] ?? i + 2} (mask ${s.maskId}, slit ${s.slitId})`;
    const lines = catalogLinesById.get(s.objectId) ?? [];
    if (lines.length === 0) { out.push({ where, rule: 'catalog', what: `object ${s.objectId} is not a usable row of ${catSrc}` }); return; }
    const listed = lines.map((l) => reported.get(l)).filter((r): r is ReportRow => r !== undefined);
    if (listed.length === lines.length) {
      const r = listed[0];
      out.push({ where, rule: 'catalog', what: `object ${s.objectId} is on ${catSrc} line ${r.catalogLine}, which ${repSrc} line ${r.reportLine} lists as not used (${r.column}: ${r.reason})` });
    }
  });
  return out;
}
