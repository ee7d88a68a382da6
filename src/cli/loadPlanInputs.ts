/**
 * Read a plan file and everything it names (Node file access): the instrument profile (a profile id looked up in
 * the package's instrument-profiles/ folder, or a path relative to the plan file) and the catalog (a path relative
 * to the plan file, any format the catalog reader detects). Every problem found is reported at once.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, isAbsolute, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { InputError, type Problem } from '../core/result';
import { parsePlan } from '../core/plan/validate';
import type { PlanFile } from '../core/plan/schema';
import { parseProfileText } from '../core/profile/load';
import type { InstrumentProfile } from '../core/profile/schema';
import { assertCatalogUsable } from '../core/catalog/read';
import { readCatalogFile } from './readCatalogFile';
import type { CatalogReadResult, ColumnMapping } from '../core/catalog/types';
import type { PlanInputs } from '../core/pipeline/pipeline';
import { planProfiles, planWithMaskInstruments } from '../core/plan/instruments';

/** The profile references a raw plan object names (`instrument`, or each `instruments[].profile`), with the field of each. */
export function namedProfiles(raw: Record<string, unknown>, source: string): { ref: string; where: string }[] {
  const out: { ref: string; where: string }[] = [];
  if (typeof raw.instrument === 'string' && raw.instrument !== '') out.push({ ref: raw.instrument, where: `${source}: instrument` });
  if (Array.isArray(raw.instruments)) {
    raw.instruments.forEach((i: unknown, k) => {
      const ref = i && typeof i === 'object' ? (i as Record<string, unknown>).profile : undefined;
      if (typeof ref === 'string' && ref !== '') out.push({ ref, where: `${source}: instruments.${k}.profile` });
    });
  }
  return out;
}

/** The package's instrument-profiles/ folder, found from this module's location (not the working directory). */
export const PACKAGE_PROFILE_DIR = fileURLToPath(new URL('../../instrument-profiles/', import.meta.url));

/** Ids of the profiles shipped with the package. */
export function packageProfileIds(): string[] {
  try {
    return readdirSync(PACKAGE_PROFILE_DIR).filter((f) => f.endsWith('.json')).map((f) => f.slice(0, -5)).sort();
  } catch {
    return [];
  }
}

/** True when an `instrument` value is meant as a file path rather than a profile id. */
export function looksLikePath(value: string): boolean {
  return value.endsWith('.json') || value.includes('/') || value.includes('\\');
}

/** Where an `instrument` value points: a package profile for an id, else a file relative to baseDir. */
export function profilePathFor(instrument: string, baseDir: string): string {
  if (!looksLikePath(instrument)) {
    const p = resolve(PACKAGE_PROFILE_DIR, `${instrument}.json`);
    if (existsSync(p)) return p;
  }
  return isAbsolute(instrument) ? instrument : resolve(baseDir, instrument);
}

/** Load the profile an `instrument` value names; `where` names the plan field in problems. */
export function loadProfile(instrument: string, baseDir: string, where: string): { profile: InstrumentProfile; path: string } {
  const path = profilePathFor(instrument, baseDir);
  if (!existsSync(path) || !statSync(path).isFile()) {
    const known = packageProfileIds();
    throw new InputError([{
      where,
      what: looksLikePath(instrument) ? `no profile file at ${path}` : `unknown instrument profile "${instrument}" (known: ${known.join(', ') || 'none'})`,
      fix: 'name a profile id from instrument-profiles/ or give the path of a profile file relative to the plan file',
    }]);
  }
  return { profile: parseProfileText(readFileSync(path, 'utf8'), path), path };
}

export interface LoadedPlan extends PlanInputs {
  planPath: string;
  profilePath: string;
  /** The file of every profile the plan names, by the reference the plan gives (`instrument` or `instruments[].profile`). */
  profilePaths: Record<string, string>;
  catalogPath: string;
  /** Things worth saying that do not stop the run (e.g. a profile file reusing a package profile's id). */
  warnings: string[];
}

/** A warning when a profile file outside the package reuses the id of a package profile with other content. */
export function profileIdClash(profile: InstrumentProfile, path: string): string | null {
  const own = resolve(PACKAGE_PROFILE_DIR, `${profile.id}.json`);
  if (resolve(path) === own || !existsSync(own)) return null;
  try {
    if (JSON.stringify(JSON.parse(readFileSync(own, 'utf8'))) === JSON.stringify(JSON.parse(readFileSync(path, 'utf8')))) return null;
  } catch {
    return null;
  }
  return `the profile file ${path} has the id "${profile.id}" of a different profile shipped with the package; masks.csv names profiles by id, so give your profile an id of its own`;
}

function problemsOf(e: unknown): Problem[] {
  if (e instanceof InputError) return e.problems;
  throw e;
}

/** Read a plan file, its profile and its catalog; throws InputError with every problem (one per field). */
export function loadPlanInputs(planPathArg: string): LoadedPlan {
  const planPath = resolve(planPathArg);
  const source = planPathArg;
  if (!existsSync(planPath) || !statSync(planPath).isFile()) {
    throw new InputError([{ where: source, what: 'plan file not found', fix: 'give the path of a *.plan.json file' }]);
  }
  let json: unknown;
  try {
    json = JSON.parse(readFileSync(planPath, 'utf8'));
  } catch (e) {
    throw new InputError([{ where: source, what: `not valid JSON: ${(e as Error).message}` }]);
  }
  const baseDir = dirname(planPath);
  const problems: Problem[] = [];
  let plan: PlanFile | null = null;
  try {
    plan = parsePlan(json, source);
  } catch (e) {
    problems.push(...problemsOf(e));
  }
  // Check what the plan names even when other keys are wrong, so every problem is reported in one run.
  const raw = (json && typeof json === 'object' ? json : {}) as Record<string, unknown>;
  const loaded = new Map<string, { profile: InstrumentProfile; path: string }>();
  for (const { ref, where } of namedProfiles(raw, source)) {
    if (loaded.has(ref)) continue;
    try {
      loaded.set(ref, loadProfile(ref, baseDir, where));
    } catch (e) {
      problems.push(...problemsOf(e));
    }
  }
  const loadedProfile = loaded.values().next().value ?? null;
  const profiles: Record<string, InstrumentProfile> = {}, profilePaths: Record<string, string> = {};
  for (const [ref, l] of loaded) { profiles[ref] = l.profile; profilePaths[ref] = l.path; }
  if (plan && !problems.length) {
    try {
      // Masks naming a spectrograph the plan does not list, or two files sharing a profile id.
      planWithMaskInstruments(plan, profiles, source);
      planProfiles(plan, profiles, source);
    } catch (e) {
      problems.push(...problemsOf(e));
    }
  }
  let catalogPath = '';
  if (typeof raw.catalog === 'string' && raw.catalog !== '') {
    catalogPath = resolve(baseDir, raw.catalog);
    if (!existsSync(catalogPath) || !statSync(catalogPath).isFile()) {
      problems.push({ where: `${source}: catalog`, what: `catalog file "${raw.catalog}" not found (looked at ${catalogPath})`, fix: 'give the catalog path relative to the plan file' });
    }
  }
  if (problems.length || !plan || !loadedProfile) throw new InputError(problems);
  // Streaming for CSV/TSV/ECSV (large catalogs), whole-file for VOTable and FITS.
  const catalog: CatalogReadResult = readCatalogFile(catalogPath, plan.catalogColumns as ColumnMapping | undefined, { source: plan.catalog });
  assertCatalogUsable(catalog);
  const clashes = [...loaded.values()].map((l) => profileIdClash(l.profile, l.path)).filter((c): c is string => c !== null);
  return { plan, profile: loadedProfile.profile, profiles, profilePaths, catalog, planPath, profilePath: loadedProfile.path, catalogPath, warnings: clashes };
}
