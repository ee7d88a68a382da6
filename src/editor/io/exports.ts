/**
 * Everything the editor exports: the files `haloweave plan` writes into its output folder (masks.csv,
 * slits.csv, coverage.json, solved.plan.json, catalog-report.csv, and manifest.json), the slit list in the other table
 * formats, and an SVG chart per mask.
 */
import type { CatalogReadResult } from '../../core/catalog/types';
import type { InstrumentProfile } from '../../core/profile/schema';
import { masksToCsv, slitsToCsv } from '../../core/export/slitsCsv';
import { catalogReportCsv } from '../../core/export/catalogReport';
import type { SolveResult } from '../worker/protocol';
import { maskChartSvg } from './maskChart';
import { MANIFEST_FILE, buildManifest, manifestText, profileDigest } from '../../core/check/manifest';
import { sha256HexOf } from '../../core/check/sha256';

export interface ExportFile {
  name: string;
  content: string | Uint8Array;
  mime: string;
}

/** The solved plan as written to solved.plan.json: every mask placed and locked, so a re-run reproduces these slits. */
export function solvedPlanText(result: SolveResult): string {
  const plan = { ...result.plan, masks: (result.plan.masks ?? []).map((m) => ({ ...m, locked: true })) };
  return JSON.stringify(plan, null, 2) + '\n';
}

/** The CLI's output folder files for this solution. */
export function outputFolderFiles(result: SolveResult, profile: InstrumentProfile, catalog: CatalogReadResult): ExportFile[] {
  // Rows of each mask in order of y, as `haloweave plan` writes them.
  const slits = result.masks.flatMap((m) => [...m.slits].sort((a, b) => a.yArcsec - b.yArcsec));
  const maskRows = result.masks.map((m) => ({ maskId: m.mask.id, instrument: profile.id, raDeg: m.mask.raDeg, decDeg: m.mask.decDeg, paDeg: m.mask.paDeg }));
  const files: ExportFile[] = [
    { name: 'masks.csv', content: masksToCsv(maskRows), mime: 'text/csv' },
    { name: 'slits.csv', content: slitsToCsv(slits), mime: 'text/csv' },
    { name: 'coverage.json', content: JSON.stringify(result.coverage, null, 2) + '\n', mime: 'application/json' },
    { name: 'solved.plan.json', content: solvedPlanText(result), mime: 'application/json' },
    { name: 'catalog-report.csv', content: catalogReportCsv(catalog.rejects), mime: 'text/csv' },
  ];
  // The manifest `haloweave check` requires of a complete folder: these files' sizes and hashes, and the profile.
  const bytes = new Map(files.map((f) => [f.name, typeof f.content === 'string' ? new TextEncoder().encode(f.content) : f.content]));
  const manifest = buildManifest(bytes, sha256HexOf, { writtenBy: 'haloweave editor 0.1.0', writtenUtc: new Date().toISOString(), profiles: [{ id: profile.id, sha256: profileDigest(profile) }] });
  return [...files, { name: MANIFEST_FILE, content: manifestText(manifest), mime: 'application/json' }];
}

/** Names of the output-folder files, in the order outputFolderFiles gives them. */
export const FOLDER_FILES = ['masks.csv', 'slits.csv', 'coverage.json', 'solved.plan.json', 'catalog-report.csv', 'manifest.json'] as const;

/** File name of a mask's SVG chart. */
export function maskChartName(maskId: string): string {
  return `mask-${maskId.replace(/[^A-Za-z0-9_.-]+/g, '_')}.svg`;
}

/** One SVG chart per mask. */
export function maskChartFiles(result: SolveResult, profile: InstrumentProfile, reachRe: number): ExportFile[] {
  return result.masks.map((ms) => ({
    name: maskChartName(ms.mask.id),
    content: maskChartSvg(ms, result.galaxy, profile, reachRe),
    mime: 'image/svg+xml',
  }));
}
