/**
 * The manifest of an output folder (manifest.json, format `haloweave.manifest/1`): written last, after every other
 * file of the folder, it lists each file with its size in bytes and SHA-256, and the instrument profiles the masks
 * were designed with (id and SHA-256 of the profile's content, keys sorted). A folder without it is incomplete (a run that stopped
 * before its end); a file whose bytes differ from its entry was altered after the run. Pure: the caller hashes.
 */
import type { Violation } from './checkOutput';
import { sha256HexOf } from './sha256';

export const MANIFEST_FILE = 'manifest.json';
export const MANIFEST_FORMAT = 'haloweave.manifest/1';
/** The files every complete output folder of `haloweave plan` holds (the interface contract's outputs). */
export const CONTRACT_OUTPUT_FILES = ['masks.csv', 'slits.csv', 'coverage.json', 'solved.plan.json', 'catalog-report.csv'] as const;

/** One file of the folder: name (relative to the folder), size in bytes, SHA-256 as 64 lowercase hex digits. */
export interface ManifestFile { name: string; bytes: number; sha256: string }
/** A profile the masks were designed with: its id, and the SHA-256 of its canonical JSON (profileDigest). */
export interface ManifestProfile { id: string; sha256: string }

export interface Manifest {
  format: typeof MANIFEST_FORMAT;
  /** The program and version that wrote the folder. */
  writtenBy: string;
  /** When the folder was completed, ISO 8601 UTC. */
  writtenUtc: string;
  files: ManifestFile[];
  profiles: ManifestProfile[];
}

/** JSON text of a value with every object's keys sorted, no spaces: the same for the same content in any key order. */
export function canonicalJson(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonicalJson).join(',')}]`;
  if (v && typeof v === 'object') {
    const o = v as Record<string, unknown>;
    return `{${Object.keys(o).filter((k) => o[k] !== undefined).sort().map((k) => `${JSON.stringify(k)}:${canonicalJson(o[k])}`).join(',')}}`;
  }
  return JSON.stringify(v) ?? 'null';
}

/**
 * SHA-256 of a profile's canonical JSON (a file's layout and key order do not count, every value does); `sha256Hex`
 * may be the platform's own hash (the command line passes node:crypto's), the same digest as the built-in one.
 */
export function profileDigest(profileJson: unknown, sha256Hex: (b: Uint8Array) => string = sha256HexOf): string {
  return sha256Hex(new TextEncoder().encode(canonicalJson(profileJson)));
}

/** The manifest of `files` (name -> bytes), each hashed with `sha256Hex`, in name order. */
export function buildManifest(files: ReadonlyMap<string, Uint8Array>, sha256Hex: (b: Uint8Array) => string, meta: { writtenBy: string; writtenUtc: string; profiles: ManifestProfile[] }): Manifest {
  const names = [...files.keys()].filter((n) => n !== MANIFEST_FILE).sort();
  return {
    format: MANIFEST_FORMAT,
    writtenBy: meta.writtenBy,
    writtenUtc: meta.writtenUtc,
    files: names.map((name) => ({ name, bytes: files.get(name)!.length, sha256: sha256Hex(files.get(name)!) })),
    profiles: meta.profiles,
  };
}

/** The manifest's text: JSON, two-space indented, newline at the end. */
export function manifestText(m: Manifest): string {
  return JSON.stringify(m, null, 2) + '\n';
}

const isObj = (x: unknown): x is Record<string, unknown> => !!x && typeof x === 'object' && !Array.isArray(x);

/** Parse manifest text; returns the manifest or the violations that make it unusable. */
export function parseManifest(text: string, source: string): { manifest: Manifest | null; violations: Violation[] } {
  const bad = (what: string) => ({ manifest: null, violations: [{ where: source, rule: 'manifest', what }] });
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    return bad(`not valid JSON (${(e as Error).message}); the folder was altered or its run did not finish`);
  }
  if (!isObj(json) || json.format !== MANIFEST_FORMAT) return bad(`format is not "${MANIFEST_FORMAT}"`);
  const files = json.files;
  if (!Array.isArray(files) || !files.every((f) => isObj(f) && typeof f.name === 'string' && Number.isInteger(f.bytes) && typeof f.sha256 === 'string' && /^[0-9a-f]{64}$/.test(f.sha256))) {
    return bad('"files" must list {name, bytes, sha256} for every file of the folder');
  }
  const profiles = Array.isArray(json.profiles) ? json.profiles.filter((p): p is ManifestProfile => isObj(p) && typeof p.id === 'string' && typeof p.sha256 === 'string') : [];
  return {
    manifest: { format: MANIFEST_FORMAT, writtenBy: String(json.writtenBy ?? ''), writtenUtc: String(json.writtenUtc ?? ''), files: files as ManifestFile[], profiles },
    violations: [],
  };
}

/** What the folder holds now under a name: its size and SHA-256, or null when there is no such file. */
export type FileProbe = (name: string) => { bytes: number; sha256: string } | null;

/**
 * Every file the manifest lists must be in the folder with the same size and hash, and it must list every contract
 * output. `where(name)` names a file in messages.
 */
export function checkManifestFiles(m: Manifest, probe: FileProbe, where: (name: string) => string, manifestSource: string): Violation[] {
  const out: Violation[] = [];
  const listed = new Set(m.files.map((f) => f.name));
  for (const name of CONTRACT_OUTPUT_FILES) {
    if (!listed.has(name)) out.push({ where: manifestSource, rule: 'manifest', what: `does not list ${name}, an output every complete folder holds` });
  }
  for (const f of m.files) {
    const now = probe(f.name);
    if (!now) out.push({ where: where(f.name), rule: 'manifest', what: `file not found, but ${manifestSource} lists it (${f.bytes} bytes): the folder is incomplete` });
    else if (now.bytes !== f.bytes || now.sha256 !== f.sha256) {
      out.push({ where: where(f.name), rule: 'manifest', what: `was changed after the run wrote it (${now.bytes} bytes now, ${f.bytes} written; SHA-256 differs); re-run haloweave plan rather than editing an output` });
    }
  }
  return out;
}

/** The profile a mask names now against the one the manifest says it was designed with (by SHA-256 of the file). */
export function checkManifestProfile(m: Manifest, id: string, sha256Now: string | null, profileWhere: string, manifestSource: string): Violation[] {
  const rec = m.profiles.find((p) => p.id === id);
  if (!rec) return [{ where: manifestSource, rule: 'profile identity', what: `names no profile "${id}", which masks.csv uses` }];
  if (sha256Now !== null && rec.sha256 !== sha256Now) {
    return [{ where: profileWhere, rule: 'profile identity', what: `is not the profile "${id}" the masks were designed with (its SHA-256 differs from ${manifestSource}); check against the profile file the plan was solved with` }];
  }
  return [];
}
