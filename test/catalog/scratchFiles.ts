/** Test files written to one fresh temporary folder, numbered in order: scratchFiles('fits-stream', 'fits')(bytes) gives its path. */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** A writer of numbered files t0.EXT, t1.EXT, ... in a new folder haloweave-PREFIX-* (its path: `.dir`); returns each file's path. */
export function scratchFiles(prefix: string, ext: string): ((content: Uint8Array | string) => string) & { dir: string } {
  const dir = mkdtempSync(join(tmpdir(), `haloweave-${prefix}-`));
  let fileNo = 0;
  const save = (content: Uint8Array | string) => {
    const p = join(dir, `t${fileNo++}.${ext}`);
    writeFileSync(p, content);
    return p;
  };
  return Object.assign(save, { dir });
}
