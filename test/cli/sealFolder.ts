/**
 * Test helper: rewrite an output folder's manifest.json so that it matches the files as they are now (sizes and
 * SHA-256 from node:crypto), as if the edited folder had been written that way. Tests of `haloweave check`'s rule
 * re-derivation use it, so that a corruption is caught by the rule it breaks and not only by the manifest.
 */
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';

/** Re-hash every file the manifest of `dir` lists. */
export function resealManifest(dir: string): void {
  const path = join(dir, 'manifest.json');
  const m = JSON.parse(readFileSync(path, 'utf8'));
  for (const f of m.files) {
    const bytes = readFileSync(join(dir, f.name));
    f.bytes = bytes.length;
    f.sha256 = createHash('sha256').update(bytes).digest('hex');
  }
  writeFileSync(path, JSON.stringify(m, null, 2) + '\n');
}
