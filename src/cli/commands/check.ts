/**
 * `haloweave check DIR`: re-check an output folder from its files alone; prints each violation, non-zero exit on
 * any. Besides the mask rules (core/check/checkOutput.ts) it recounts coverage.json from slits.csv, compares
 * solved.plan.json's masks with masks.csv, and, when the catalog solved.plan.json names can be read, checks that no
 * used object comes from a catalog line that catalog-report.csv lists as not used.
 */
import { existsSync, readFileSync } from 'node:fs';
import { isAbsolute, join, resolve } from 'node:path';
import type { CliIO } from '../io';
import { parseArgs, unknownOptions } from '../args';
import { InputError } from '../../core/result';
import { parseMasksCsv, parseSlitsCsv } from '../../core/export/slitsCsv';
import { parseCsvRecords } from '../../core/catalog/csvReader';
import { unneutraliseCell } from '../../core/export/csvText';
import { galaxyModel, parsePlanText } from '../../core/plan/validate';
import type { InstrumentProfile } from '../../core/profile/schema';
import type { ColumnMapping } from '../../core/catalog/types';
import { checkOutput, formatViolation, type Violation } from '../../core/check/checkOutput';
import { checkCoverage } from '../../core/check/coverageRecount';
import { checkStarlightBins } from '../../core/check/starlightRecount';
import { checkCatalogUse, checkPlanMasks, type ReportRow } from '../../core/check/consistency';
import { loadProfile } from '../loadPlanInputs';
import { readCatalogFile } from '../readCatalogFile';
import { checkFolderManifest, checkProfileFiles } from '../folderManifest';
import { checkCatalogValues, checkColumnOrder, checkProfileValues, checkSectorConvention } from '../../core/check/derivedValues';
import { MASK_COLUMNS, SLIT_COLUMNS } from '../../core/export/slitsCsv';
import { targetWeights } from '../../core/pipeline/pipeline';
import type { Slit } from '../../core/geometry/maskSolution';
import type { Target } from '../../core/catalog/types';
import { planInstrumentRefs } from '../../core/plan/instruments';
import { checkPlanInstruments } from '../../core/check/instrumentCounts';

function readIn(dir: string, name: string): string {
  const p = join(dir, name);
  if (!existsSync(p)) throw new InputError([{ where: p, what: 'file not found', fix: 'give an output folder written by `haloweave plan`' }]);
  return readFileSync(p, 'utf8');
}

/** File lines (counting the header) of the data rows of one of the folder's CSV files, blank lines skipped. */
export function dataRowLines(text: string): number[] {
  return parseCsvRecords(text).slice(1).filter((r) => !(r.cells.length === 1 && r.cells[0].trim() === '')).map((r) => r.line);
}

/** catalog-report.csv rows (line,column,reason), and a violation for each row whose line is not a 1-based number. */
function parseReport(text: string, source: string): { rows: ReportRow[]; violations: Violation[] } {
  const records = parseCsvRecords(text).filter((r) => !(r.cells.length === 1 && r.cells[0].trim() === ''));
  const violations: Violation[] = [];
  const header = records[0]?.cells.map((c) => c.trim()) ?? [];
  if (header.join(',') !== 'line,column,reason') return { rows: [], violations: [{ where: `${source} line 1`, rule: 'catalog report', what: `the header is "${header.join(',')}", not line,column,reason` }] };
  const rows: ReportRow[] = [];
  for (const r of records.slice(1)) {
    const n = Number(r.cells[0]);
    if (!Number.isInteger(n) || n < 1) violations.push({ where: `${source} line ${r.line}`, rule: 'catalog report', what: `line "${r.cells[0]}" is not a 1-based line number` });
    else rows.push({ catalogLine: n, column: unneutraliseCell(r.cells[1] ?? ''), reason: unneutraliseCell(r.cells[2] ?? ''), reportLine: r.line });
  }
  return { rows, violations };
}

export async function run(argv: string[], io: CliIO): Promise<number> {
  const args = parseArgs(argv);
  const bad = unknownOptions(args, []);
  if (args.positionals.length !== 1 || bad.length) {
    io.err('usage: haloweave check DIR');
    return 2;
  }
  const shown = args.positionals[0];
  const dir = resolve(shown);
  const masksText = readIn(dir, 'masks.csv');
  const slitsText = readIn(dir, 'slits.csv');
  const masks = parseMasksCsv(masksText, join(dir, 'masks.csv'));
  const slits = parseSlitsCsv(slitsText, join(dir, 'slits.csv'));
  const maskLines = dataRowLines(masksText);
  const slitLines = dataRowLines(slitsText);
  const planSource = join(dir, 'solved.plan.json');
  const plan = parsePlanText(readIn(dir, 'solved.plan.json'), planSource);
  // A masks.csv instrument is a profile id: the profile solved.plan.json names (id or file relative to the folder) when
  // its id matches, else the package profile of that id.
  const cache = new Map<string, InstrumentProfile | null>();
  const profilePaths = new Map<string, string>();
  const profileFor = (instrument: string): InstrumentProfile | null => {
    if (cache.has(instrument)) return cache.get(instrument)!;
    let found: InstrumentProfile | null = null;
    // The plan's own profile first (a file may reuse a package id with other numbers), then the package's.
    const planRefs = planInstrumentRefs(plan);
    for (const ref of [...planRefs, instrument]) {
      try {
        const { profile: p, path } = loadProfile(ref, dir, `${planSource}: instrument`);
        if (p.id === instrument || (ref === instrument && !planRefs.includes(ref))) { found = p; profilePaths.set(instrument, path); break; }
      } catch {
        // try the next reference
      }
    }
    cache.set(instrument, found);
    return found;
  };
  const src = (name: string) => join(shown, name);
  // The manifest first: a folder whose run did not finish, or whose files were changed since, is not a valid output.
  const folderManifest = checkFolderManifest(dir, shown);
  const violations = checkOutput({
    masks, slits, profileFor, linesRestA: plan.goals.linesA, vsysKms: plan.galaxy.vsysKms,
    velocityHalfRangeKms: plan.goals.velocityHalfRangeKms, lineHalfWindowA: plan.goals.lineHalfWindowA,
    slitsSource: src('slits.csv'), masksSource: src('masks.csv'), slitLines, maskLines,
  });
  violations.unshift(...folderManifest.violations);
  // Values re-derived from the profile, and the contract's column order.
  const rowWhere = (i: number, s: Slit) => `${src('slits.csv')} line ${slitLines[i] ?? i + 2} (mask ${s.maskId}, slit ${s.slitId})`;
  violations.push(...checkProfileValues(masks, slits, profileFor, rowWhere));
  violations.push(...checkColumnOrder(parseCsvRecords(slitsText)[0]?.cells ?? [], SLIT_COLUMNS, src('slits.csv')));
  violations.push(...checkColumnOrder(parseCsvRecords(masksText)[0]?.cells ?? [], MASK_COLUMNS, src('masks.csv')));
  if (folderManifest.manifest) violations.push(...checkProfileFiles(folderManifest.manifest, profilePaths, shown));
  violations.push(...checkPlanMasks(plan.masks ?? [], masks, { planSource: src('solved.plan.json'), masksSource: src('masks.csv'), maskLines }));
  const idOfRef = (ref: string): string | null => {
    try {
      return loadProfile(ref, dir, `${planSource}: instruments`).profile.id;
    } catch {
      return null;
    }
  };
  violations.push(...checkPlanInstruments(plan, masks, idOfRef, { planSource: src('solved.plan.json'), masksSource: src('masks.csv'), maskLines }));

  // coverage.json against a recount from slits.csv.
  const covPath = join(dir, 'coverage.json');
  if (!existsSync(covPath)) violations.push({ where: src('coverage.json'), rule: 'coverage', what: 'file not found' });
  else {
    let coverage: unknown = null;
    try {
      coverage = JSON.parse(readFileSync(covPath, 'utf8'));
    } catch (e) {
      violations.push({ where: src('coverage.json'), rule: 'coverage', what: `not valid JSON: ${(e as Error).message}` });
    }
    if (coverage !== null) violations.push(...checkSectorConvention(coverage, src('coverage.json')));
    if (coverage !== null) violations.push(...checkCoverage({ coverage, galaxy: galaxyModel(plan), goals: plan.goals, slits, coverageSource: src('coverage.json'), slitsSource: src('slits.csv') }));
    // Co-added starlight per bin, re-derived from the slits, the plan and each mask's profile.
    if (coverage !== null) violations.push(...checkStarlightBins({ coverage, plan, galaxy: galaxyModel(plan), masks, slits, profileFor, coverageSource: src('coverage.json'), rowWhere: (i) => rowWhere(i, slits[i]) }));
  }

  // Used objects against the catalog and catalog-report.csv.
  let catalogNote = 'catalog not cross-checked';
  const reportPath = join(dir, 'catalog-report.csv');
  if (!existsSync(reportPath)) violations.push({ where: src('catalog-report.csv'), rule: 'catalog report', what: 'file not found' });
  else {
    const report = parseReport(readFileSync(reportPath, 'utf8'), src('catalog-report.csv'));
    violations.push(...report.violations);
    const catalogPath = isAbsolute(plan.catalog) ? plan.catalog : join(dir, plan.catalog);
    try {
      const catalog = readCatalogFile(catalogPath, plan.catalogColumns as ColumnMapping | undefined, { source: plan.catalog });
      const linesById = new Map<string, number[]>();
      for (const t of catalog.targets) linesById.set(t.id, [...(linesById.get(t.id) ?? []), t.line]);
      violations.push(...checkCatalogUse(slits, linesById, report.rows, { slitsSource: src('slits.csv'), catalogSource: plan.catalog, reportSource: src('catalog-report.csv'), slitLines }));
      // Position, mag, role and weight of every used object, from its catalog row and the plan's weighting rules.
      const targetsById = new Map<string, Target[]>();
      for (const t of catalog.targets) targetsById.set(t.id, [...(targetsById.get(t.id) ?? []), t]);
      const weights = targetWeights(plan, catalog.targets, []);
      const indexOf = new Map(catalog.targets.map((t, k) => [t, k]));
      violations.push(...checkCatalogValues(slits, targetsById, (t) => weights[indexOf.get(t)!] ?? null, rowWhere, plan.catalog));
      catalogNote = `objects, positions, mags and weights against ${plan.catalog} and catalog-report.csv`;
    } catch (e) {
      if (!(e instanceof InputError)) throw e;
      catalogNote = `catalog not cross-checked (${plan.catalog} could not be read from ${shown}: ${e.problems[0]?.what ?? e.message})`;
    }
  }

  for (const v of violations) io.err(`haloweave check: ${formatViolation(v)}`);
  if (violations.length) {
    io.err(`haloweave check: ${violations.length} violation${violations.length > 1 ? 's' : ''} in ${shown}`);
    return 1;
  }
  io.out(`haloweave check: ${shown} passes: ${slits.length} rows on ${masks.length} masks (manifest and file hashes, profile identity, footprint, gap, lengths, wavelength, objects once, sky positions, alignment boxes, coverage recount, co-added starlight bins, solved.plan.json masks, ${catalogNote})`);
  return 0;
}
