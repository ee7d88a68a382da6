// Whether the prebuilt command-line bundle (dist/cli/, made by bin/build-cli.js) still matches the sources.
// build-info.json lists every source file bundled with its size and modification time; the bundle is current only
// while all of them are unchanged (an edit, a checkout or a removed file makes it stale). Plain JavaScript, no
// dependencies: the launcher runs this before anything else is loaded.
import { readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';

/** Folder of the bundle below the package root. */
export const BUNDLE_DIR = 'dist/cli';
/** The bundle's dispatcher, in BUNDLE_DIR; it exports main(argv). */
export const BUNDLE_ENTRY = 'main.cjs';

/** Why the bundle under `root` cannot be used (missing, or a source changed since it was built), or null when current. */
export function bundleStaleReason(root) {
  let info;
  try {
    info = JSON.parse(readFileSync(join(root, BUNDLE_DIR, 'build-info.json'), 'utf8'));
  } catch {
    return 'no prebuilt bundle';
  }
  if (!Array.isArray(info.sources) || info.sources.length === 0) return 'the bundle lists no sources';
  for (const s of info.sources) {
    let st;
    try {
      st = statSync(join(root, s.path));
    } catch {
      return `${s.path} was removed`;
    }
    if (st.size !== s.size || st.mtimeMs !== s.mtimeMs) return `${s.path} changed`;
  }
  return null;
}
