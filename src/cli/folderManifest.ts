/**
 * `haloweave check`'s reading of an output folder's manifest (core/check/manifest.ts): every listed file present with
 * the same size and SHA-256, every contract output listed, and each mask's profile file the one the masks were
 * designed with. Node file access lives here; the comparisons are in core.
 */
import { existsSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { Violation } from '../core/check/checkOutput';
import { MANIFEST_FILE, checkManifestFiles, checkManifestProfile, parseManifest, profileDigest, type Manifest } from '../core/check/manifest';
import { sha256Hex } from './outputFolder';

/** The folder's manifest and the violations found reading it and comparing the files with it. */
export function checkFolderManifest(dir: string, shown: string): { manifest: Manifest | null; violations: Violation[] } {
  const source = join(shown, MANIFEST_FILE);
  const path = join(dir, MANIFEST_FILE);
  if (!existsSync(path)) {
    return { manifest: null, violations: [{ where: source, rule: 'manifest', what: 'file not found: the folder is incomplete (the run that wrote it stopped before its end) or was not written by haloweave plan; write it again with haloweave plan' }] };
  }
  const { manifest, violations } = parseManifest(readFileSync(path, 'utf8'), source);
  if (!manifest) return { manifest, violations };
  const probe = (name: string) => {
    const p = join(dir, name);
    if (name.includes('..') || !existsSync(p) || !statSync(p).isFile()) return null;
    const bytes = readFileSync(p);
    return { bytes: bytes.length, sha256: sha256Hex(bytes) };
  };
  return { manifest, violations: checkManifestFiles(manifest, probe, (n) => join(shown, n), source) };
}

/** The profile file of each mask instrument against the manifest's record of the profile the masks were designed with. */
export function checkProfileFiles(manifest: Manifest, profilePaths: ReadonlyMap<string, string>, shown: string): Violation[] {
  const out: Violation[] = [];
  for (const [id, path] of profilePaths) {
    let sha: string | null = null;
    try {
      sha = profileDigest(JSON.parse(readFileSync(path, 'utf8')), sha256Hex);
    } catch {
      sha = null;
    }
    out.push(...checkManifestProfile(manifest, id, sha, `profile ${path}`, join(shown, MANIFEST_FILE)));
  }
  return out;
}
