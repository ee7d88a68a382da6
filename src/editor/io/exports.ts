/**
 * Everything the editor exports: the files `haloweave plan` writes into its output folder (masks.csv,
 * slits.csv, coverage.json, solved.plan.json, catalog-report.csv, and manifest.json), the slit list in the other table
 * formats, and an SVG chart per mask.
 */
import type { CatalogReadResult } from '../../core/catalog/types';
import type { InstrumentProfile } from '../../core/profile/schema';
import { masksToCsv, slitsToCsv, type MaskRow } from '../../core/export/slitsCsv';
import { editorPlanProfiles } from './planProfiles';
import { catalogReportCsv } from '../../core/export/catalogReport';
import { excludedTargetsCsv } from '../../core/pipeline/summary';
import type { WeightingResult } from '../../core/solver/weighting';
import { weighPlanTargets } from '../../core/pipeline/pipeline';
import type { SolveResult } from '../worker/protocol';
import type { LoadedFile } from '../session';
import { maskChartSvg } from './maskChart';
import { MANIFEST_FILE, buildManifest, manifestText, profileDigest } from '../../core/check/manifest';
import { sha256HexOf } from '../../core/check/sha256';
import { ownProfileFileName, profileFileText } from './profileFile';
import { strToU8, zipSync } from 'fflate';

export interface ExportFile {
  name: string;
  content: string | Uint8Array;
  mime: string;
}

/** The catalog and instrument values solved.plan.json names (files written beside it in the folder). */
export interface FolderPaths { catalog?: string; instrument?: string }

/**
 * The solved plan as written to solved.plan.json: every mask placed and locked, so a re-run reproduces these slits.
 * `paths` rewrites the plan's catalog and instrument (files written beside it in an output folder).
 */
export function solvedPlanText(result: SolveResult, paths: FolderPaths = {}): string {
  const { instrument, ...rest } = paths;
  // A plan with several spectrographs names the document's own profile file as its first instrument.
  const instruments = result.plan.instruments;
  const own = instrument === undefined ? {} : instruments?.length
    ? { instruments: instruments.map((x, k) => (k === 0 ? { ...x, profile: instrument } : x)) }
    : { instrument };
  const plan = { ...result.plan, ...rest, ...own, masks: (result.plan.masks ?? []).map((m) => ({ ...m, locked: true })) };
  return JSON.stringify(plan, null, 2) + '\n';
}

/** The CLI's output folder files for this solution (solved.plan.json naming the catalog and profile as `paths` says). */
export function outputFolderFiles(result: SolveResult, profile: InstrumentProfile, catalog: CatalogReadResult, paths: FolderPaths = {}): ExportFile[] {
  // Rows of each mask in order of y, as `haloweave plan` writes them.
  const slits = result.masks.flatMap((m) => [...m.slits].sort((a, b) => a.yArcsec - b.yArcsec));
  const maskRows = maskRowsOf(result, profile);
  const files: ExportFile[] = [
    { name: 'masks.csv', content: masksToCsv(maskRows), mime: 'text/csv' },
    { name: 'slits.csv', content: slitsToCsv(slits), mime: 'text/csv' },
    // A full solve's goal report (extra.goals) goes into coverage.json as `haloweave plan` writes it; a drag preview has none.
    { name: 'coverage.json', content: JSON.stringify(Array.isArray(result.extra.goals) ? { ...(result.coverage as object), goals: result.extra.goals } : result.coverage, null, 2) + '\n', mime: 'application/json' },
    { name: 'solved.plan.json', content: solvedPlanText(result, paths), mime: 'application/json' },
    { name: 'catalog-report.csv', content: catalogReportCsv(catalog.rejects), mime: 'text/csv' },
  ];
  return withManifest(files, resultProfiles(result, profile));
}

/** masks.csv rows of a solution: each mask with its own instrument (plan key instruments), else the document's profile. */
export function maskRowsOf(result: SolveResult, profile: InstrumentProfile): MaskRow[] {
  return result.masks.map((m) => ({ maskId: m.mask.id, instrument: m.mask.instrument ?? profile.id, raDeg: m.mask.raDeg, decDeg: m.mask.decDeg, paDeg: m.mask.paDeg }));
}

/** Every profile the solution's masks use, each once, the document's first (a plan of one spectrograph: the document's). */
function resultProfiles(result: SolveResult, profile: InstrumentProfile): InstrumentProfile[] {
  const all = [profile, ...Object.values(editorPlanProfiles(result.plan, profile) ?? {})];
  return all.filter((p, k) => all.findIndex((q) => q.id === p.id) === k);
}

/** `files` followed by the manifest `haloweave check` requires of a complete folder: every file's size and hash, and the profiles. */
function withManifest(files: readonly ExportFile[], profiles: readonly InstrumentProfile[]): ExportFile[] {
  const own = files.filter((f) => f.name !== MANIFEST_FILE);
  const bytes = new Map(own.map((f) => [f.name, typeof f.content === 'string' ? new TextEncoder().encode(f.content) : f.content]));
  const manifest = buildManifest(bytes, sha256HexOf, {
    writtenBy: 'haloweave editor 0.1.0', writtenUtc: new Date().toISOString(), profiles: profiles.map((p) => ({ id: p.id, sha256: profileDigest(p) })),
  });
  return [...own, { name: MANIFEST_FILE, content: manifestText(manifest), mime: 'application/json' }];
}

/** The weighting of a full solve (passed through by the worker), or the same rules applied again (a drag preview has none). */
function weightingOf(result: SolveResult, catalog: CatalogReadResult): WeightingResult {
  const w = result.extra.weighting as WeightingResult | undefined;
  if (w && Array.isArray(w.excluded)) return w;
  return weighPlanTargets(result.plan, catalog.targets);
}

/** The folder name of the archive: the plan's name without `.plan.json`, then `-out`. */
export function archiveFolderName(planName: string): string {
  const base = planName.split(/[\\/]/).pop()!.replace(/\.plan\.json$/i, '').replace(/\.json$/i, '').replace(/[^A-Za-z0-9_.-]+/g, '_');
  return `${base || 'plan'}-out`;
}

/**
 * Every file of a complete output folder, as `haloweave plan` writes it plus its inputs, so `haloweave check` on the
 * unpacked folder cross-checks the catalog: the five contract files, excluded-targets.csv, the catalog itself (named
 * by solved.plan.json) and, for a profile that is not one of the shipped ones, the profile file (named likewise).
 */
export function completeFolderFiles(result: SolveResult, profile: InstrumentProfile, catalog: CatalogReadResult, catalogFile: LoadedFile | null): ExportFile[] {
  const taken = new Set<string>([...FOLDER_FILES, 'excluded-targets.csv']);
  const free = (name: string) => (taken.has(name) ? `input-${name}` : name);
  const catalogName = catalogFile ? free(catalogFile.name.split(/[\\/]/).pop() || 'catalog.csv') : undefined;
  const own = ownProfileFileName(profile);
  const profileName = own ? free(own) : undefined;
  const paths: FolderPaths = { ...(catalogName ? { catalog: catalogName } : {}), ...(profileName ? { instrument: profileName } : {}) };
  const files = outputFolderFiles(result, profile, catalog, paths);
  files.push({ name: 'excluded-targets.csv', content: excludedTargetsCsv(weightingOf(result, catalog)), mime: 'text/csv' });
  if (catalogFile && catalogName) files.push({ name: catalogName, content: catalogFile.content, mime: 'application/octet-stream' });
  if (profileName) files.push({ name: profileName, content: profileFileText(profile), mime: 'application/json' });
  return withManifest(files, resultProfiles(result, profile));
}

/** A zip archive holding `files` in one folder `folder/` (deflated; dates left at the archive's default). */
export function zipFolder(folder: string, files: readonly ExportFile[]): Uint8Array {
  const entries: Record<string, Uint8Array> = {};
  for (const f of files) entries[`${folder}/${f.name}`] = typeof f.content === 'string' ? strToU8(f.content) : f.content;
  return zipSync(entries, { level: 6 });
}

/** Names of the output-folder files, in the order outputFolderFiles gives them. */
export const FOLDER_FILES = ['masks.csv', 'slits.csv', 'coverage.json', 'solved.plan.json', 'catalog-report.csv', 'manifest.json'] as const;

/** File name of a mask's SVG chart. */
export function maskChartName(maskId: string): string {
  return `mask-${maskId.replace(/[^A-Za-z0-9_.-]+/g, '_')}.svg`;
}

/** One SVG chart per mask, each with its own profile's footprint. */
export function maskChartFiles(result: SolveResult, profile: InstrumentProfile, reachRe: number): ExportFile[] {
  // Each mask drawn with its own instrument's footprint (plan key instruments).
  const byId = new Map(resultProfiles(result, profile).map((p) => [p.id, p]));
  return result.masks.map((ms) => ({
    name: maskChartName(ms.mask.id),
    content: maskChartSvg(ms, result.galaxy, byId.get(ms.mask.instrument ?? profile.id) ?? profile, reachRe),
    mime: 'image/svg+xml',
  }));
}
